// Thyristor bridges at constant Id behind a supply inductance Ls:
//   Vd = Vdo·cos α − 3ωLs·Id/π,   cos(α + μ) = cos α − 2ωLs·Id/(√2·VLL)
// (Mohan, Undeland & Robbins, Power Electronics, 3rd ed., §6-4; check-values
// 2.1-2.2), and in inverter operation the extinction angle
//   γ = 180° − α − μ
// (Arrillaga, HVDC Transmission, 2nd ed., ch. 3; check-values 2.7). A valve
// given a turn-off time tq longer than γ/ω cannot block the forward voltage
// that follows and re-fires: a commutation failure (check-values 2.8; Thio,
// Davies & Kent, IEEE TPWRD 11(2), 1996).
#include <catch2/catch.hpp>

#include <cmath>
#include <map>
#include <numbers>
#include <string>
#include <vector>

#include "results/commutation.h"
#include "results/events.h"
#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

constexpr double kVll = 400.0, kId = 100.0, kF = 50.0;
const double kW = 2 * std::numbers::pi * kF;
const double kVdo = 3.0 * std::sqrt(2.0) / std::numbers::pi * kVll;
constexpr double kDeg = 180.0 / std::numbers::pi;

std::string ThyristorBridge(double alpha_deg, double ls_mh, const std::string& extra = "") {
  return "supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = " + std::to_string(ls_mh) + R"( mH
firing F sync = Grid alpha = )" + std::to_string(alpha_deg) + R"( deg
bridge B1 ac = (a, b, c) dc = (p, n) valve = thyristor firing = F Ron = 1 uohm )" + extra + R"(
current_source Iload (n, p) dc = 100 A
simulate stop = 300 ms
steady cycles = 2
probe Vd = p - n
)";
}

TEST_CASE("ThyristorBridgeFollowsTheControlledRectifierClosedForms", "[thyristor][bridge][analytic]") {
  const double ls = 1e-3;
  for (double alpha_deg : {0.0, 15.0, 30.0, 45.0, 60.0, 75.0}) {
    SECTION("alpha " + std::to_string(static_cast<int>(alpha_deg))) {
      const double a = alpha_deg / kDeg;
      const double vd = kVdo * std::cos(a) - 3 * kW * ls * kId / std::numbers::pi;
      const double mu = std::acos(std::cos(a) - 2 * kW * ls * kId / (std::sqrt(2.0) * kVll)) - a;
      auto c = testing::Simulate(ThyristorBridge(alpha_deg, 1.0));
      const double vd_sim = c.Window("Vd").mean;
      INFO("alpha " << alpha_deg << ": Vd " << vd_sim << " (closed form " << vd << ")");
      REQUIRE(std::abs(vd_sim - vd) / std::abs(vd) < 0.003);
      auto list = BridgeCommutations(c.design->circuit.valve_groups()[0], c.run.events, kF,
                                     c.run.summary.window_begin, c.run.summary.window_end);
      REQUIRE(list.size() >= 11);
      for (const auto& m : list) {
        INFO("mu " << m.overlap * kDeg << " deg (closed form " << mu * kDeg << ")");
        REQUIRE(std::abs(m.overlap - mu) * kDeg < 0.3);
      }
    }
  }
}

TEST_CASE("InverterExtinctionAngleIs180MinusAlphaMinusOverlap", "[thyristor][bridge][inverter][analytic]") {
  const double ls = 0.5e-3;
  for (double alpha_deg : {140.0, 145.0, 150.0, 155.0}) {
    SECTION("alpha " + std::to_string(static_cast<int>(alpha_deg))) {
      const double a = alpha_deg / kDeg;
      const double delta = std::acos(std::cos(a) - 2 * kW * ls * kId / (std::sqrt(2.0) * kVll));
      const double gamma = std::numbers::pi - delta;  // 180° − α − μ
      auto c = testing::Simulate(ThyristorBridge(alpha_deg, 0.5));
      REQUIRE(c.Window("Vd").mean < 0);  // inverting
      const auto rows = EventLog(c.design->circuit, c.run, kF);
      int checked = 0;
      for (const auto& r : rows) {
        REQUIRE(r.event != "commutation_failure");
        if (r.event != "forward_voltage" || r.t < c.run.summary.window_begin) continue;
        INFO("alpha " << alpha_deg << ": gamma " << r.extinction_deg << " deg (closed form " << gamma * kDeg << ")");
        REQUIRE(std::abs(r.extinction_deg - gamma * kDeg) < 0.3);
        ++checked;
      }
      REQUIRE(checked >= 11);
    }
  }
}

