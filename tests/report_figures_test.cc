// Figures of the report that follow from the circuit data by hand:
//
// - The commutating inductance the closed forms use is the supply's plus the
//   transformer's leakage, referred to the valve side: X = z·V2²/S·xr/√(1+xr²)
//   for the transformer (IEC 60076-1 short-circuit impedance on its rating)
//   and Vll²/Ssc·xr/√(1+xr²) for the supply, referred by (V2/V1)².
// - A six-pulse bridge with constant Id loads a star winding with
//   VA = √2·VLL·Id, so the transformer utilisation factor Pd/VA is 3/π
//   (check-values 1.17; Schaefer, Rectifier Circuits, Wiley 1965 tables).
// - The valve figures of the ideal bridge: mean Id/3, rms Id/√3, peak Id,
//   conduction 120°, peak reverse voltage √2·VLL (check-values 1.9, 1.10).
#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

const double kW = 2 * std::numbers::pi * 50.0;

// 11 kV, 150 MVA, x/r 10 supply; 1 MVA Dyn11 transformer, z 6 %, x/r 10, to
// 400 V; a bridge carrying 1 kA. `feed`, if any, sits between the
// supply's terminals (A0, B0, C0) and the transformer's (A, B, C).
std::string TransformerFedBridge(const std::string& feed = "") {
  return std::string("supply Grid ") + (feed.empty() ? "(A, B, C)" : "(A0, B0, C0)") +
         " Vll = 11 kV f = 50 Hz Ssc = 150 MVA xr = 10\n" + feed + R"(
transformer T hv = (A, B, C) lv = (a, b, c) group = Dyn11 S = 1 MVA V1 = 11 kV V2 = 400 V z = 6 % xr = 10 im = 0.2 %
bridge B ac = (a, b, c) dc = (p, n)
current_source Idc (n, p) dc = 1000 A
simulate stop = 300 ms
steady cycles = 2
)";
}

// The commutating reactance by hand: the transformer's z·V2²/S and the
// supply's V2²/Ssc (referred to 400 V), each with x = z·xr/√(1 + xr²).
double HandReactance() { return (0.06 * 400.0 * 400.0 / 1e6 + 400.0 * 400.0 / 150e6) * 10 / std::sqrt(101.0); }

TEST_CASE("TheCommutatingInductanceIsTheSupplyPlusTheLeakageReferredToTheValveSide", "[report][analytic]") {
  const CaseAnalysis a = testing::AnalyseText(TransformerFedBridge());
  const double x = HandReactance();
  const BridgeFigures& b = testing::BridgeNamed(a, "B");
  INFO("Ls " << b.ls_H << " H, expected " << x / kW);
  // The magnetising branch (im 0.2 %) shunts the short-circuit path by
  // about z·im = 1e-4 of it.
  REQUIRE(b.ls_H == Approx(x / kW).epsilon(0.002));
  REQUIRE(b.vll_V == Approx(400.0).epsilon(0.002));
  // The resistances, x/r = 10: R = X/10 for both.
  REQUIRE(b.rs_ohm == Approx(x / 10).epsilon(0.01));
  // The closed form leaves resistance out; outside the commutations two
  // phases and two valves (Ron 1 mohm) conduct, so the simulated Vd is
  // lower by about 2·(Rs + Ron)·Id (an estimate: during the overlap the
  // path differs, hence the 0.15-point tolerance).
  const double drop_pct = 100.0 * 2 * (b.rs_ohm + 1e-3) * 1000.0 / b.vd_closed_form_V;
  INFO("Vd difference " << b.vd_difference_pct << " %, resistive estimate " << -drop_pct << " %");
  REQUIRE(b.vd_difference_pct == Approx(-drop_pct).margin(0.15));
}

