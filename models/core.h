// A magnetic core shared by windings (models/winding.h), modelled as ideal
// coupling plus a magnetising branch referred to a reference winding of n_r
// turns, never as a coupled-inductance matrix with coupling near 1.
// Unknowns: e, the EMF per turn (algebraic), and i_m, the magnetising
// current referred to the reference winding (a state):
//   MMF row:          Σ_k n_k·i_k − n_r·i_m − n_r²·e/Rc = 0      [A·turn]
//   magnetising row:  n_r·e − Lm·di_m/dt = 0                   [V]
// (the windings stamp their own n_k·i_k terms into the MMF row). Rc, the
// core-loss resistance across the reference winding, also keeps the system
// index 1: without it the leakage and magnetising inductances would meet in
// a cut-set of inductors. A core given no loss gets Rc = kLosslessRcFactor
// × ω·Lm, whose loss is 0.01 % of the magnetising reactive power.
#pragma once

#include "models/device.h"

namespace lcc {

constexpr double kLosslessRcFactor = 1e4;

class Core final : public Device {
 public:
  Core(std::string name, SourceLoc loc, double lm, double rc, double ref_turns)
      : Device(std::move(name), std::move(loc), {}), lm_(lm), rc_(rc), ref_turns_(ref_turns) {}
  const char* kind_name() const override { return "core"; }
  TopologyRole role() const override { return TopologyRole::kMagnetic; }
  int num_branches() const override { return 2; }
  int emf_unknown() const { return branch(0); }
  int magnetising_unknown() const { return branch(1); }
  double lm() const { return lm_; }
  double rc() const { return rc_; }
  double ref_turns() const { return ref_turns_; }
  // Set by elaboration once the windings are known (`core` statements).
  void Configure(double rc, double ref_turns) {
    rc_ = rc;
    ref_turns_ = ref_turns;
  }
  // e is volts per turn; i_m a current.
  double unknown_scale(int k, double v_ref, double i_ref) const override {
    return k == 0 ? v_ref / ref_turns_ : i_ref;
  }
  void Stamp(StampSink& sink, bool on) const override;
  bool Signal(std::string_view what, LinearForm* form, Dim* dim) const override;

 private:
  double lm_, rc_, ref_turns_;
};

}  // namespace lcc
