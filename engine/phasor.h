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
#include <vector>

#include "engine/mna.h"

namespace lcc {

// Values at t = 0 of every unknown in the AC steady state of the network in
// its present switch states. Returns false if the phasor system is
// singular at some harmonic (the caller then starts from zero).
bool SolvePeriodicStart(MnaSystem& mna, double frequency, std::vector<double>* y0);

// The phasor Y_h of every unknown at harmonic h of `frequency`, in the
// present switch states: y(t) contains Re(Y_h·e^(j·hωt)).
bool SolveHarmonicPhasor(MnaSystem& mna, double frequency, int h, Eigen::VectorXcd* y);

}  // namespace lcc
