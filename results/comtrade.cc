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

// Offset and factor that map the finite range [lo, hi] onto ±kSpan.
Scale ScaleOf(const ProbeRecorder::Range& r) {
  Scale s;
  if (!r.any) return s;  // no finite sample
  s.b = 0.5 * (r.min + r.max);
  s.a = r.max > r.min ? (r.max - r.min) / (2.0 * kSpan) : 1.0;
  return s;
}

long Quantise(double v, const Scale& s) {
  if (!std::isfinite(v)) return kMissing;
  return std::lround(std::clamp((v - s.b) / s.a, -kSpan, kSpan));
}

}  // namespace

void WriteComtrade(const std::string& base, const ComtradeHeader& h, const ProbeRecorder& rec) {
  const auto& probes = rec.probes();
  // min and max fields: the range of the integers written, which are the
  // extremes' images (quantising is monotonic).
  std::vector<Scale> scales;
  scales.reserve(probes.size());
  for (const auto& r : rec.ranges()) {
    Scale s = ScaleOf(r);
    if (r.any) s.min = Quantise(r.min, s), s.max = Quantise(r.max, s);
    scales.push_back(s);
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
  line(fmt::format("{:.9g},{}", h.sample_interval > 0 ? 1.0 / h.sample_interval : 0.0, rec.rows()));
  line("01/01/2000,00:00:00.000000");
  line("01/01/2000,00:00:00.000000");
  line("ASCII");
  line("1");

  AtomicFile dat(base + ".dat");
  std::string line_text;
  std::size_t n = 0;
  rec.ForEachRow([&](const double* row) {
    line_text.clear();
    fmt::format_to(std::back_inserter(line_text), "{},{}", ++n, std::llround(row[0] * 1e6));
    for (std::size_t k = 0; k < scales.size(); ++k)
      fmt::format_to(std::back_inserter(line_text), ",{}", Quantise(row[k + 1], scales[k]));
    line_text += "\r\n";
    dat.stream() << line_text;
  });
  dat.Commit();
  WriteFileAtomically(base + ".cfg", cfg);
}

}  // namespace lcc
