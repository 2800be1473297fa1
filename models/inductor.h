// Inductor with series resistance between nodes a and b.
// Branch unknown i (from a to b), a differential state:
//   KCL rows a, b:  ± i                                  [A]
//   branch row:     v_a − v_b − R·i − L·di/dt = 0        [V]
// `.i` is i, `.v` is v_a − v_b. `i0` is the current at t = 0.
#pragma once

#include "models/device.h"

namespace lcc {

class Inductor final : public Device {
 public:
  Inductor(std::string name, SourceLoc loc, int a, int b, double inductance,
           double resistance, double i0, bool i0_given = false)
      : Device(std::move(name), std::move(loc), {a, b}), l_(inductance), r_(resistance), i0_(i0),
        i0_given_(i0_given) {}
  bool has_initial_value() const override { return i0_given_; }
  const char* kind_name() const override { return "inductor"; }
  TopologyRole role() const override { return TopologyRole::kInductive; }
  int num_branches() const override { return 1; }
  double initial_value(int) const override { return i0_; }
  double inductance() const { return l_; }
  void Stamp(StampSink& sink, bool on) const override;
  bool Signal(std::string_view what, LinearForm* form, Dim* dim) const override;
  double resistance_scale() const override { return r_; }
  double current_scale() const override { return std::abs(i0_); }

 private:
  double l_, r_, i0_;
  bool i0_given_;
};

}  // namespace lcc
