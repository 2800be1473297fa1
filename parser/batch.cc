#include "parser/batch.h"

#include <fmt/format.h>

#include <cmath>
#include <numbers>

namespace lcc {
namespace {

// A value as a short label: 15deg, 50MVA, 0.7, 2ohm.
std::string Label(const Quantity& q, bool angle) {
  if (angle) return fmt::format("{:g}deg", q.value * 180.0 / std::numbers::pi);
  std::string unit = q.dim.dimensionless() ? "" : UnitLabel(q.dim);
  double v = q.value;
  const char* prefix = "";
  const double a = std::abs(v);
  if (!unit.empty() && a > 0) {
    static const std::pair<double, const char*> kPrefixes[] = {{1e9, "G"}, {1e6, "M"}, {1e3, "k"}, {1, ""},
                                                               {1e-3, "m"}, {1e-6, "u"}, {1e-9, "n"}};
    for (const auto& [scale, p] : kPrefixes)
      if (a >= scale * (1 - 1e-12)) {
        v /= scale;
        prefix = p;
        break;
      }
  }
  return fmt::format("{:.6g}{}{}", v, prefix, unit);
}

std::string SafeFolder(const std::string& s) {
  std::string out;
  for (char c : s) {
    const bool ok = (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '.' ||
                    c == '-' || c == '_' || c == '=';
    out += ok ? c : '_';
  }
  return out;
}

}  // namespace

std::vector<CaseInstance> ExpandCases(const Batch& batch) {
  std::vector<CaseInstance> out;
  std::vector<const CaseDecl*> cases;
  static const CaseDecl kBase{"base", {}, {}, {}};
  for (const auto& c : batch.cases) cases.push_back(&c);
  if (cases.empty()) cases.push_back(&kBase);
  std::size_t points = 1;
  for (const auto& s : batch.sweeps) points *= s.values.size();
  for (const CaseDecl* c : cases) {
    for (std::size_t p = 0; p < points; ++p) {
      CaseInstance inst;
      inst.index = static_cast<int>(out.size());
      inst.name = c->name;
      for (const auto& [target, q] : c->start) inst.start[target] = q.value;
      // First sweep outermost: decompose p with the last sweep fastest.
      std::size_t rest = p;
      std::vector<std::size_t> digits(batch.sweeps.size());
      for (std::size_t k = batch.sweeps.size(); k-- > 0;) {
        digits[k] = rest % batch.sweeps[k].values.size();
        rest /= batch.sweeps[k].values.size();
      }
      for (std::size_t k = 0; k < batch.sweeps.size(); ++k) {
        const SweepDecl& s = batch.sweeps[k];
        const Quantity& q = s.values[digits[k]];
        inst.start[s.target] = q.value;
        inst.name += fmt::format(" {}={}", s.target, digits[k] < s.labels.size() ? s.labels[digits[k]] : Label(q, s.angle));
      }
      std::string folder = c->name;
      for (std::size_t k = 0; k < batch.sweeps.size(); ++k)
        folder += "__" + batch.sweeps[k].target + "=" +
                  (digits[k] < batch.sweeps[k].labels.size() ? batch.sweeps[k].labels[digits[k]]
                                                              : Label(batch.sweeps[k].values[digits[k]], batch.sweeps[k].angle));
      inst.folder = SafeFolder(folder);
      inst.timed = c->timed;
      out.push_back(std::move(inst));
    }
  }
  return out;
}

}  // namespace lcc
