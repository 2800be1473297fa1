// Half-wave diode rectifier with an R-L load, fed by v = Vm·sin(ωt).
// The diode conducts from ωt = 0 until the extinction angle β, the root of
//   sin(β − φ) + sin(φ)·e^(−β/tan φ) = 0,   tan φ = ωL/R
// (D. W. Hart, Power Electronics, McGraw-Hill 2011, §3.3, eq. 3-15; also
// Mohan, Undeland & Robbins, Power Electronics, 3rd ed., §5-2).
// Required: the simulated extinction angle within 0.01°.
#include <catch2/catch.hpp>
#include <algorithm>
#include <cmath>
#include <numbers>
#include <string>

#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

// Solves the extinction equation by bisection on (π, 2π).
double ExtinctionAngle(double phi) {
  auto f = [&](double b) { return std::sin(b - phi) + std::sin(phi) * std::exp(-b / std::tan(phi)); };
  double lo = std::numbers::pi + 1e-9, hi = 2 * std::numbers::pi - 1e-9;
  REQUIRE(f(lo) * f(hi) < 0);
  for (int k = 0; k < 200; ++k) {
    const double mid = 0.5 * (lo + hi);
    (f(lo) * f(mid) <= 0 ? hi : lo) = mid;
  }
  return 0.5 * (lo + hi);
}

TEST_CASE("HalfWaveRlExtinctionAngleMatchesTheClosedForm", "[engine][analytic][valve]") {
  const double w = 2 * std::numbers::pi * 50.0;
  const double R = 10.0, L = 50e-3;
  const double phi = std::atan(w * L / R);
  const double beta = ExtinctionAngle(phi);

  auto c = testing::Simulate(R"(
voltage_source E (s, gnd) peak = 325 V f = 50 Hz
diode D (s, k) Ron = 1 uohm Roff = 1 Gohm
resistor R (k, m) R = 10 ohm
inductor L (m, gnd) L = 50 mH
simulate stop = 25 ms
probe i = L.i
)");
  const double t_off = c.SwitchTime("D", false, 0);
  const double beta_sim = w * t_off;
  INFO("beta closed form " << beta * 180 / std::numbers::pi << " deg, simulated "
                           << beta_sim * 180 / std::numbers::pi << " deg");
  REQUIRE(std::abs(beta_sim - beta) * 180 / std::numbers::pi < 0.01);
  // It turned on at the start of the positive half cycle.
  REQUIRE(c.SwitchTime("D", true, 0) < 1e-6);
}

TEST_CASE("HalfWaveResistiveSamplesFollowTheSourceEveryHalfCycle", "[engine][analytic][valve]") {
  // A diode into a resistor: v_R = v for v > 0, and 0 while the diode
  // blocks (Hart, §3.2). Beside it, a capacitor discharging through 1 MΩ
  // (τ = 10⁶ s) is the only state, all but constant, so IDA takes its
  // largest steps (36° here) and every sample is recomputed from it, in the
  // conducting and the blocking configuration alike. Each configuration
  // comes back every cycle and keeps its responses (MnaSystem); over five
  // cycles every sample must match within 1e-6 of the peak (ten times the
  // run's reltol), read alone or with others.
  const double w = 2 * std::numbers::pi * 50.0;
  for (const char* probes : {"probe vk = k", "probe vk = k\nprobe vs = s\nprobe ie = E.i\nprobe vj = j"}) {
    INFO(probes);
    auto c = testing::Simulate(std::string(R"(
voltage_source E (s, gnd) peak = 100 V f = 50 Hz
diode D (s, k) Ron = 1 uohm Roff = 1 Gohm
resistor R (k, gnd) R = 10 ohm
capacitor C (j, gnd) C = 1 F v0 = 10 V
resistor Rj (j, gnd) R = 1 Mohm
simulate stop = 100 ms sample = 100 us max_step = 2 ms reltol = 1e-7
)") + probes);
    const auto& t = c.time;
    const auto& vk = c.Column("vk");
    REQUIRE(t.size() == 1001);
    for (std::size_t k = 0; k < t.size(); ++k)
      REQUIRE(std::abs(vk[k] - std::max(0.0, 100.0 * std::sin(w * t[k]))) <= 1e-6 * 100.0);
  }
}

}  // namespace
}  // namespace lcc
