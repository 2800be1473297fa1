// Units and dimensional analysis.
//
// A Dim is the vector of exponents over the SI base quantities the netlist
// needs: mass (kg), length (m), time (s) and current (A). Every derived unit
// used in converter work is a product of these (V = kg·m²·s⁻³·A⁻¹, ...).
// Angles and % are dimensionless: `30 deg` is 0.5236, `6 %` is 0.06.
//
// LookUpUnit() turns a unit word such as "mH", "kV", "MVA", "Ω", "us" or
// "deg" into a scale factor and a Dim; prefixes are SI and case-sensitive.
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace lcc {

struct Dim {
  int kg = 0, m = 0, s = 0, A = 0;

  friend bool operator==(const Dim&, const Dim&) = default;
  Dim operator*(const Dim& o) const { return {kg + o.kg, m + o.m, s + o.s, A + o.A}; }
  Dim operator/(const Dim& o) const { return {kg - o.kg, m - o.m, s - o.s, A - o.A}; }
  Dim Pow(int n) const { return {kg * n, m * n, s * n, A * n}; }
  bool dimensionless() const { return *this == Dim{}; }
};

namespace dims {
inline constexpr Dim kNone{};
inline constexpr Dim kTime{0, 0, 1, 0};
inline constexpr Dim kFrequency{0, 0, -1, 0};
inline constexpr Dim kCurrent{0, 0, 0, 1};
inline constexpr Dim kVoltage{1, 2, -3, -1};
inline constexpr Dim kResistance{1, 2, -3, -2};
inline constexpr Dim kInductance{1, 2, -2, -2};
inline constexpr Dim kCapacitance{-1, -2, 4, 2};
inline constexpr Dim kPower{1, 2, -3, 0};
inline constexpr Dim kEnergy{1, 2, -2, 0};
inline constexpr Dim kCharge{0, 0, 1, 1};
inline constexpr Dim kConductance{-1, -2, 3, 2};
}  // namespace dims

// A value in SI base units with its dimension.
struct Quantity {
  double value = 0.0;
  Dim dim;
};

struct UnitInfo {
  double scale = 1.0;  // multiply the number by this to get SI base units
  Dim dim;
};

// Resolves a unit word, or returns nothing if it is not a known unit.
std::optional<UnitInfo> LookUpUnit(std::string_view word);

// The quantity's name for messages: "voltage", "current", "inductance", ...;
// an unnamed dimension is written in base units ("kg·m²·s⁻²").
std::string DimName(const Dim& d);

// The unit written in output headers: "V", "A", "W", "ohm", "s", "1", or a
// product of base units ("kg m2 s-3") when no named unit fits.
std::string UnitLabel(const Dim& d);

// The unit words accepted, for hints.
std::string KnownUnitsHint();

}  // namespace lcc
