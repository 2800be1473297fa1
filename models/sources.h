// Independent sources.
//
// VoltageSource (p, n): branch unknown j, the current entering p and flowing
// through the source to n:
//   KCL rows p, n:  ± j                       [A]
//   branch row:     v_p − v_n = e(t)          [V]
// `.i` is the current the source delivers out of p (−j).
//
// CurrentSource (p, n): drives i(t) out of its p terminal into the circuit
// and back in at n; no branch unknown:
//   KCL rows p, n:  ∓ i(t) (as the source term b)
// `.i` is i(t) itself.
#pragma once

#include "models/device.h"
#include "models/waveform.h"

namespace lcc {

class VoltageSource final : public Device {
 public:
  VoltageSource(std::string name, SourceLoc loc, int p, int n, Waveform e)
      : Device(std::move(name), std::move(loc), {p, n}), e_(std::move(e)) {}
  const char* kind_name() const override { return "voltage_source"; }
  TopologyRole role() const override { return TopologyRole::kVoltageSource; }
  int num_branches() const override { return 1; }
  const Waveform& waveform() const { return e_; }
  void Stamp(StampSink& sink, bool on) const override;
  bool has_sources() const override { return true; }
  void AddSources(double t, bool on, double* b) const override;
  void SourceRows(std::vector<int>* rows) const override { rows->push_back(branch()); }
  bool Signal(std::string_view what, LinearForm* form, Dim* dim) const override;
  double voltage_scale() const override { return e_.Peak(); }

 private:
  Waveform e_;
};

class CurrentSource final : public Device {
 public:
  CurrentSource(std::string name, SourceLoc loc, int p, int n, Waveform i)
      : Device(std::move(name), std::move(loc), {p, n}), i_(std::move(i)) {}
  const char* kind_name() const override { return "current_source"; }
  TopologyRole role() const override { return TopologyRole::kCurrentSource; }
  const Waveform& waveform() const { return i_; }
  void Stamp(StampSink&, bool) const override {}
  bool has_sources() const override { return true; }
  void AddSources(double t, bool on, double* b) const override;
  void SourceRows(std::vector<int>* rows) const override {
    for (int node : nodes())
      if (node > 0) rows->push_back(NodeUnknown(node));
  }
  bool Signal(std::string_view what, LinearForm* form, Dim* dim) const override;
  double current_scale() const override { return i_.Peak(); }

 private:
  Waveform i_;
};

}  // namespace lcc