TEST_CASE("ClosedSwitchesInTheSupplyPathCountAsClosedForTheClosedForms", "[report][analytic]") {
  // HV fuse-switches in series (1 mohm each, closed): the same Ls as
  // without them, to within their resistance (a regression: the phasor
  // solves once opened every switch along with the valves).
  const CaseAnalysis a = testing::AnalyseText(TransformerFedBridge(
      "switch Fa (A0, A) state = closed\nswitch Fb (B0, B) state = closed\nswitch Fc (C0, C) state = closed"));
  const double x = HandReactance();
  REQUIRE(testing::BridgeNamed(a, "B").ls_H == Approx(x / kW).epsilon(0.002));
  REQUIRE(testing::BridgeNamed(a, "B").vll_V == Approx(400.0).epsilon(0.002));
}

TEST_CASE("ASixPulseBridgeUsesItsTransformerWithFactorThreeOverPi", "[report][analytic]") {
  for (const char* group : {"Dyn11", "Yy0"}) {
    SECTION(group) {
      const CaseAnalysis a = testing::AnalyseText(std::string(R"(
supply Grid (A, B, C) Vll = 11 kV f = 50 Hz R = 0 ohm L = 0 H
transformer T hv = (A, B, C) lv = (a, b, c) group = )") + group + R"( S = 1 MVA V1 = 11 kV V2 = 400 V z = 0.2 % xr = 50 im = 0.1 %
bridge B ac = (a, b, c) dc = (p, n) Ron = 1 uohm
current_source Idc (n, p) dc = 1000 A
simulate stop = 300 ms
steady cycles = 2
)");
      const AcPointFigures& lv = testing::AcPointNamed(a, "T LV");
      const AcPointFigures& hv = testing::AcPointNamed(a, "T HV");
      INFO("LV winding VA " << lv.winding_VA << ", utilisation " << lv.utilisation << "; HV " << hv.winding_VA << ", "
                            << hv.utilisation);
      REQUIRE(lv.winding_VA == Approx(std::sqrt(2.0) * 400.0 * 1000.0).epsilon(0.01));
      REQUIRE(lv.utilisation == Approx(3 / std::numbers::pi).epsilon(0.01));
      REQUIRE(hv.utilisation == Approx(3 / std::numbers::pi).epsilon(0.01));
    }
  }
}

TEST_CASE("ValveFiguresOfTheIdealBridge", "[report][analytic]") {
  const CaseAnalysis a = testing::AnalyseText(R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 0 H
bridge B ac = (a, b, c) dc = (p, n) Ron = 1 uohm
current_source Idc (n, p) dc = 100 A
simulate stop = 200 ms
steady cycles = 2
)");
  const BridgeFigures& b = testing::BridgeNamed(a, "B");
  REQUIRE(b.valves.size() == 6);
  for (const auto& v : b.valves) {
    INFO(v.name);
    REQUIRE(v.i_mean_A == Approx(100.0 / 3).epsilon(0.01));
    REQUIRE(v.i_rms_A == Approx(100.0 / std::sqrt(3.0)).epsilon(0.01));
    REQUIRE(v.i_peak_A == Approx(100.0).epsilon(0.001));
    REQUIRE(v.conduction_deg == Approx(120.0).margin(0.1));
    REQUIRE(v.v_reverse_peak_V == Approx(std::sqrt(2.0) * 400.0).epsilon(0.005));
    // I²t over the two-cycle window: Irms²·2T.
    REQUIRE(v.i2t_A2s == Approx(100.0 * 100.0 / 3 * 0.04).epsilon(0.01));
  }
  // DC side: Vdo = 1.35·VLL, ripple 6th harmonic (check-values 1.1, 1.4),
  // p-p ripple 0.18947·VLL (check-values 1.6).
  REQUIRE(b.vd.mean == Approx(3 * std::sqrt(2.0) / std::numbers::pi * 400.0).epsilon(0.002));
  REQUIRE(b.ripple_order == 6);
  REQUIRE(b.vd.ripple_pp == Approx(0.18947 * 400.0).epsilon(0.01));
}

}  // namespace
}  // namespace lcc