TEST_CASE("ExtinctionAngleControlHoldsGammaWithTheClosedFormAdvance", "[thyristor][inverter]") {
  // Holding γ at its set value needs cos(180° − γ) = cos α − 2ωLs·Id/(√2·VLL),
  // i.e. α = acos(2ωLs·Id/(√2·VLL) − cos γ) (check-values 2.7).
  auto c = testing::Simulate(R"(
supply Ac (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 0.5 mH
firing Fi sync = Ac alpha = 140 deg alpha_max = 170 deg gamma = 18 deg
bridge Bi ac = (a, b, c) dc = (p, n) valve = thyristor firing = Fi Ron = 1 uohm
current_source Idc (n, p) dc = 100 A
simulate stop = 1 s
steady cycles = 2
probe Vd = p - n
)");
  REQUIRE(c.run.summary.steady_reached);
  const double k = 2 * kW * 0.5e-3 * kId / (std::sqrt(2.0) * kVll);
  const double alpha = std::acos(k - std::cos(18.0 / kDeg));
  INFO("alpha " << c.run.final_alpha[0] * kDeg << " deg (closed form " << alpha * kDeg << ")");
  REQUIRE(std::abs(c.run.final_alpha[0] - alpha) * kDeg < 0.3);
  for (const auto& r : EventLog(c.design->circuit, c.run, kF))
    if (r.event == "forward_voltage" && r.t >= c.run.summary.window_begin) REQUIRE(std::abs(r.extinction_deg - 18.0) < 0.3);
}

TEST_CASE("APhaseLockedLoopFiresWithinOneDegreeOfIdealUnderUnbalance", "[thyristor][pll]") {
  // 3 % negative sequence on a stiff supply: the SRF-PLL on the measured
  // terminal voltages must time every pulse within 1° of the ideal
  // (positive-sequence EMF) instants in steady state (Kaura & Blasko,
  // IEEE TIA 33(1), 1997: the loop rejects the 2ω term of an unbalance).
  auto firing_angles = [](const std::string& sync) {
    auto c = testing::Simulate(R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0.5 mohm L = 0.05 mH unbalance = 3 %
firing F sync = )" + sync + R"( alpha = 30 deg
bridge B1 ac = (a, b, c) dc = (p, n) valve = thyristor firing = F Ron = 1 uohm
current_source Iload (n, p) dc = 100 A
simulate stop = 1 s
steady cycles = 2
probe Vd = p - n
)");
    std::vector<double> angle(7, -1.0);  // last gate firing of each valve, degrees within the cycle
    for (const auto& e : c.run.events)
      if (e.on && e.cause == SwitchEvent::Cause::kGate && e.t >= c.run.summary.window_begin) {
        const std::string& name = c.design->circuit.devices()[e.device]->name();
        angle[name[3] - '0'] = std::fmod(e.t * kF * 360.0, 360.0);
      }
    return angle;
  };
  const auto ideal = firing_angles("Grid");
  const auto measured = firing_angles("(a, b, c)");
  for (int k = 1; k <= 6; ++k) {
    double error = std::abs(measured[k] - ideal[k]);
    error = std::min(error, 360.0 - error);
    INFO("valve " << k << ": ideal " << ideal[k] << " deg, PLL " << measured[k] << " deg");
    REQUIRE(ideal[k] >= 0);
    REQUIRE(error < 1.0);
  }
}

TEST_CASE("APhaseLockedGateEdgeInsideAStepThatHeldARootIsTakenWhereTheIntegratorIs", "[thyristor][pll]") {
  // A regression: with long steps (4°), a PLL update after a root return
  // that changed nothing moved the next gate edge behind the integrator's
  // own time, and setting that stop time failed the run. The run must
  // complete, and still fire within 1° of the ideal instants.
  auto c = testing::Simulate(R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0.5 mohm L = 0.05 mH unbalance = 3 %
firing F sync = (a, b, c) alpha = 30 deg
bridge B1 ac = (a, b, c) dc = (p, n) valve = thyristor firing = F Ron = 1 uohm
current_source Iload (n, p) dc = 100 A
simulate stop = 0.5 s max_step = 222 us
steady cycles = 2
probe Vd = p - n
)");
  REQUIRE(c.run.summary.status == RunSummary::Status::kCompleted);
  // Valve 1 fires α = 30° after its natural instant, 30° after phase a's
  // EMF zero (the supply's phase a is a sine): 60° into the cycle.
  for (const auto& e : c.run.events)
    if (e.on && e.cause == SwitchEvent::Cause::kGate && e.t >= c.run.summary.window_begin &&
        c.design->circuit.devices()[e.device]->name() == "B1[1]") {
      double angle = std::fmod(e.t * kF * 360.0, 360.0);
      INFO("valve 1 fired at " << angle << " deg");
      REQUIRE(std::abs(angle - 60.0) < 1.0);
    }
}

TEST_CASE("APhaseLockedLoopLosesNoGatePulse", "[thyristor][pll]") {
  // A regression: a PLL update at the end of a step can move the predicted
  // pulse start onto the integrator's own time, or just behind it. That
  // start was pushed a whole cycle on, and the valve (forward biased
  // already, so with no voltage zero left to fire on) missed its pulse
  // (valve 4 at 77 ms, here). In continuous conduction each thyristor of a
  // six-pulse bridge fires once a cycle (Mohan, Undeland & Robbins, 3rd ed.,
  // §6-4), so successive firings of a valve are one period apart, to the
  // 1° the loop is held to in the test above (Kaura & Blasko).
  const std::string text = R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0.5 mohm L = 0.05 mH unbalance = 3 %
firing F sync = (a, b, c) alpha = 30 deg
bridge B1 ac = (a, b, c) dc = (p, n) valve = thyristor firing = F Ron = 1 uohm
current_source Iload (n, p) dc = 100 A
simulate stop = 0.2 s
probe Vd = p - n
)";
  // The step pattern after each event matters: both ways of restarting
  // IDA (EngineOptions::Events::restart_derivative_from_step) are tried.
  for (bool derivative_from_step : {true, false}) {
    EngineOptions options;
    options.events.restart_derivative_from_step = derivative_from_step;
    auto c = testing::Simulate(text, options);  // REQUIREs a completed run
    std::map<std::string, std::vector<double>> fired;
    for (const auto& e : c.run.events)
      if (e.on && e.cause == SwitchEvent::Cause::kGate && e.t > 0.02)
        fired[c.design->circuit.devices()[e.device]->name()].push_back(e.t);
    REQUIRE(fired.size() == 6);
    for (const auto& [name, times] : fired) {
      INFO("derivative from a step: " << derivative_from_step << ", " << name);
      REQUIRE(times.size() >= 8);  // 180 ms
      for (std::size_t k = 1; k < times.size(); ++k) {
        INFO("firings at " << times[k - 1] << " s and " << times[k] << " s");
        REQUIRE(std::abs((times[k] - times[k - 1]) * kF - 1.0) * 360.0 < 1.0);
      }
    }
  }
}

