// Elaboration: settings, defaults, composites and reporting of all errors.
#include <catch2/catch.hpp>
#include <cmath>

#include "models/source_branch.h"
#include "models/valve.h"
#include "parser/elaborate.h"

namespace lcc {
namespace {

TEST_CASE("ABridgeExpandsIntoSixValvesInConductionOrder", "[elaborate]") {
  Diagnostics diags;
  auto d = ElaborateText("t.lcc", R"(
supply G (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 0 H
bridge B ac = (a, b, c) dc = (p, n) Vf = 1 V
resistor Rl (p, n) R = 10 ohm
)", diags);
  INFO(diags.Format());
  REQUIRE(d);
  const Circuit& c = d->circuit;
  // 1: a→p, 2: n→c, 3: b→p, 4: n→a, 5: c→p, 6: n→b (anode→cathode).
  const char* expected[6][2] = {{"a", "p"}, {"n", "c"}, {"b", "p"}, {"n", "a"}, {"c", "p"}, {"n", "b"}};
  for (int k = 0; k < 6; ++k) {
    const Device* v = c.FindDevice("B[" + std::to_string(k + 1) + "]");
    REQUIRE(v);
    REQUIRE(c.node_name(v->nodes()[0]) == expected[k][0]);
    REQUIRE(c.node_name(v->nodes()[1]) == expected[k][1]);
    REQUIRE(static_cast<const Valve*>(v)->params().v_f == 1.0);
  }
  REQUIRE(c.valve_groups().size() == 1);
}

TEST_CASE("SupplyImpedanceFollowsFromShortCircuitPower", "[elaborate]") {
  // Z = Vll²/Ssc, R = Z/√(1+xr²), X = xr·R (the usual network equivalent).
  Diagnostics diags;
  auto d = ElaborateText("t.lcc", "supply G (a, b, c) Vll = 11 kV f = 50 Hz Ssc = 100 MVA xr = 10\n"
                                  "resistor R1 (a, gnd) R = 1 ohm\nresistor R2 (b, gnd) R = 1 ohm\n"
                                  "resistor R3 (c, gnd) R = 1 ohm\n", diags);
  REQUIRE(d);
  const auto* z = dynamic_cast<const SourceBranch*>(d->circuit.FindDevice("G.a"));
  REQUIRE(z);
  const double zmag = 11e3 * 11e3 / 100e6;
  const double r = zmag / std::sqrt(101.0);
  REQUIRE(z->resistance() == Approx(r).epsilon(1e-12));
  REQUIRE(z->inductance() == Approx(10 * r / (2 * M_PI * 50)).epsilon(1e-12));
  // Phase a's EMF peak is √(2/3)·Vll.
  REQUIRE(z->waveform().sines.at(0).amplitude == Approx(std::sqrt(2.0 / 3.0) * 11e3).epsilon(1e-12));
}

TEST_CASE("AllErrorsOfAFileAreReportedNotOnlyTheFirst", "[elaborate]") {
  Diagnostics diags;
  ElaborateText("t.lcc", "resistor R1 (a, gnd) R = 5 V\nresistr R2 (a, gnd)\ninductor L1 (a, gnd) L = -1 H\n", diags);
  REQUIRE(diags.error_count() == 3);
  const std::string text = diags.Format();
  REQUIRE(text.find("t.lcc:1:") != std::string::npos);
  REQUIRE(text.find("t.lcc:2:") != std::string::npos);
  REQUIRE(text.find("t.lcc:3:") != std::string::npos);
}

TEST_CASE("ADuplicateNamePointsAtBothDefinitions", "[elaborate]") {
  Diagnostics diags;
  ElaborateText("t.lcc", "param R1 = 2 ohm\nresistor R1 (a, gnd) R = R1\n", diags);
  const std::string text = diags.Format();
  REQUIRE(text.find("t.lcc:2:10: error: 'R1' is already defined") != std::string::npos);
  REQUIRE(text.find("t.lcc:1:7: note: first defined here") != std::string::npos);
}

TEST_CASE("ProbesResolveNodesElementsAndSupplyPorts", "[elaborate]") {
  Diagnostics diags;
  auto d = ElaborateText("t.lcc", R"(
supply G (a, b, c) Vll = 400 V f = 50 Hz R = 1 mohm L = 0.1 mH
bridge B ac = (a, b, c) dc = (p, n)
inductor Ld (p, q) L = 1 mH
resistor Rl (q, n) R = 1 ohm
probe Vd = p - n
probe P = (p - n) * Ld.i
probe Ia = G.a.i
probe Iv = B[4].i
)", diags);
  INFO(diags.Format());
  REQUIRE(d);
  REQUIRE(d->study.probes.size() == 4);
  REQUIRE(d->study.probes[0].unit() == "V");
  REQUIRE(d->study.probes[1].unit() == "W");
  REQUIRE(d->study.probes[2].unit() == "A");
  REQUIRE(d->study.fundamental == 50.0);
}

}  // namespace
}  // namespace lcc
