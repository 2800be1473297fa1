// Topology checks: each error names the elements and their lines.
#include <catch2/catch.hpp>

#include "engine/topology.h"
#include "parser/elaborate.h"
#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

using testing::DiagnosticsOf;

TEST_CASE("AVoltageLoopNamesEverySourceAndCapacitorInIt", "[topology]") {
  const std::string text = DiagnosticsOf(
      "voltage_source E1 (a, gnd) dc = 1 V\ncapacitor C1 (a, b) C = 1 uF\nvoltage_source E2 (b, gnd) dc = 1 V\n");
  REQUIRE(text.find("test.lcc:3:16: error: voltage sources and capacitors form a loop:") != std::string::npos);
  for (const char* part : {"E1 (test.lcc:1)", "C1 (test.lcc:2)", "E2 (test.lcc:3)"}) {
    INFO(part);
    REQUIRE(text.find(part) != std::string::npos);
  }
}

TEST_CASE("ANodeOnCapacitorsOnlyHasNoDcPath", "[topology]") {
  const std::string text = DiagnosticsOf(
      "voltage_source E1 (a, gnd) dc = 1 V\ncapacitor C1 (a, x) C = 1 uF\ncapacitor C2 (x, gnd) C = 1 uF\n");
  REQUIRE(text.find("node 'x' has no DC path to gnd; it is connected only through C1 (test.lcc:2), C2 "
                    "(test.lcc:3)") != std::string::npos);
}

TEST_CASE("ANodeWithASingleConnectionIsWarnedAtItsName", "[topology]") {
  // 'q' is misspelt 'qq' in the load: the reactor's end and the load's
  // end are each on one terminal only. A warning (the circuit can still be
  // simulated, open there), at the node's first mention, naming the element.
  Diagnostics diags;
  auto d = ElaborateText("t.lcc",
                         "voltage_source E (p, gnd) dc = 100 V\ninductor Ld (p, q) L = 1 mH\n"
                         "resistor Rl (qq, gnd) R = 1 ohm\n",
                         diags);
  REQUIRE(d);
  REQUIRE(CheckTopology(d->circuit, diags).ok);
  const std::string text = diags.Format();
  REQUIRE_FALSE(diags.has_errors());
  REQUIRE(text.find("t.lcc:2:17: warning: node 'q' has a single connection, Ld (t.lcc:2)") != std::string::npos);
  REQUIRE(text.find("t.lcc:3:14: warning: node 'qq' has a single connection, Rl (t.lcc:3)") != std::string::npos);
  // A node on two terminals is not warned about.
  REQUIRE(text.find("node 'p'") == std::string::npos);
}

TEST_CASE("ACurrentSourceInSeriesWithAnInductorIsACutSet", "[topology]") {
  const std::string text = DiagnosticsOf(
      "voltage_source E1 (a, gnd) dc = 1 V\nresistor R1 (a, gnd) R = 1 ohm\ncurrent_source J (a, x) dc = 1 A\n"
      "inductor L1 (x, gnd) L = 1 mH\n");
  REQUIRE(text.find("cut-set around node 'x': J (test.lcc:3), L1 (test.lcc:4)") != std::string::npos);
}

TEST_CASE("APartJoinedOnlyThroughInductorsGetsAReferenceAndANote", "[topology]") {
  Diagnostics diags;
  auto d = ElaborateText("t.lcc", "supply G (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 1 mH\n"
                                  "resistor Rab (a, b) R = 10 ohm\nresistor Rbc (b, c) R = 10 ohm\n", diags);
  REQUIRE(d);
  auto report = CheckTopology(d->circuit, diags);
  REQUIRE(report.ok);
  REQUIRE(report.notes.size() == 1);
  REQUIRE(report.notes[0].find("added reference.a (1e+06 ohm to gnd)") != std::string::npos);
  REQUIRE(d->circuit.FindDevice("reference.a"));
}

TEST_CASE("AUserEarthingMakesNoReferenceNecessary", "[topology]") {
  Diagnostics diags;
  auto d = ElaborateText("t.lcc", "supply G (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 1 mH\n"
                                  "resistor Rab (a, b) R = 10 ohm\nresistor Rbc (b, c) R = 10 ohm\n"
                                  "resistor Rearth (c, gnd) R = 1 kohm\n", diags);
  REQUIRE(d);
  REQUIRE(CheckTopology(d->circuit, diags).notes.empty());
}

}  // namespace
}  // namespace lcc
