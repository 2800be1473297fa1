// Transformers from nameplate ratings:
//  * open-circuit line-voltage ratio V2/V1 and phase displacement of clock
//    number × 30°, LV lagging, for every vector group (IEC 60076-1:2011,
//    connection symbols and clock notation; check-values 8.2-8.3);
//  * a short-circuit test reproduces z, a no-load test reproduces im (the
//    definitions of short-circuit impedance and no-load current in
//    IEC 60076-1, §3.7.1 and §3.6.6 [from memory]);
//  * a delta-star transformer feeding a six-pulse bridge at constant Id draws
//    the six-step line current with levels (1, 2, 1)·Id·V2/(√3·V1), no zero
//    intervals, rms √(2/3)·Id·V2/V1 (check-values 1.16; Mohan, Undeland &
//    Robbins, 3rd ed., ch. 6, twelve-pulse section).
#include <catch2/catch.hpp>

#include <cmath>
#include <complex>
#include <numbers>

#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

std::complex<double> Fundamental(const testing::SimulatedCase& c, const std::string& probe, double f) {
  return testing::Harmonic(c, probe, f, 1);
}

// A 1 MVA, 11 kV / 400 V transformer on an ideal supply, LV open, with its
// line voltages probed; `connection` is its group (and shift) setting.
std::string OpenCircuit(const std::string& connection) {
  return R"(
supply G (A, B, C) Vll = 11 kV f = 50 Hz R = 0 ohm L = 0 H
transformer T hv = (A, B, C) lv = (a, b, c) )" + connection + R"(
              S = 1 MVA V1 = 11 kV V2 = 400 V z = 6 % xr = 8 im = 1 %
simulate stop = 100 ms
steady cycles = 1
probe VAB = A - B
probe Vab = a - b
)";
}

TEST_CASE("EveryVectorGroupHasItsRatioAndClockDisplacement", "[transformer]") {
  struct Group { const char* name; int clock; };
  const Group groups[] = {{"Yy0", 0}, {"Yy6", 6}, {"Yd1", 1}, {"Yd5", 5}, {"Yd11", 11}, {"Dy1", 1},
                          {"Dy5", 5}, {"Dy11", 11}, {"Dd0", 0}, {"Dd6", 6}, {"YNd11", 11}, {"Dyn11", 11}};
  for (const auto& g : groups) {
    SECTION(g.name) {
      auto c = testing::Simulate(OpenCircuit(std::string("group = ") + g.name));
      const auto hv = Fundamental(c, "VAB", 50), lv = Fundamental(c, "Vab", 50);
      const double ratio = std::abs(lv) / std::abs(hv);
      const double lag = std::fmod(std::arg(hv / lv) * 180 / std::numbers::pi + 360.0, 360.0);
      INFO(g.name << ": ratio " << ratio << ", LV lags HV by " << lag << " deg");
      // The magnetising current's drop in the HV leakage shifts the ratio by
      // about im·z/2 = 0.03 %; 0.1 % bounds it.
      REQUIRE(std::abs(ratio / (400.0 / 11000.0) - 1.0) < 1e-3);
      double error = std::abs(lag - 30.0 * g.clock);
      error = std::min(error, 360.0 - error);
      REQUIRE(error < 0.05);
    }
  }
}

TEST_CASE("APhaseShiftingTransformerAddsItsShift", "[transformer]") {
  // Phase-shifting rectifier transformers (zig-zag LV) for 18- and 24-pulse
  // groups: LV leads HV by shift − clock·30° (check-values 8.6).
  struct Case { const char* group; double shift; int clock; };
  const Case cases[] = {{"Yy0", 7.5, 0}, {"Yy0", -7.5, 0}, {"Yy0", 15, 0}, {"Yy0", -15, 0},
                        {"Yy0", 20, 0},  {"Yy0", -20, 0},  {"Dyn11", 7.5, 11}};
  for (const auto& cs : cases) {
    SECTION(std::string(cs.group) + " shift " + std::to_string(cs.shift)) {
      auto c = testing::Simulate(OpenCircuit(std::string("group = ") + cs.group + " shift = " + std::to_string(cs.shift) + " deg"));
      const auto hv = Fundamental(c, "VAB", 50), lv = Fundamental(c, "Vab", 50);
      const double lead = std::arg(lv / hv) * 180 / std::numbers::pi;
      double error = std::fmod(lead - (cs.shift - 30.0 * cs.clock) + 720.0, 360.0);
      error = std::min(error, 360.0 - error);
      INFO(cs.group << " shift " << cs.shift << ": LV leads by " << lead << " deg");
      REQUIRE(error < 0.05);
      REQUIRE(std::abs(std::abs(lv) / std::abs(hv) / (400.0 / 11000.0) - 1.0) < 1e-3);
    }
  }
}

