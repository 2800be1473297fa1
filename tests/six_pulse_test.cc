// Six-pulse diode bridge with a constant DC current (a current-source load),
// against the closed forms of the textbooks:
//   stiff supply (Ls = 0):  Vd = (3√2/π)·VLL, valve mean Id/3, rms Id/√3,
//                           peak reverse voltage √2·VLL
//   with Ls:                Vd = Vdo − 3ωLs·Id/π,
//                           cos μ = 1 − 2ωLs·Id/(√2·VLL)
// Mohan, Undeland & Robbins, Power Electronics, 3rd ed., Wiley 2003, §5-6
// and §5-7 (constants checked in shared/reference/check-values.md §1, §2).
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "results/commutation.h"
#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

constexpr double kVll = 400.0, kId = 100.0, kF = 50.0;
const double kVdo = 3.0 * std::sqrt(2.0) / std::numbers::pi * kVll;

std::string Bridge(const std::string& impedance) {
  return "supply Grid (a, b, c) Vll = 400 V f = 50 Hz " + impedance + R"(
bridge B1 ac = (a, b, c) dc = (p, n) Ron = 1 uohm Roff = 10 Mohm
current_source Iload (n, p) dc = 100 A
simulate stop = 200 ms
steady cycles = 2
probe Vd = p - n
probe Iv1 = B1[1].i
probe Vv1 = B1[1].v
probe Ia = Grid.a.i
)";
}

TEST_CASE("SixPulseOnStiffSupplyMatchesIdealClosedForms", "[engine][bridge][analytic]") {
  auto c = testing::Simulate(Bridge("R = 0 ohm L = 0 H"));
  REQUIRE(c.run.summary.steady_reached);
  const WindowStats vd = c.Window("Vd");
  const WindowStats iv = c.Window("Iv1");
  const WindowStats vv = c.Window("Vv1");
  const WindowStats ia = c.Window("Ia");
  INFO("Vd " << vd.mean << " (closed form " << kVdo << ")");
  REQUIRE(std::abs(vd.mean - kVdo) / kVdo < 0.002);
  REQUIRE(std::abs(iv.mean - kId / 3) / (kId / 3) < 0.01);
  REQUIRE(std::abs(iv.rms - kId / std::sqrt(3.0)) / (kId / std::sqrt(3.0)) < 0.01);
  REQUIRE(std::abs(-vv.min - std::sqrt(2.0) * kVll) / (std::sqrt(2.0) * kVll) < 0.005);
  // Line current: ±Id blocks of 120°, rms √(2/3)·Id (check-values 1.11).
  REQUIRE(std::abs(ia.rms - std::sqrt(2.0 / 3.0) * kId) / kId < 0.01);
}

TEST_CASE("SixPulseWithSupplyInductanceMatchesOverlapClosedForms", "[engine][bridge][analytic]") {
  const double ls = 1e-3;
  const double w = 2 * std::numbers::pi * kF;
  const double vd_expected = kVdo - 3 * w * ls * kId / std::numbers::pi;
  const double mu_expected = std::acos(1 - 2 * w * ls * kId / (std::sqrt(2.0) * kVll));

  auto c = testing::Simulate(Bridge("R = 0 ohm L = 1 mH"));
  REQUIRE(c.run.summary.steady_reached);
  const WindowStats vd = c.Window("Vd");
  INFO("Vd " << vd.mean << " (closed form " << vd_expected << ")");
  REQUIRE(std::abs(vd.mean - vd_expected) / vd_expected < 0.003);

  const auto& group = c.design->circuit.valve_groups().at(0);
  auto commutations = BridgeCommutations(group, c.run.events, kF, c.run.summary.window_begin,
                                         c.run.summary.window_end);
  REQUIRE(commutations.size() == 12);  // six per cycle over two cycles
  for (const auto& m : commutations) {
    INFO("valve " << m.incoming << " from " << m.outgoing << ": mu = " << m.overlap * 180 / std::numbers::pi
                  << " deg, closed form " << mu_expected * 180 / std::numbers::pi);
    REQUIRE(std::abs(m.overlap - mu_expected) * 180 / std::numbers::pi < 0.3);
  }
}

TEST_CASE("TheOverlapStaysAccurateBesideATinyResistance", "[engine][bridge][analytic]") {
  // A 1 mΩ resistor in series with the ideal current source changes
  // nothing in the bridge, so the overlap is still the closed form's. But
  // it is the circuit's smallest resistance, and the start-up current scale
  // (largest voltage over smallest resistance, 565 kA) once set the current
  // tolerance: the overlap came out 0.05° short. Once a period has shown
  // the currents, their own size sets it (EngineOptions::Tolerances). The
  // idealised circuit leaves only the integration's error: each overlap
  // within 0.005° (0.3 µs).
  const double w = 2 * std::numbers::pi * kF, ls = 1e-3;
  const double mu_expected = std::acos(1 - 2 * w * ls * kId / (std::sqrt(2.0) * kVll));
  auto c = testing::Simulate(R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 1 mH
bridge B1 ac = (a, b, c) dc = (p, n) Ron = 1 uohm
resistor Rs (n, m) R = 1 mohm
current_source Iload (m, p) dc = 100 A
simulate stop = 200 ms
probe Vd = p - n
)");
  const auto& group = c.design->circuit.valve_groups().at(0);
  auto commutations = BridgeCommutations(group, c.run.events, kF, c.run.summary.window_begin - 0.04,
                                         c.run.summary.window_end);
  REQUIRE(commutations.size() >= 12);
  for (const auto& m : commutations) {
    INFO("valve " << m.incoming << ": mu = " << m.overlap * 180 / std::numbers::pi << " deg, closed form "
                  << mu_expected * 180 / std::numbers::pi);
    REQUIRE(std::abs(m.overlap - mu_expected) * 180 / std::numbers::pi < 0.005);
  }
}

TEST_CASE("SixPulseValvesConductInTheTradesOrder", "[engine][bridge]") {
  // Each valve turns on 60° after the one before it (1, 2, ..., 6): compare
  // the electrical angle of each valve's last turn-on with valve 1's.
  auto c = testing::Simulate(Bridge("R = 0 ohm L = 0.5 mH"));
  auto last_on_angle = [&](int k) {
    const std::string name = "B1[" + std::to_string(k) + "]";
    double t = -1;
    for (const auto& e : c.run.events)
      if (e.on && c.design->circuit.devices()[e.device]->name() == name) t = e.t;
    REQUIRE(t > 0);
    return std::fmod(t * kF * 360.0, 360.0);
  };
  const double a1 = last_on_angle(1);
  for (int k = 2; k <= 6; ++k) {
    const double delay = std::fmod(last_on_angle(k) - a1 + 720.0, 360.0);
    INFO("valve " << k << " turns on " << delay << " deg after valve 1");
    REQUIRE(std::abs(delay - 60.0 * (k - 1)) < 0.01);
  }
}

}  // namespace
}  // namespace lcc
