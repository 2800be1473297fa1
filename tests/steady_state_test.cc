// Periodic steady state: an R-C low-pass driven by a sinusoid settles to
//   |v_C| = V / √(1 + (ωRC)²),  phase lag atan(ωRC)
// (the phasor solution of any circuit-theory text, e.g. Alexander & Sadiku,
// Fundamentals of Electric Circuits, 5th ed., §9.5). `steady` must find it,
// record whole cycles, and the recorded amplitude must match.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

TEST_CASE("SteadyStateOfAnRcLowPassMatchesThePhasorSolution", "[engine][steady][analytic]") {
  auto c = testing::Simulate(R"(
voltage_source E (s, gnd) peak = 10 V f = 50 Hz
resistor R (s, x) R = 1 kohm
capacitor C (x, gnd) C = 4 uF
simulate stop = 1 s start = zero
steady cycles = 3 tol = 1e-6
probe vc = C.v
)");
  const auto& s = c.run.summary;
  REQUIRE(s.steady_reached);
  // τ = 4 ms: the transient e^(−t/τ) falls below 1e-6 relative after
  // about 14τ = 56 ms, so steady cannot be declared much before 60 ms.
  REQUIRE(s.steady_time > 0.05);
  REQUIRE(s.steady_time < 0.2);
  REQUIRE(s.window_end - s.window_begin == Approx(3 * 0.02).epsilon(1e-9));
  const double wrc = 2 * std::numbers::pi * 50 * 1e3 * 4e-6;
  const double amplitude = 10.0 / std::sqrt(1 + wrc * wrc);
  const WindowStats w = c.Window("vc");
  REQUIRE(w.max == Approx(amplitude).epsilon(1e-4));
  REQUIRE(w.rms == Approx(amplitude / std::sqrt(2.0)).epsilon(1e-4));
  REQUIRE(std::abs(w.mean) < 1e-4 * amplitude);
}

TEST_CASE("APhasorStartIsSteadyFromTheFirstCycles", "[engine][steady][analytic]") {
  // Started from the phasor solution there is no transient: the first two
  // cycle comparisons agree, so steady is declared at the second boundary.
  auto c = testing::Simulate(R"(
voltage_source E (s, gnd) peak = 10 V f = 50 Hz
resistor R (s, x) R = 1 kohm
capacitor C (x, gnd) C = 4 uF
simulate stop = 1 s
steady cycles = 1 tol = 1e-6
probe vc = C.v
)");
  REQUIRE(c.run.summary.steady_time == Approx(0.04));
  const double wrc = 2 * std::numbers::pi * 50 * 1e3 * 4e-6;
  REQUIRE(c.Window("vc").max == Approx(10.0 / std::sqrt(1 + wrc * wrc)).epsilon(1e-4));
}

TEST_CASE("WithoutSteadyTheLastCycleIsAnalysed", "[engine][steady]") {
  auto c = testing::Simulate(R"(
voltage_source E (s, gnd) rms = 230 V f = 60 Hz
resistor R (s, gnd) R = 10 ohm
simulate stop = 100 ms
probe v = s
)");
  const auto& s = c.run.summary;
  REQUIRE_FALSE(s.steady_requested);
  REQUIRE(s.window_end == Approx(0.1));
  REQUIRE(s.window_end - s.window_begin == Approx(1.0 / 60).epsilon(1e-9));
  REQUIRE(c.Window("v").rms == Approx(230).epsilon(1e-5));  // rms of a sine over a whole cycle
}

}  // namespace
}  // namespace lcc
