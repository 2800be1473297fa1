// Capacitor between nodes a and b.
// Branch unknown u, the capacitor voltage, a differential state:
//   KCL rows a, b:  ± C·du/dt                 [A]
//   branch row:     v_a − v_b − u = 0         [V]
// Keeping u as the state (rather than the node voltages) makes `v0` a plain
// initial value and leaves every node voltage algebraic.
// `.i` is C·du/dt from a to b, `.v` is u.
#pragma once

#include "models/device.h"

namespace lcc {

class Capacitor final : public Device {
 public:
  Capacitor(std::string name, SourceLoc loc, int a, int b, double capacitance, double v0,
            bool v0_given = false)
      : Device(std::move(name), std::move(loc), {a, b}), c_(capacitance), v0_(v0), v0_given_(v0_given) {}
  bool has_initial_value() const override { return v0_given_; }
  const char* kind_name() const override { return "capacitor"; }
  TopologyRole role() const override { return TopologyRole::kCapacitive; }
  int num_branches() const override { return 1; }
  double initial_value(int) const override { return v0_; }
  void Stamp(StampSink& sink, bool on) const override;
  bool Signal(std::string_view what, LinearForm* form, Dim* dim) const override;
  double voltage_scale() const override { return std::abs(v0_); }

 private:
  double c_, v0_;
  bool v0_given_;
};

}  // namespace lcc
