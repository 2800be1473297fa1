#include "results/closed_forms.h"

#include <cmath>
#include <complex>
#include <numbers>

#include "engine/mna.h"
#include "engine/phasor.h"

namespace lcc {

std::vector<CommutatingCircuit> FindCommutatingCircuits(const Circuit& circuit, double frequency) {
  const auto& groups = circuit.valve_groups();
  std::vector<CommutatingCircuit> out(groups.size());
  if (frequency <= 0 || groups.empty()) return out;
  MnaSystem mna(circuit);
  // Every valve blocking; switches (a breaker, a fuse-switch) as they start.
  std::vector<std::uint8_t> blocking(circuit.num_switch_slots(), 0);
  for (const auto& d : circuit.devices())
    if (d->switch_slot() >= 0 && !d->natural()) blocking[d->switch_slot()] = d->initially_on();
  mna.SetSwitchStates(blocking);
  PhasorSolver solver(mna, frequency, PhasorSolver::kFundamentalSamples);
  Eigen::VectorXcd open, shorted;
  if (!solver.Solve(1, &open)) return out;
  auto v = [](const Eigen::VectorXcd& y, int node) { return node > 0 ? y[NodeUnknown(node)] : std::complex<double>(0); };
  const double omega = 2.0 * std::numbers::pi * frequency;
  for (std::size_t g = 0; g < groups.size(); ++g) {
    const ValveGroup& group = groups[g];
    if (group.devices.size() != 6) continue;
    double sum = 0.0;
    for (int k = 0; k < 3; ++k) sum += std::abs(v(open, group.ac[k]) - v(open, group.ac[(k + 1) % 3]));
    out[g].vll = sum / 3.0 / std::numbers::sqrt2;

    const Device& v1 = *circuit.devices()[group.devices[0]];
    const Device& v3 = *circuit.devices()[group.devices[2]];
    std::vector<std::uint8_t> states = blocking;
    states[v1.switch_slot()] = 1;
    states[v3.switch_slot()] = 1;
    mna.SetSwitchStates(states);
    if (!solver.Solve(1, &shorted)) continue;
    const std::complex<double> i_ab = shorted[v1.branch(0)];
    if (std::abs(i_ab) == 0.0) continue;
    // The short closes through valves 1 and 3 in their on state; take their
    // resistance out of the loop.
    const double r_valves = std::real((v(shorted, group.ac[0]) - v(shorted, group.ac[1])) / i_ab);
    const std::complex<double> z_loop = (v(open, group.ac[0]) - v(open, group.ac[1])) / i_ab - r_valves;
    out[g].ls = z_loop.imag() / (2.0 * omega);
    out[g].rs = z_loop.real() / 2.0;
    out[g].valid = true;
  }
  return out;
}

double IdealNoLoadVoltage(double vll) { return 3.0 * std::numbers::sqrt2 / std::numbers::pi * vll; }

double ClosedFormVd(double vll, double alpha, double omega, double ls, double id) {
  return IdealNoLoadVoltage(vll) * std::cos(alpha) - 3.0 * omega * ls / std::numbers::pi * id;
}

double ClosedFormOverlap(double vll, double alpha, double omega, double ls, double id) {
  const double c = std::cos(alpha) - 2.0 * omega * ls * id / (std::numbers::sqrt2 * vll);
  if (c < -1.0 || c > 1.0) return -1.0;
  const double mu = std::acos(c) - alpha;
  return mu >= 0.0 && mu < std::numbers::pi / 3 ? mu : -1.0;
}

}  // namespace lcc
