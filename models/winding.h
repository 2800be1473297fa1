// A winding of n turns on a core (models/core.h), between terminal a (its
// dotted end) and terminal b, with series resistance R and leakage L.
// Branch unknown i, from a through the winding to b:
//   KCL rows a, b:   ± i                                      [A]
//   branch row:      v_a − v_b − R·i − L·di/dt − n·e = 0      [V]
//   core MMF row:    + n·i                                    [A·turn]
// e being the core's EMF per turn. `.i` is i, `.v` is v_a − v_b.
#pragma once

#include "models/core.h"

namespace lcc {

class Winding final : public Device {
 public:
  Winding(std::string name, SourceLoc loc, int a, int b, const Core* core, double turns,
          double resistance, double leakage)
      : Device(std::move(name), std::move(loc), {a, b}), core_(core), n_(turns), r_(resistance), l_(leakage) {}
  const char* kind_name() const override { return "winding"; }
  TopologyRole role() const override { return l_ > 0 ? TopologyRole::kInductive : TopologyRole::kWinding; }
  int num_branches() const override { return 1; }
  const Core& core() const { return *core_; }
  double turns() const { return n_; }
  double resistance() const { return r_; }
  double leakage() const { return l_; }
  void Stamp(StampSink& sink, bool on) const override;
  bool Signal(std::string_view what, LinearForm* form, Dim* dim) const override;
  double resistance_scale() const override { return r_; }
  bool magnetic() const override { return true; }

 private:
  const Core* core_;
  double n_, r_, l_;
};

}  // namespace lcc
