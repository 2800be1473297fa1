// Line-current harmonics, THD and power factor of six-pulse bridges against
// published closed forms and tables.
//
// Ideal bridge (Ls = 0, constant Id): ±Id blocks of 120°,
//   I1 = (√6/π)·Id, Ih = I1/h for h = 6k ± 1,
//   THD = √(π²/9 − 1) = 31.084 % over all orders, 30.015 % up to h = 50
//   (check-values 1.11, 1.12, 1.14; Mohan, Undeland & Robbins, Power
//   Electronics, 3rd ed., ch. 5 and 6);
//   power factor (3/π)·cos α, displacement factor cos α (check-values 1.15).
// With overlap μ (Arrillaga & Watson, Power System Harmonics, 2nd ed., 2003;
// check-values 3.1):
//   Ih = √6·Id/(π·h) · √(A² + B² − 2AB·cos(2α+μ)) / (cos α − cos(α+μ)),
//   A = sin((h−1)μ/2)/(h−1), B = sin((h+1)μ/2)/(h+1),
// and the worked cases A–C of check-values 3.3 (derived there from 3.1 and
// 2.9 and confirmed by a waveform FFT).
#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

#include "results/harmonics.h"
#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

constexpr double kDeg = std::numbers::pi / 180.0;
constexpr double kVll = 400.0, kId = 100.0;
const double kW = 2 * std::numbers::pi * 50.0;

// The ideal line current: +Id on (30°, 150°), −Id on (210°, 330°), sampled
// with the edges on samples (taking the mid value there).
std::vector<double> IdealLineCurrent(int per_cycle, int cycles) {
  std::vector<double> x(per_cycle * cycles);
  for (int k = 0; k < per_cycle * cycles; ++k) {
    const double deg = std::fmod(360.0 * k / per_cycle, 360.0);
    auto inside = [&](double a, double b) { return deg > a + 1e-9 && deg < b - 1e-9; };
    auto edge = [&](double a) { return std::abs(deg - a) < 1e-9; };
    if (inside(30, 150)) x[k] = kId;
    else if (inside(210, 330)) x[k] = -kId;
    else if (edge(30) || edge(150)) x[k] = kId / 2;
    else if (edge(210) || edge(330)) x[k] = -kId / 2;
  }
  return x;
}

TEST_CASE("TheIdealSixPulseLineCurrentHasThePublishedSpectrum", "[harmonics][analytic]") {
  const auto x = IdealLineCurrent(6 * 2048, 2);
  const Spectrum s = AnalyseHarmonics(x.data(), static_cast<int>(x.size()), 2, 50);
  const double i1 = std::sqrt(6.0) / std::numbers::pi * kId;
  REQUIRE(s.rms(1) == Approx(i1).epsilon(1e-5));
  for (int h : {5, 7, 11, 13, 17, 19, 23, 25, 49}) REQUIRE(s.rms(h) == Approx(i1 / h).epsilon(1e-4));
  for (int h : {2, 3, 4, 6, 9, 10, 15}) REQUIRE(s.rms(h) < 1e-9 * i1);
  // The rms of the sampled wave (half values on the four edges) is short of
  // the continuous one by O(1/N): 7e-4 relative at 12 288 samples a cycle.
  REQUIRE(s.ThdAllOrders() == Approx(std::sqrt(std::numbers::pi * std::numbers::pi / 9 - 1)).epsilon(1e-3));
  REQUIRE(s.Thd() == Approx(0.30015).epsilon(2e-4));  // check-values 1.14, h ≤ 49 (or 50)
}

TEST_CASE("HarmonicAnalysisRefusesWindowsThatAreNotWholeCycles", "[harmonics]") {
  std::vector<double> x(1001, 1.0);
  REQUIRE_THROWS_AS(AnalyseHarmonics(x.data(), 1001, 2, 50), std::invalid_argument);
}

// An ideal source behind a commutating inductance in separate inductors,
// so that the source terminals carry the EMF, the reference of the closed
// forms' angles; or (separate = false) a source with that inductance.
std::string Bridge(double alpha_deg, double ls, bool separate = true) {
  const std::string l = std::to_string(ls * 1e6) + " uH\n";
  std::string text;
  if (separate)
    text = "supply Grid (u, v, w) Vll = 400 V f = 50 Hz R = 0 ohm L = 0 H\n"
           "inductor La (u, a) L = " + l + "inductor Lb (v, b) L = " + l + "inductor Lc (w, c) L = " + l;
  else
    text = "supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = " + l;
  if (alpha_deg > 0) text += "firing F sync = Grid alpha = " + std::to_string(alpha_deg) + " deg\n";
  text += "bridge B1 ac = (a, b, c) dc = (p, n) Ron = 1 uohm";
  text += alpha_deg > 0 ? " valve = thyristor firing = F\n" : "\n";
  return text + R"(
current_source Iload (n, p) dc = 100 A
simulate stop = 300 ms
steady cycles = 2
)";
}

