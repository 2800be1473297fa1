#include "parser/units.h"

#include <array>
#include <cmath>
#include <numbers>

namespace lcc {
namespace {

struct NamedUnit {
  std::string_view word;
  double scale;
  Dim dim;
  bool takes_prefix;
};

// Base words. "ohm" and "Ω" are the same unit; VA and var are written as
// power (the netlist does not distinguish apparent and reactive power).
constexpr std::array<NamedUnit, 18> kUnits{{
    {"V", 1.0, dims::kVoltage, true},
    {"A", 1.0, dims::kCurrent, true},
    {"ohm", 1.0, dims::kResistance, true},
    {"\xCE\xA9", 1.0, dims::kResistance, true},  // Ω
    {"H", 1.0, dims::kInductance, true},
    {"F", 1.0, dims::kCapacitance, true},
    {"s", 1.0, dims::kTime, true},
    {"Hz", 1.0, dims::kFrequency, true},
    {"W", 1.0, dims::kPower, true},
    {"VA", 1.0, dims::kPower, true},
    {"var", 1.0, dims::kPower, true},
    {"A2s", 1.0, Dim{0, 0, 1, 2}, true},  // I²t of fuses and valves (kA2s, MA2s)
    {"J", 1.0, dims::kEnergy, true},
    {"C", 1.0, dims::kCharge, true},
    {"S", 1.0, dims::kConductance, true},
    {"deg", std::numbers::pi / 180.0, dims::kNone, false},
    {"rad", 1.0, dims::kNone, false},
    {"%", 0.01, dims::kNone, false},
}};

struct Prefix {
  std::string_view text;
  double scale;
};
constexpr std::array<Prefix, 10> kPrefixes{{
    {"p", 1e-12}, {"n", 1e-9}, {"u", 1e-6}, {"\xC2\xB5", 1e-6} /* µ */,
    {"m", 1e-3}, {"k", 1e3}, {"M", 1e6}, {"G", 1e9}, {"T", 1e12}, {"f", 1e-15},
}};

}  // namespace

std::optional<UnitInfo> LookUpUnit(std::string_view word) {
  for (const auto& u : kUnits) {
    if (word == u.word) return UnitInfo{u.scale, u.dim};
  }
  for (const auto& p : kPrefixes) {
    if (word.size() <= p.text.size() || word.substr(0, p.text.size()) != p.text) continue;
    std::string_view rest = word.substr(p.text.size());
    for (const auto& u : kUnits) {
      if (u.takes_prefix && rest == u.word) return UnitInfo{p.scale * u.scale, u.dim};
    }
  }
  return std::nullopt;
}

std::string DimName(const Dim& d) {
  struct Named { Dim dim; const char* name; };
  static const Named kNamed[] = {
      {dims::kNone, "a plain number (or angle, or %)"},
      {dims::kTime, "time [s]"},
      {dims::kFrequency, "frequency [Hz]"},
      {dims::kCurrent, "current [A]"},
      {dims::kVoltage, "voltage [V]"},
      {dims::kResistance, "resistance [ohm]"},
      {dims::kInductance, "inductance [H]"},
      {dims::kCapacitance, "capacitance [F]"},
      {dims::kPower, "power [W, VA or var]"},
      {dims::kEnergy, "energy [J]"},
      {dims::kCharge, "charge [C]"},
      {dims::kConductance, "conductance [S]"},
  };
  for (const auto& n : kNamed)
    if (n.dim == d) return n.name;
  return "a quantity in " + UnitLabel(d);
}

std::string UnitLabel(const Dim& d) {
  struct Named { Dim dim; const char* label; };
  static const Named kNamed[] = {
      {dims::kNone, "1"},        {dims::kTime, "s"},         {dims::kFrequency, "Hz"},
      {dims::kCurrent, "A"},     {dims::kVoltage, "V"},      {dims::kResistance, "ohm"},
      {dims::kInductance, "H"},  {dims::kCapacitance, "F"},  {dims::kPower, "W"},
      {dims::kEnergy, "J"},      {dims::kCharge, "C"},       {dims::kConductance, "S"},
      {dims::kCurrent.Pow(2) * dims::kTime, "A2s"},
  };
  for (const auto& n : kNamed)
    if (n.dim == d) return n.label;
  std::string out;
  auto add = [&](const char* base, int e) {
    if (e == 0) return;
    if (!out.empty()) out += ' ';
    out += base;
    if (e != 1) out += std::to_string(e);
  };
  add("kg", d.kg);
  add("m", d.m);
  add("s", d.s);
  add("A", d.A);
  return out;
}

std::string KnownUnitsHint() {
  return "units are V A ohm (or \xCE\xA9) H F s Hz W VA var J C S deg rad %, with SI "
         "prefixes p n u (or \xC2\xB5) m k M G T";
}

}  // namespace lcc