TEST_CASE("AShortCircuitTestReproducesTheImpedance", "[transformer]") {
  // LV terminals shorted, HV fed at z·V1: rated current flows.
  auto c = testing::Simulate(R"(
supply G (A, B, C) Vll = 0.06 * 11 kV f = 50 Hz R = 0 ohm L = 0 H
transformer T hv = (A, B, C) lv = (a, b, c) group = Dyn11 S = 1 MVA V1 = 11 kV V2 = 400 V
              z = 6 % xr = 8 im = 1 %
resistor Sa (a, s) R = 1 uohm
resistor Sb (b, s) R = 1 uohm
resistor Sc (c, s) R = 1 uohm
simulate stop = 200 ms
steady cycles = 2
probe IA = T.A.i
)");
  const double rated = 1e6 / (std::sqrt(3.0) * 11e3);
  const double measured = c.Window("IA").rms;
  INFO("HV current at z·V1: " << measured << " A, rated " << rated << " A");
  REQUIRE(std::abs(measured / rated - 1.0) < 0.005);
}

TEST_CASE("ANoLoadTestReproducesTheMagnetisingCurrent", "[transformer]") {
  auto c = testing::Simulate(R"(
supply G (A, B, C) Vll = 11 kV f = 50 Hz R = 0 ohm L = 0 H
transformer T hv = (A, B, C) lv = (a, b, c) group = Yd11 S = 1 MVA V1 = 11 kV V2 = 400 V
              z = 6 % xr = 8 im = 1.5 %
simulate stop = 100 ms
steady cycles = 2
probe IA = T.A.i
)");
  const double rated = 1e6 / (std::sqrt(3.0) * 11e3);
  const double im = c.Window("IA").rms / rated;
  INFO("no-load current " << im * 100 << " % of rated");
  REQUIRE(std::abs(im / 0.015 - 1.0) < 0.01);
}

TEST_CASE("DeltaStarTransformerDrawsTheSixStepLineCurrent", "[transformer][bridge]") {
  const double id = 500.0, v1 = 11e3, v2 = 400.0;
  auto c = testing::Simulate(R"(
supply G (A, B, C) Vll = 11 kV f = 50 Hz R = 0 ohm L = 0 H
transformer T hv = (A, B, C) lv = (a, b, c) group = Dy11 S = 1 MVA V1 = 11 kV V2 = 400 V
              z = 0.5 % xr = 20 im = 0.5 %
bridge B ac = (a, b, c) dc = (p, n) Ron = 1 uohm
current_source Iload (n, p) dc = 500 A
simulate stop = 300 ms
steady cycles = 2
probe IA = T.A.i
)");
  const double level = id * v2 / (std::sqrt(3.0) * v1);
  const auto w = c.Window("IA");
  INFO("peak " << w.max << " (2 x level " << 2 * level << "), rms " << w.rms << " (" << std::sqrt(2.0 / 3.0) * id * v2 / v1 << ")");
  REQUIRE(std::abs(w.max / (2 * level) - 1.0) < 0.02);
  REQUIRE(std::abs(w.rms / (std::sqrt(2.0 / 3.0) * id * v2 / v1) - 1.0) < 0.01);
  // No zero intervals: apart from the brief reversals (overlap of a few
  // degrees at z = 0.5 %), |i| stays at level 1 or above. A star-star
  // transformer would spend a third of the cycle at zero.
  const auto& t = c.time;
  const auto& i = c.Column("IA");
  int near_zero = 0, total = 0;
  for (std::size_t k = 0; k < t.size(); ++k) {
    if (t[k] < c.run.summary.window_begin) continue;
    ++total;
    near_zero += std::abs(i[k]) < 0.5 * level;
  }
  REQUIRE(static_cast<double>(near_zero) / total < 0.02);
}

}  // namespace
}  // namespace lcc
