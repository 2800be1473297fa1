// The classic fixed-step method, as a reference to measure lccsim against:
// trapezoidal integration with companion models (H. W. Dommel, "Digital
// computer solution of electromagnetic transients in single- and multiphase
// networks", IEEE Trans. PAS-88(4), 1969) and switching instants found by
// linear interpolation inside the step, the step going on from the
// switching instant (P. Kuffel, K. Kent & G. Irwin, "The implementation and effectiveness of
// linear interpolation within digital simulation", Int. J. Electrical Power
// & Energy Systems 19(4), 1997), and two backward-Euler half steps after
// each switching against the trapezoidal rule's ringing (Marti & Lin 1989).
//
// It solves one circuit, the six-pulse diode bridge of bench_six_pulse: a
// three-phase EMF behind Ls per phase, six diodes (Ron/Roff, no forward
// drop) and a constant DC current. Five nodes (a, b, c, p, n), a 5×5 system
// refactorised only when a diode switches. Written for the comparison
// only; it is not part of lccsim.
#pragma once

#include <vector>

namespace lcc::bench {

struct FixedStepCircuit {
  double vll = 400.0;   // V rms line to line
  double f = 50.0;      // Hz
  double ls = 1e-3;     // H per phase
  double id = 100.0;    // A
  double r_on = 1e-6;   // ohm
  double r_off = 1e9;   // ohm
};

struct FixedStepResult {
  double vd_mean = 0.0;     // V, over the last two cycles
  double overlap_deg = 0.0; // mean over the last two cycles' commutations
  long steps = 0;           // solves, the extra ones at switchings included
  long switchings = 0;
  double cpu_seconds = 0.0;
};

// Simulates `seconds` with step h, starting just after a commutation in
// the ideal state (iA = Id, iB = −Id, iC = 0) so that no start-up transient
// (which nothing in this lossless circuit would damp) is left.
FixedStepResult RunFixedStep(const FixedStepCircuit& circuit, double h, double seconds);

}  // namespace lcc::bench
