// A source branch: an EMF in series with a resistance and an inductance,
// between node a (the EMF's negative side, e.g. a star point) and node b
// (the terminal), the phase of a network equivalent.
// Branch unknown i, flowing from a through the branch and out of b:
//   KCL rows a, b:  ± i                                      [A]
//   branch row:     v_b − v_a − e(t) + R·i + L·di/dt = 0     [V]
// One unknown instead of three (an inner node, a source current and an
// inductor current) for each phase of every supply: on a six-pulse bridge
// that is 14 unknowns instead of 20. With L = 0 the branch is algebraic;
// with R = L = 0 it is an ideal voltage source.
// `.i` is i (the current out of terminal b), `.v` is v_b − v_a.
#pragma once

#include "models/device.h"
#include "models/waveform.h"

namespace lcc {

class SourceBranch final : public Device {
 public:
  SourceBranch(std::string name, SourceLoc loc, int a, int b, Waveform e, double resistance,
               double inductance)
      : Device(std::move(name), std::move(loc), {a, b}), e_(std::move(e)), r_(resistance), l_(inductance) {}
  const char* kind_name() const override { return "source_branch"; }
  TopologyRole role() const override {
    return l_ > 0 ? TopologyRole::kInductive : r_ > 0 ? TopologyRole::kResistive : TopologyRole::kVoltageSource;
  }
  int num_branches() const override { return 1; }
  double inductance() const { return l_; }
  double resistance() const { return r_; }
  const Waveform& waveform() const { return e_; }
  void Stamp(StampSink& sink, bool on) const override;
  bool has_sources() const override { return true; }
  void AddSources(double t, bool on, double* b) const override;
  void SourceRows(std::vector<int>* rows) const override { rows->push_back(branch()); }
  bool Signal(std::string_view what, LinearForm* form, Dim* dim) const override;
  double voltage_scale() const override { return e_.Peak(); }
  double resistance_scale() const override { return r_; }

 private:
  Waveform e_;
  double r_, l_;
};

}  // namespace lcc
