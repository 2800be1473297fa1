// Twelve-pulse rectifier: two six-pulse bridges in series, fed by a Yy0 and a
// Yd11 transformer from one stiff supply, at constant Id.
//  * Vd is twice the six-pulse value Vdo − 3ωLc·Id/π, Lc being each
//    transformer's leakage referred to its valve side (Mohan, Undeland &
//    Robbins, 3rd ed., §6-4 and the twelve-pulse section; check-values 4.1);
//  * in the common supply current the 5th and 7th harmonics cancel
//    (check-values 4.2; Sueker, App. H) and the 11th and 13th follow the
//    overlap formula of Arrillaga & Watson, Power System Harmonics, 2nd ed.
//    (check-values 3.1), each bridge contributing equally.
#include <catch2/catch.hpp>

#include <cmath>
#include <complex>
#include <numbers>

#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

double HarmonicMagnitude(const testing::SimulatedCase& c, const std::string& probe, double f, int h) {
  return std::abs(testing::Harmonic(c, probe, f, h));  // peak
}

// Check-values 3.1: rms of harmonic h of a six-pulse bridge's line current
// with overlap μ at delay α, constant Id.
double OverlapHarmonic(double id, double alpha, double mu, int h) {
  const double a = std::sin((h - 1) * mu / 2) / (h - 1);
  const double b = std::sin((h + 1) * mu / 2) / (h + 1);
  return std::sqrt(6.0) * id / (std::numbers::pi * h) *
         std::sqrt(a * a + b * b - 2 * a * b * std::cos(2 * alpha + mu)) / (std::cos(alpha) - std::cos(alpha + mu));
}

TEST_CASE("TwelvePulseRectifierDoublesVdAndCancelsFifthAndSeventh", "[bridge][transformer][twelve]") {
  const double v1 = 11e3, v2 = 1e3, s = 2e6, z = 0.08, xr = 100, id = 1000, f = 50;
  auto c = testing::Simulate(R"(
supply G (A, B, C) Vll = 11 kV f = 50 Hz R = 0 ohm L = 0 H
transformer Ty hv = (A, B, C) lv = (y1, y2, y3) group = Yy0  S = 2 MVA V1 = 11 kV V2 = 1 kV z = 8 % xr = 100 im = 0.5 %
transformer Td hv = (A, B, C) lv = (d1, d2, d3) group = Yd11 S = 2 MVA V1 = 11 kV V2 = 1 kV z = 8 % xr = 100 im = 0.5 %
bridge B1 ac = (y1, y2, y3) dc = (mid, n) Ron = 1 uohm
bridge B2 ac = (d1, d2, d3) dc = (p, mid) Ron = 1 uohm
current_source Iload (n, p) dc = 1 kA
simulate stop = 400 ms
steady cycles = 2
probe Vd = p - n
probe IA = G.a.i
)");
  // Leakage reactance referred to the valve side, per phase (star equivalent).
  const double x = z * xr / std::sqrt(1 + xr * xr) * v2 * v2 / s;
  const double vd6 = 3 * std::sqrt(2.0) / std::numbers::pi * v2 - 3 * x * id / std::numbers::pi;
  const double vd = c.Window("Vd").mean;
  INFO("Vd " << vd << " V, twice the six-pulse value " << 2 * vd6 << " V");
  REQUIRE(std::abs(vd / (2 * vd6) - 1.0) < 0.003);

  const double i1 = HarmonicMagnitude(c, "IA", f, 1);
  const double i5 = HarmonicMagnitude(c, "IA", f, 5), i7 = HarmonicMagnitude(c, "IA", f, 7);
  INFO("I1 " << i1 << " A peak, I5 " << 100 * i5 / i1 << " %, I7 " << 100 * i7 / i1 << " %");
  REQUIRE(i5 / i1 < 0.015);
  REQUIRE(i7 / i1 < 0.015);

  const double mu = std::acos(1 - std::sqrt(2.0) * x * id / v2);
  for (int h : {11, 13}) {
    // Both bridges add their harmonic h in the primary, each referred by V2/V1.
    const double expected = 2 * (v2 / v1) * OverlapHarmonic(id, 0.0, mu, h) * std::sqrt(2.0);
    const double measured = HarmonicMagnitude(c, "IA", f, h);
    INFO("I" << h << " " << measured << " A peak, overlap formula " << expected << " A (mu " << mu * 180 / std::numbers::pi << " deg)");
    REQUIRE(std::abs(measured / expected - 1.0) < 0.10);
  }
}

}  // namespace
}  // namespace lcc
