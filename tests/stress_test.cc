// Numerical stress: a six-pulse diode bridge at the edges of the design
// space. Each case either matches its closed form or fails with a message
// that names the cause; none may hang (each runs under a step and a
// wall-clock limit).
//
// Closed forms (constant Id, sinusoidal EMF behind Ls, no resistance):
//   Vd = Vdo − 3ωLs·Id/π,  Vdo = (3√2/π)·VLL,  cos μ = 1 − 2ωLs·Id/(√2·VLL)
// Mohan, Undeland & Robbins, Power Electronics, 3rd ed., Wiley 2003,
// §5-6 and §5-7 (check-values §1, §2). Where a case's resistance is not
// negligible the expected Vd is lowered by its drop, derived beside it.
#include <catch2/catch.hpp>

#include <fmt/format.h>

#include <cmath>
#include <numbers>

#include "results/case_recorder.h"
#include "results/channels.h"
#include "results/commutation.h"
#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

constexpr double kPi = std::numbers::pi;

// Every stress case runs under these limits: a case that would hang fails.
EngineOptions Limited() {
  EngineOptions o;
  o.limits.max_steps = 2'000'000;
  o.limits.max_wall_seconds = 60.0;
  return o;
}

struct Bridge {
  double vll = 400.0;   // V
  double f = 50.0;      // Hz
  double ls = 1e-3;     // H, per phase, pure inductance
  double id = 100.0;    // A
  double ron = 1e-3;    // ohm
  double roff = 1e9;    // ohm

  std::string Netlist() const {
    const double cycles = 10;
    return fmt::format(R"(
supply Grid (a, b, c) Vll = {} V f = {} Hz R = 0 ohm L = {} H
bridge B ac = (a, b, c) dc = (p, n) Ron = {} ohm Roff = {} ohm
current_source Iload (n, p) dc = {} A
simulate stop = {} s
steady cycles = 2
probe Vd = p - n
)",
                       vll, f, ls, ron, roff, id, cycles / f);
  }
  double Vdo() const { return 3 * std::sqrt(2.0) / kPi * vll; }
  double X() const { return 2 * kPi * f * ls; }
  double Mu() const { return std::acos(1 - 2 * X() * id / (std::sqrt(2.0) * vll)); }
  // Two valves conduct outside the overlaps, the commutating pair shares Id
  // during them (each side's drop Ron·Id/2 then: the mean of the two
  // paths); a side is in overlap 3μ/(2π) of the time. So the resistive drop
  // is 2·Ron·Id·(1 − 3μ/(4π)) (our derivation, first order in Ron/ωLs).
  double Vd() const { return Vdo() - 3 * X() * id / kPi - 2 * ron * id * (1 - 3 * Mu() / (4 * kPi)); }
};

// Runs the bridge, requires completion, and checks Vd (relative) and every
// overlap of the window (degrees) against the closed forms.
void CheckBridge(const Bridge& b, double vd_tolerance, double mu_tolerance_deg) {
  auto c = testing::Simulate(b.Netlist(), Limited());
  INFO(c.run.summary.FullReport(false));
  REQUIRE(c.run.summary.status == RunSummary::Status::kCompleted);
  const double vd = c.Window("Vd").mean;
  INFO("Vd " << vd << " V, closed form " << b.Vd() << " V; mu closed form " << b.Mu() * 180 / kPi << " deg");
  REQUIRE(std::abs(vd - b.Vd()) / b.Vd() < vd_tolerance);
  const auto& group = c.design->circuit.valve_groups().at(0);
  const auto commutations =
      BridgeCommutations(group, c.run.events, b.f, c.run.summary.window_begin, c.run.summary.window_end);
  REQUIRE(commutations.size() >= 6);
  for (const auto& m : commutations) {
    INFO("mu " << m.overlap * 180 / kPi << " deg");
    REQUIRE(std::abs(m.overlap - b.Mu()) * 180 / kPi < mu_tolerance_deg);
  }
}

