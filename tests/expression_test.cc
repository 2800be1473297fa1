// Expressions: arithmetic, precedence, functions and dimensional analysis.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "parser/elaborate.h"

namespace lcc {
namespace {

// Elaborates `param x = EXPR` followed by a trivial circuit and returns x
// through a probe-free route: a resistor whose R is x.
double Value(const std::string& expr) {
  Diagnostics diags;
  auto d = ElaborateText("t.lcc", "param x = " + expr + "\nresistor R1 (a, gnd) R = x\n", diags);
  INFO(diags.Format());
  REQUIRE(d);
  auto* r = d->circuit.FindDevice("R1");
  LinearForm f;
  Dim dim;
  REQUIRE(r->Signal("i", &f, &dim));
  return 1.0 / f.y.at(0).second;  // the conductance is 1/R
}

std::string Error(const std::string& text) {
  Diagnostics diags;
  ElaborateText("t.lcc", text, diags);
  return diags.Format();
}

TEST_CASE("ArithmeticFollowsUsualPrecedence", "[expression]") {
  REQUIRE(Value("2 + 3 * 4") == Approx(14));
  REQUIRE(Value("(2 + 3) * 4") == Approx(20));
  REQUIRE(Value("2 ^ 3 ^ 2") == Approx(512));  // right associative
  REQUIRE(Value("-2 ^ 2 + 8") == Approx(4));   // the sign applies after the power
  REQUIRE(Value("10 / 4 / 5") == Approx(0.5));
}

TEST_CASE("UnitsScaleAndPropagate", "[expression]") {
  REQUIRE(Value("2.5 kohm") == Approx(2500));
  REQUIRE(Value("11 kV / 2 A") == Approx(5500));
  REQUIRE(Value("400 V ^ 2 / 1 MVA") == Approx(0.16));  // Z = V²/S
  REQUIRE(Value("sqrt(4 ohm ^ 2)") == Approx(4));  // (4 Ω)² = 16 Ω²
  REQUIRE(Value("2*pi*50 Hz * 10 mH") == Approx(2 * std::numbers::pi * 0.5));  // X = ωL
}

TEST_CASE("FunctionsEvaluateInRadians", "[expression]") {
  REQUIRE(Value("cos(60 deg) * 1 ohm") == Approx(0.5));
  REQUIRE(Value("atan2(1 V, 1 V) * 4 ohm") == Approx(std::numbers::pi));
  REQUIRE(Value("max(1 ohm, 3 ohm, 2 ohm)") == Approx(3));
  REQUIRE(Value("exp(log(7)) * 1 ohm") == Approx(7));
}

TEST_CASE("DimensionErrorsNameBothQuantities", "[expression]") {
  REQUIRE(Error("param x = 1 V + 2 A\n").find("cannot add voltage [V] and current [A]") != std::string::npos);
  REQUIRE(Error("param x = sin(1 V)\n").find("sin() needs a plain number") != std::string::npos);
  REQUIRE(Error("param x = 2 V ^ 0.5\n").find("whole constant power") != std::string::npos);
  REQUIRE(Error("param x = sqrt(2 V)\n").find("sqrt() of voltage [V] has no unit") != std::string::npos);
}

TEST_CASE("DomainErrorsAreReportedAtTheirColumn", "[expression]") {
  REQUIRE(Error("param x = log(0)\n").find("t.lcc:1:11: error: log() of a value that is not positive") !=
          std::string::npos);
  REQUIRE(Error("param x = 1e999\n").find("t.lcc:1:11: error: number '1e999' is out of range") !=
          std::string::npos);
}

}  // namespace
}  // namespace lcc