TEST_CASE("ANearlyIdealBridgeHasTheIdealThdAndPowerFactor", "[harmonics][analytic]") {
  // Ls small enough that μ ≈ 0.3°: the ideal figures within 0.5 %.
  for (double alpha : {0.0, 30.0}) {
    const CaseAnalysis a = testing::AnalyseText(Bridge(alpha, 2e-6, false));
    const AcPointFigures& p = testing::AcPointNamed(a, "Grid");
    INFO("alpha " << alpha << ": THD " << p.thd_pct << " %, PF " << p.power_factor << ", DF "
                  << p.displacement_factor);
    REQUIRE(p.i1_A == Approx(std::sqrt(6.0) / std::numbers::pi * kId).epsilon(0.002));
    REQUIRE(p.thd_pct == Approx(30.015).epsilon(0.005));
    REQUIRE(p.power_factor == Approx(3 / std::numbers::pi * std::cos(alpha * kDeg)).epsilon(0.005));
    REQUIRE(p.displacement_factor == Approx(std::cos(alpha * kDeg)).epsilon(0.005));
  }
}

double Ih(int h, double alpha, double mu) {  // check-values 3.1, per unit of Id
  const double a = std::sin((h - 1) * mu / 2) / (h - 1), b = std::sin((h + 1) * mu / 2) / (h + 1);
  return std::sqrt(6.0) / (std::numbers::pi * h) * std::sqrt(a * a + b * b - 2 * a * b * std::cos(2 * alpha + mu)) /
         (std::cos(alpha) - std::cos(alpha + mu));
}

struct OverlapCase {
  const char* name;
  double alpha_deg, mu_deg;
  double i1;                // I1/Id (check-values 3.3)
  double phi1_deg;          // displacement angle (check-values 3.3)
  double ih[8];             // I5, I7, I11, I13, I17, I19, I23, I25 over Id (check-values 3.3)
};

TEST_CASE("HarmonicsWithOverlapFollowTheReductionFormulaAndTheWorkedCases", "[harmonics][analytic]") {
  const OverlapCase cases[] = {
      {"A", 15.0, 23.19, 0.77470, 28.168, {0.13219, 0.07977, 0.02835, 0.01499, 0.00601, 0.00722, 0.00719, 0.00589}},
      {"B", 0.0, 20.0, 0.77706, 13.309, {0.14316, 0.09407, 0.04627, 0.03282, 0.01626, 0.01164, 0.00742, 0.00670}},
      {"C", 30.0, 10.0, 0.77871, 35.208, {0.15107, 0.10463, 0.06055, 0.04799, 0.03089, 0.02476, 0.01543, 0.01185}},
  };
  const int orders[8] = {5, 7, 11, 13, 17, 19, 23, 25};
  for (const auto& c : cases) {
    SECTION(std::string("case ") + c.name) {
      const double alpha = c.alpha_deg * kDeg, mu = c.mu_deg * kDeg;
      // The commutating reactance that gives μ at this α and Id (check-values 2.2).
      const double xc = (std::cos(alpha) - std::cos(alpha + mu)) * kVll / (std::sqrt(2.0) * kId);
      const CaseAnalysis a = testing::AnalyseText(Bridge(c.alpha_deg, xc / kW));
      const AcPointFigures& p = testing::AcPointNamed(a, "Grid");
      INFO("case " << c.name << ": I1/Id " << p.i1_A / kId);
      REQUIRE(p.i1_A / kId == Approx(c.i1).epsilon(0.002));
      REQUIRE(std::acos(p.displacement_factor) / kDeg == Approx(c.phi1_deg).margin(0.3));
      for (int k = 0; k < 8; ++k) {
        const int h = orders[k];
        const double sim = testing::HarmonicRms(p, h) / kId;
        INFO("h " << h << ": " << sim << " (formula " << Ih(h, alpha, mu) << ", table " << c.ih[k] << ")");
        REQUIRE(sim == Approx(Ih(h, alpha, mu)).epsilon(0.02));
        REQUIRE(sim == Approx(c.ih[k]).epsilon(0.02));
      }
      // The report's closed forms agree with the circuit they were taken from.
      const BridgeFigures& b = testing::BridgeNamed(a, "B1");
      REQUIRE(b.ls_H == Approx(xc / kW).epsilon(1e-3));
      REQUIRE(b.overlap_closed_form_deg == Approx(c.mu_deg).margin(0.02));
      REQUIRE(b.overlap_deg == Approx(c.mu_deg).margin(0.3));
    }
  }
}

}  // namespace
}  // namespace lcc