TEST_CASE("StressValveOnResistanceFromOneMicroohmToOneOhm", "[stress]") {
  // Id 1 A behind 100 mH (ωLs = 31 ohm): Ron stays small beside ωLs, and at
  // 1 ohm its drop (about 1.8 V, 0.33 % of Vd) is what the check sees.
  for (double ron : {1e-6, 1e-3, 1.0}) {
    Bridge b;
    b.ls = 0.1;
    b.id = 1.0;
    b.ron = ron;
    INFO("Ron " << ron << " ohm");
    CheckBridge(b, 0.001, 0.3);
  }
}

TEST_CASE("StressValveOffResistanceFromOneKiloohmToOneGigaohm", "[stress]") {
  // The leakage through three blocking valves at 1 kohm (about 0.3 A beside
  // Id = 100 A) changes Vd by well under the tolerance.
  for (double roff : {1e3, 1e6, 1e9}) {
    Bridge b;
    b.roff = roff;
    INFO("Roff " << roff << " ohm");
    CheckBridge(b, 0.003, 0.3);
  }
}

TEST_CASE("StressSupplyVoltageFrom100VTo500kV", "[stress]") {
  // The same per-unit commutation (2ωLs·Id/(√2·VLL) = 0.1, μ = 25.8°) at
  // each voltage.
  for (double vll : {100.0, 11e3, 500e3}) {
    Bridge b;
    b.vll = vll;
    b.ls = vll / 400.0 * 1e-3;
    b.id = 0.1 * std::sqrt(2.0) * vll / (2 * b.X());
    INFO("VLL " << vll << " V, Id " << b.id << " A");
    CheckBridge(b, 0.003, 0.3);
  }
}

TEST_CASE("StressShortCircuitPowerFrom1MVATo50GVA", "[stress]") {
  // At 400 V: X = VLL²/Ssc, from 0.16 ohm (μ = 19°) to 3.2 uohm (μ = 0.4°,
  // a commutation of 20 us).
  for (double ssc : {1e6, 1e9, 50e9}) {
    Bridge b;
    b.ls = b.vll * b.vll / ssc / (2 * kPi * b.f);
    b.ron = 1e-6;
    INFO("Ssc " << ssc << " VA");
    CheckBridge(b, 0.003, 0.3);
  }
}

TEST_CASE("StressFrequencyFrom16Point7HzTo400Hz", "[stress]") {
  for (double f : {16.7, 50.0, 400.0}) {
    Bridge b;
    b.f = f;
    b.id = f > 100 ? 20.0 : 100.0;
    INFO("f " << f << " Hz");
    CheckBridge(b, 0.003, 0.3);
  }
}

// A bridge on a stiff supply into R, L and a back-EMF E (a battery charger).
std::string ChargerNetlist(double l, double r, double e, double vll) {
  return fmt::format(R"(
supply Grid (a, b, c) Vll = {} V f = 50 Hz R = 0 ohm L = 0 H
bridge B ac = (a, b, c) dc = (p, n) Ron = 1 uohm
inductor Ld (p, q) L = {} H
resistor Rl (q, m) R = {} ohm
voltage_source E (m, n) dc = {} V
simulate stop = 200 ms
steady cycles = 2
probe Id = Ld.i
)",
                     vll, l, r, e);
}

TEST_CASE("StressDcInductanceOneMicrohenryConductsDiscontinuously", "[stress]") {
  // With L → 0 the current flows only while the line-voltage envelope
  // √2·VLL·cos θ exceeds E, |θ| < θc = acos(E/(√2·VLL)) < 30° in each sixth
  // of the cycle, as (√2·VLL·cos θ − E)/R. Its mean (our derivation):
  //   Id = (3/(π·R))·(2√2·VLL·sin θc − 2·E·θc).
  // L = 1 uH with R = 0.1 ohm (τ = 10 us) departs from it by far less than 1 %.
  const double vll = 400.0, r = 0.1, e = 0.9 * std::sqrt(2.0) * vll;
  const double theta = std::acos(e / (std::sqrt(2.0) * vll));
  const double id = 3 / (kPi * r) * (2 * std::sqrt(2.0) * vll * std::sin(theta) - 2 * e * theta);
  auto c = testing::Simulate(ChargerNetlist(1e-6, r, e, vll), Limited());
  REQUIRE(c.run.summary.status == RunSummary::Status::kCompleted);
  const WindowStats s = c.Window("Id");
  INFO("Id mean " << s.mean << " A, derived " << id << " A; min " << s.min << " A");
  REQUIRE(std::abs(s.mean - id) / id < 0.01);
  REQUIRE(s.min < 1e-3 * id);  // discontinuous: the current stops between pulses
}

