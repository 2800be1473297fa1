// Units: SI prefixes and derived units (BIPM, The International System of
// Units, 9th ed., 2019, tables 4 and 7) and dimensional names.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "parser/units.h"

namespace lcc {
namespace {

TEST_CASE("PrefixedUnitsScaleBySiPrefixes", "[units]") {
  struct Case { const char* word; double scale; Dim dim; };
  const Case cases[] = {
      {"V", 1.0, dims::kVoltage},        {"kV", 1e3, dims::kVoltage},
      {"mH", 1e-3, dims::kInductance},   {"uF", 1e-6, dims::kCapacitance},
      {"\xC2\xB5s", 1e-6, dims::kTime},  {"MVA", 1e6, dims::kPower},
      {"kA", 1e3, dims::kCurrent},       {"mohm", 1e-3, dims::kResistance},
      {"\xCE\xA9", 1.0, dims::kResistance}, {"GHz", 1e9, dims::kFrequency},
      {"ms", 1e-3, dims::kTime},         {"%", 0.01, dims::kNone},
  };
  for (const auto& c : cases) {
    INFO(c.word);
    auto u = LookUpUnit(c.word);
    REQUIRE(u);
    REQUIRE(u->scale == Approx(c.scale).epsilon(1e-15));
    REQUIRE(u->dim == c.dim);
  }
}

TEST_CASE("DegreesAreRadiansTimesPiOver180", "[units]") {
  REQUIRE(LookUpUnit("deg")->scale == Approx(std::numbers::pi / 180.0).epsilon(1e-15));
  REQUIRE_FALSE(LookUpUnit("kdeg"));  // angles take no prefix
}

TEST_CASE("UnknownWordsAndWrongCaseAreNotUnits", "[units]") {
  REQUIRE_FALSE(LookUpUnit("Ohms"));
  REQUIRE_FALSE(LookUpUnit("KV"));   // the kilo prefix is lower case
  REQUIRE_FALSE(LookUpUnit("mm"));   // no lengths in a netlist
  REQUIRE_FALSE(LookUpUnit(""));
}

TEST_CASE("DerivedDimensionsComposeFromBaseUnits", "[units]") {
  // V = W/A, ohm = V/A, H = V·s/A, F = A·s/V (SI brochure, table 4).
  REQUIRE(dims::kPower / dims::kCurrent == dims::kVoltage);
  REQUIRE(dims::kVoltage / dims::kCurrent == dims::kResistance);
  REQUIRE(dims::kVoltage * dims::kTime / dims::kCurrent == dims::kInductance);
  REQUIRE(dims::kCurrent * dims::kTime / dims::kVoltage == dims::kCapacitance);
  REQUIRE(UnitLabel(dims::kVoltage * dims::kCurrent) == "W");
  REQUIRE(DimName(dims::kInductance) == "inductance [H]");
}

}  // namespace
}  // namespace lcc
