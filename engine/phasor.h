// Sinusoidal steady state of the linear network, for the start of a run.
//
// A run that starts from zero states gives every inductor (above all a
// transformer's magnetising inductance) a DC offset that decays over Lm/R,
// seconds or minutes, and that the steady-state test would even accept as
// periodic. SolvePeriodicStart() instead gives the states the values of the
// network's periodic steady state with every switch in its initial state:
// the sources' time functions are split into harmonics of the fundamental
// (a DFT of b(t) over one period, exact for harmonics below N/2), each
// harmonic h is solved as a phasor,
//     (G + j·hω·C)·Y_h = B_h,     y(t) = Σ_h Re(Y_h·e^(j·hωt)),
// and y(0) is kept for the differential unknowns. DC parts of the sources
// are left out: a DC source present at t = 0 is a step, as written.
#pragma once

#include <Eigen/Dense>
#include <memory>
#include <vector>

#include "engine/mna.h"

namespace lcc {

// Solves the phasor system at harmonics of one frequency, for the switch
// states the MnaSystem has at each call. The sources are sampled once (their
// harmonics h ≥ 1 do not depend on valve states: a valve's Vf is DC), and
// the sparse LU's symbolic analysis and workspace are kept between solves,
// which share one pattern. The harmonics of all orders come from one real
// FFT per source row, in the constructor.
class PhasorSolver {
 public:
  // `samples` per period resolve the sources' harmonics exactly below
  // samples/2; for the fundamental alone 64 suffice (the supply's
  // harmonics, up to h50, alias onto h = 1 only at 63 and beyond).
  static constexpr int kFundamentalSamples = 64;
  PhasorSolver(MnaSystem& mna, double frequency, int samples = 256);
  ~PhasorSolver();
  // The phasor Y_h of every unknown: y(t) contains Re(Y_h·e^(j·hωt)).
  // False if the system is singular at h.
  bool Solve(int h, Eigen::VectorXcd* y);
  // The source phasor B_h, and whether it is negligible (all below 1e-12
  // of the largest source sample).
  Eigen::VectorXcd SourceHarmonic(int h) const;
  bool SourceNegligible(const Eigen::VectorXcd& bh) const;

 private:
  struct Impl;
  MnaSystem& mna_;
  double frequency_;
  int samples_;                 // N, per period
  double largest_sample_ = 0;   // max |b_i(t_k)|
  Eigen::MatrixXcd harmonics_;  // B_h in column h = 0..N/2
  std::unique_ptr<Impl> impl_;
};

// Values at t = 0 of every unknown in the AC steady state of the network in
// its present switch states. Returns false if the phasor system is
// singular at some harmonic (the caller then starts from zero).
bool SolvePeriodicStart(MnaSystem& mna, double frequency, std::vector<double>* y0);

// The phasor Y_h of every unknown at harmonic h of `frequency`, in the
// present switch states: y(t) contains Re(Y_h·e^(j·hωt)).
bool SolveHarmonicPhasor(MnaSystem& mna, double frequency, int h, Eigen::VectorXcd* y);

}  // namespace lcc