TEST_CASE("StressDcInductanceTenHenryIsSmooth", "[stress]") {
  // Continuous conduction behind Ls = 1 mH into R = 5 ohm (E = 0):
  // Id = Vd/R with Vd = Vdo − 3ωLs·Id/π − 2·Ron·Id, so
  // Id = Vdo/(R + 3ωLs/π) (Ron = 1 uohm). Started at that current (i0),
  // since L/R = 2 s.
  const double vll = 400.0, r = 5.0, x = 2 * kPi * 50 * 1e-3;
  const double vdo = 3 * std::sqrt(2.0) / kPi * vll;
  const double id = vdo / (r + 3 * x / kPi);
  auto c = testing::Simulate(fmt::format(R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 1 mH
bridge B ac = (a, b, c) dc = (p, n) Ron = 1 uohm
inductor Ld (p, q) L = 10 H i0 = {} A
resistor Rl (q, n) R = 5 ohm
simulate stop = 200 ms
steady cycles = 2
probe Id = Ld.i
)",
                                         id),
                             Limited());
  REQUIRE(c.run.summary.status == RunSummary::Status::kCompleted);
  const WindowStats s = c.Window("Id");
  INFO("Id " << s.mean << " A, closed form " << id << " A");
  REQUIRE(std::abs(s.mean - id) / id < 0.003);
  // Ripple: the six-pulse voltage's 6th harmonic is about 5.7 % of Vdo
  // (amplitude 2·Vdo/(6² − 1) with no overlap; Mohan et al. §5-6), about
  // 31 V, across 6ωL = 18.8 kohm: some 3 mA peak to peak, 3e-5 of Id.
  REQUIRE(s.max - s.min < 1e-3 * id);
}

TEST_CASE("StressLightLoadGivesVdo", "[stress]") {
  // 1 Mohm load (0.5 mA): no overlap, Vd = Vdo, the mean of the six-pulse
  // envelope (Mohan et al. eq. 5-33 with Ls = 0).
  auto c = testing::Simulate(R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 1 mH
bridge B ac = (a, b, c) dc = (p, n)
resistor Rl (p, n) R = 1 Mohm
simulate stop = 200 ms
steady cycles = 2
probe Vd = p - n
)",
                             Limited());
  REQUIRE(c.run.summary.status == RunSummary::Status::kCompleted);
  const double vdo = 3 * std::sqrt(2.0) / kPi * 400.0;
  INFO("Vd " << c.Window("Vd").mean << " V, Vdo " << vdo << " V");
  REQUIRE(std::abs(c.Window("Vd").mean - vdo) / vdo < 0.003);
}

TEST_CASE("StressZeroLoadOnACapacitorHoldsThePeakLineVoltage", "[stress]") {
  // No load but a DC capacitor (started charged): the bridge is a peak
  // rectifier and Vd settles at √2·VLL, the valves all but blocking.
  const double peak = std::sqrt(2.0) * 400.0;
  auto c = testing::Simulate(fmt::format(R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 1 mH
bridge B ac = (a, b, c) dc = (p, n)
capacitor Cd (p, n) C = 1 mF v0 = {} V
simulate stop = 200 ms
steady cycles = 2
probe Vd = p - n
)",
                                         0.99 * peak),
                             Limited());
  REQUIRE(c.run.summary.status == RunSummary::Status::kCompleted);
  INFO("Vd " << c.Window("Vd").mean << " V, √2·VLL " << peak << " V");
  REQUIRE(std::abs(c.Window("Vd").mean - peak) / peak < 0.003);
}

