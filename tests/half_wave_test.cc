// Half-wave diode rectifier with an R-L load, fed by v = Vm·sin(ωt).
// The diode conducts from ωt = 0 until the extinction angle β, the root of
//   sin(β − φ) + sin(φ)·e^(−β/tan φ) = 0,   tan φ = ωL/R
// (D. W. Hart, Power Electronics, McGraw-Hill 2011, §3.3, eq. 3-15; also
// Mohan, Undeland & Robbins, Power Electronics, 3rd ed., §5-2).
// Required: the simulated extinction angle within 0.01°.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

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

}  // namespace
}  // namespace lcc