TEST_CASE("ATurnOffTimeLongerThanTheExtinctionIntervalCausesCommutationFailure",
          "[thyristor][inverter]") {
  // At α = 150°, Ls = 0.5 mH: γ ≈ 23°, i.e. about 1.3 ms at 50 Hz.
  SECTION("tq = 0.5 ms: the valves recover in time") {
    auto c = testing::Simulate(ThyristorBridge(150.0, 0.5, "tq = 0.5 ms"));
    for (const auto& r : EventLog(c.design->circuit, c.run, kF)) REQUIRE(r.event != "commutation_failure");
  }
  SECTION("tq = 2 ms: forward voltage within tq re-fires a valve") {
    auto c = testing::Simulate(ThyristorBridge(150.0, 0.5, "tq = 2 ms"));
    int failures = 0;
    for (const auto& r : EventLog(c.design->circuit, c.run, kF)) {
      if (r.event != "commutation_failure") continue;
      ++failures;
      INFO("failure of " << r.valve << " at " << r.t << " s after gamma = " << r.extinction_deg << " deg");
      REQUIRE(r.extinction_deg < 2e-3 * 360 * kF);  // forward voltage came before tq elapsed
    }
    REQUIRE(failures > 0);
  }
}

}  // namespace
}  // namespace lcc