TEST_CASE("StressASupplyFarSlowerThanTheRunIsADcSource", "[stress]") {
  // A 1 µHz supply over 20 ms: its EMFs stand still at their t = 0 values
  // (θ moves 1.3e-7 rad), e_a = 0, e_b = −e_c = −√(2/3)·Vll·sin 120° by the
  // supply's sine reference (docs/netlist.md). A diode bridge's output is
  // the most positive phase less the most negative (Mohan, Undeland &
  // Robbins, Power Electronics, 3rd ed., Wiley 2003, §5-6), here
  // e_c − e_b = √2·Vll, which the load divides with the two conducting
  // valves' Ron once the 1 mH has settled (L/R = 0.2 ms).
  // The analysis window asked for (two cycles, 2·10⁶ s) is far longer than
  // the run: the analysis recorder must be sized by the run, not by the
  // window (it asked for 10¹¹ rows, and the case failed with bad_alloc
  // before any result was written).
  const double vll = 400.0, r_load = 10.0, ron = 1e-3;
  const std::string text = fmt::format(R"(
supply Grid (a, b, c) Vll = {} V f = 1e-6 Hz R = 0 ohm L = 1 mH
bridge B ac = (a, b, c) dc = (p, n) Ron = {} ohm Vf = 0 V
resistor Rload (p, n) R = {} ohm
simulate stop = 20 ms sample = 20 us
steady cycles = 2
probe Vd = p - n
)",
                                       vll, ron, r_load);
  Diagnostics diags;
  auto design = ElaborateText("slow.lcc", text, diags);
  REQUIRE(design);
  REQUIRE_FALSE(diags.has_errors());
  const auto recorder = RecorderFor(design->study, BuildAnalysisChannels(design->circuit));
  REQUIRE(recorder->capacity() <= static_cast<std::size_t>(std::ceil(20e-3 / 20e-6)) + 4);

  const CaseAnalysis a = testing::AnalyseText(text, Limited());
  REQUIRE(a.probes.size() == 1);
  const double expected = std::sqrt(2.0) * vll * r_load / (r_load + 2 * ron);
  // The highest sample, reached once the current has settled, against the
  // settled value; the mean over the run, which includes the 0.2 ms rise
  // from zero, within 2 % (0.2/20 = 1 %).
  REQUIRE(a.probes[0].stats.max == Approx(expected).epsilon(1e-4));
  REQUIRE(a.probes[0].stats.mean == Approx(expected).epsilon(0.02));
}

TEST_CASE("StressTheChatteringGuardNamesTheValveAndTheRemedy", "[stress]") {
  // The guard ends a run whose valves switch again and again within a
  // sliver of a period. Made to trip on an ordinary bridge (five events in
  // a row each within a tenth of a period of the last) to check what it
  // says: the valve, the count, the time, and what to try.
  Bridge b;
  EngineOptions o = Limited();
  o.events.chatter_events = 5;
  o.events.chatter_window = 0.1;
  Diagnostics diags;
  auto design = ElaborateText("s.lcc", b.Netlist(), diags);
  REQUIRE(design);
  CheckTopology(design->circuit, diags);
  ProbeRecorder recorder(design->study.probes);
  const RunResult run = lcc::Simulate(design->circuit, design->study, o, recorder);
  INFO(run.summary.message);
  REQUIRE(run.summary.status == RunSummary::Status::kFailed);
  REQUIRE(run.summary.message.find("switched 5 times") != std::string::npos);
  REQUIRE(run.summary.message.find("chattering; consider a snubber or a larger Roff") != std::string::npos);
  REQUIRE(run.summary.message.find("B[") != std::string::npos);
}

TEST_CASE("StressAStepLimitStopsACaseWithAMessage", "[stress]") {
  // The limits that keep every case from hanging: the run ends, failed,
  // saying which limit and where.
  Bridge b;
  EngineOptions o = Limited();
  o.limits.max_steps = 200;
  auto design_text = b.Netlist();
  Diagnostics diags;
  auto design = ElaborateText("s.lcc", design_text, diags);
  REQUIRE(design);
  CheckTopology(design->circuit, diags);
  ProbeRecorder recorder(design->study.probes);
  const RunResult run = lcc::Simulate(design->circuit, design->study, o, recorder);
  REQUIRE(run.summary.status == RunSummary::Status::kFailed);
  REQUIRE(run.summary.message.find("step limit of 200 steps") != std::string::npos);
  REQUIRE(run.summary.samples > 0);  // what was computed is kept
}

}  // namespace
}  // namespace lcc
