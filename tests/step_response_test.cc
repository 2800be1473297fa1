// R-C and R-L step responses against the analytic first-order solutions
//   v_C(t) = V·(1 − e^(−t/RC)),   i_L(t) = (V/R)·(1 − e^(−t·R/L)),
// the textbook exponentials of any circuit-theory text (e.g. Alexander &
// Sadiku, Fundamentals of Electric Circuits, 5th ed., §7.4 and §7.6).
// Required: relative error below 1e-5 at every sample.
#include <catch2/catch.hpp>
#include <cmath>

#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

constexpr double kRelativeError = 1e-5;

TEST_CASE("RcStepResponseMatchesTheExponential", "[engine][analytic]") {
  auto c = testing::Simulate(R"(
voltage_source E (s, gnd) dc = 100 V
resistor R (s, x) R = 1 kohm
capacitor C (x, gnd) C = 1 uF
simulate stop = 5 ms sample = 10 us reltol = 1e-7
probe vc = C.v
probe ic = C.i
)");
  const double tau = 1e3 * 1e-6;
  const auto& t = c.time;
  const auto& vc = c.Column("vc");
  const auto& ic = c.Column("ic");
  REQUIRE(t.size() == 501);
  for (std::size_t k = 0; k < t.size(); ++k) {
    const double expected = 100.0 * (1.0 - std::exp(-t[k] / tau));
    REQUIRE(std::abs(vc[k] - expected) <= kRelativeError * 100.0);
    // The current through C is V/R·e^(−t/τ), from the same solution.
    REQUIRE(std::abs(ic[k] - 0.1 * std::exp(-t[k] / tau)) <= kRelativeError * 0.1);
  }
}

TEST_CASE("RlStepResponseMatchesTheExponential", "[engine][analytic]") {
  auto c = testing::Simulate(R"(
voltage_source E (s, gnd) dc = 10 V
resistor R (s, m) R = 2 ohm
inductor L (m, gnd) L = 10 mH
simulate stop = 50 ms sample = 100 us reltol = 1e-7
probe iL = L.i
)");
  const double tau = 10e-3 / 2.0;
  const auto& t = c.time;
  const auto& i = c.Column("iL");
  for (std::size_t k = 0; k < t.size(); ++k) {
    const double expected = 5.0 * (1.0 - std::exp(-t[k] / tau));
    REQUIRE(std::abs(i[k] - expected) <= kRelativeError * 5.0);
  }
}

TEST_CASE("CapacitorStartsFromItsInitialVoltage", "[engine][analytic]") {
  // Discharge from v0 through R: v(t) = v0·e^(−t/RC).
  auto c = testing::Simulate(R"(
capacitor C (x, gnd) C = 10 uF v0 = 50 V
resistor R (x, gnd) R = 100 ohm
simulate stop = 5 ms sample = 50 us reltol = 1e-7
probe v = x
)");
  const auto& t = c.time;
  const auto& v = c.Column("v");
  for (std::size_t k = 0; k < t.size(); ++k)
    REQUIRE(std::abs(v[k] - 50.0 * std::exp(-t[k] / 1e-3)) <= kRelativeError * 50.0);
}

}  // namespace
}  // namespace lcc
