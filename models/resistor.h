// Resistor between nodes a and b.
//   KCL rows a, b: ± (v_a − v_b)/R            [A]
// No branch unknown. `.i` is the current from a to b, `.v` is v_a − v_b.
#pragma once

#include "models/device.h"

namespace lcc {

class Resistor final : public Device {
 public:
  Resistor(std::string name, SourceLoc loc, int a, int b, double resistance)
      : Device(std::move(name), std::move(loc), {a, b}), r_(resistance) {}
  const char* kind_name() const override { return "resistor"; }
  TopologyRole role() const override { return TopologyRole::kResistive; }
  double resistance() const { return r_; }
  void Stamp(StampSink& sink, bool on) const override;
  bool Signal(std::string_view what, LinearForm* form, Dim* dim) const override;
  double resistance_scale() const override { return r_; }

 private:
  double r_;
};

}  // namespace lcc
