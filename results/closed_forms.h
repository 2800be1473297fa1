// Textbook closed forms for a six-pulse bridge, and the circuit data they
// need taken from the elaborated circuit, so the report can set the
// simulated figures beside them.
//
//   Vdo = (3√2/π)·VLL                                 (check values §1.1)
//   Vd  = Vdo·cos α − (3ωLs/π)·Id                      (§2.1)
//   cos(α + μ) = cos α − 2ωLs·Id/(√2·VLL)              (§2.2)
//
// They assume a stiff sinusoidal EMF behind Ls, constant Id, no resistance
// and μ < 60° (check values §11); the report's difference column shows how
// far a real circuit is from them.
#pragma once

#include <vector>

#include "models/circuit.h"

namespace lcc {

// What a bridge's AC terminals see, from two phasor solves at the
// fundamental with every valve blocking (switches as they start): the open-circuit line voltage, and
// the Thevenin impedance between terminals a and b (valves 1 and 3 closed
// short a to b through p). For a balanced network that impedance is twice
// the commutating impedance per phase, Rs + jωLs.
struct CommutatingCircuit {
  bool valid = false;
  double vll = 0.0;  // V rms, mean of the three open-circuit line voltages
  double ls = 0.0;   // H per phase
  double rs = 0.0;   // Ω per phase
};
// One per valve group of the circuit, in order (one open-circuit solve for all).
std::vector<CommutatingCircuit> FindCommutatingCircuits(const Circuit& circuit, double frequency);

double IdealNoLoadVoltage(double vll);  // Vdo
double ClosedFormVd(double vll, double alpha, double omega, double ls, double id);
// μ in radians, or −1 where the closed form has no solution below 60°.
double ClosedFormOverlap(double vll, double alpha, double omega, double ls, double id);

}  // namespace lcc
