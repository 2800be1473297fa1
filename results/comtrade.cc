#include "results/comtrade.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "results/atomic_file.h"

namespace lcc {
namespace {

constexpr double kSpan = 99990.0;   // integers used: −kSpan..kSpan
constexpr long kMissing = 99999;    // C37.111-1999 §6.3: missing analog value

// Field text without commas or line breaks, at most `limit` characters.
std::string Field(const std::string& s, std::size_t limit) {
  std::string out;
  for (char c : s) out += (c == ',' || c == '\r' || c == '\n') ? '_' : c;
  return out.substr(0, limit);
}

struct Scale {
  double a = 1.0, b = 0.0;
  long min = 0, max = 0;
};

Scale ScaleOf(const std::vector<double>& x) {
  double lo = INFINITY, hi = -INFINITY;
  for (double v : x)
    if (std::isfinite(v)) {
      lo = std::min(lo, v);
      hi = std::max(hi, v);
    }
  Scale s;
  if (!(lo <= hi)) return s;  // no finite sample
  s.b = 0.5 * (lo + hi);
  s.a = hi > lo ? (hi - lo) / (2.0 * kSpan) : 1.0;
  return s;
}

long Quantise(double v, const Scale& s) {
  if (!std::isfinite(v)) return kMissing;
  return std::lround(std::clamp((v - s.b) / s.a, -kSpan, kSpan));
}

}  // namespace

void WriteComtrade(const std::string& base, const ComtradeHeader& h, const ProbeRecorder& rec) {
  const auto& probes = rec.probes();
  const auto& cols = rec.columns();
  const auto& t = rec.time();
  std::vector<Scale> scales;
  scales.reserve(cols.size());
  for (const auto& c : cols) scales.push_back(ScaleOf(c));
  // min and max fields: the range of the integers actually written.
  for (std::size_t k = 0; k < cols.size(); ++k) {
    long lo = 0, hi = 0;
    bool first = true;
    for (double v : cols[k]) {
      const long x = Quantise(v, scales[k]);
      if (x == kMissing) continue;
      lo = first ? x : std::min(lo, x);
      hi = first ? x : std::max(hi, x);
      first = false;
    }
    scales[k].min = lo;
    scales[k].max = hi;
  }

  std::string cfg;
  auto line = [&](const std::string& s) { cfg += s + "\r\n"; };
  line(fmt::format("{},{},1999", Field(h.station, 64), Field(h.device, 64)));
  line(fmt::format("{},{}A,0D", probes.size(), probes.size()));
  for (std::size_t k = 0; k < probes.size(); ++k)
    line(fmt::format("{},{},,{},{},{:.9g},{:.9g},0,{},{},1,1,P", k + 1, Field(probes[k].name, 64),
                     Field(probes[k].name, 64), Field(probes[k].unit(), 32), scales[k].a, scales[k].b, scales[k].min,
                     scales[k].max));
  line(fmt::format("{:g}", h.line_frequency));
  line("1");
  line(fmt::format("{:.9g},{}", h.sample_interval > 0 ? 1.0 / h.sample_interval : 0.0, t.size()));
  line("01/01/2000,00:00:00.000000");
  line("01/01/2000,00:00:00.000000");
  line("ASCII");
  line("1");

  AtomicFile dat(base + ".dat");
  std::string row;
  for (std::size_t n = 0; n < t.size(); ++n) {
    row.clear();
    fmt::format_to(std::back_inserter(row), "{},{}", n + 1, std::llround(t[n] * 1e6));
    for (std::size_t k = 0; k < cols.size(); ++k)
      fmt::format_to(std::back_inserter(row), ",{}", Quantise(cols[k][n], scales[k]));
    row += "\r\n";
    dat.stream() << row;
  }
  dat.Commit();
  WriteFileAtomically(base + ".cfg", cfg);
}

}  // namespace lcc
