#include "results/svg_plot.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

namespace lcc {
namespace {

const char* kColours[] = {"#1f5fa8", "#c0392b", "#2e8b57", "#8e44ad", "#d35400", "#16a085", "#7f8c8d", "#b8860b"};

std::string Escape(const std::string& s) {
  std::string out;
  for (char c : s) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      default: out += c;
    }
  }
  return out;
}

// Tick positions at 1, 2 or 5 × 10^k covering [lo, hi] with about `n` steps.
std::vector<double> Ticks(double lo, double hi, int n) {
  std::vector<double> t;
  const double raw = (hi - lo) / n;
  if (!(raw > 0) || !std::isfinite(raw)) return t;
  const double mag = std::pow(10.0, std::floor(std::log10(raw)));
  double step = mag;
  for (double m : {1.0, 2.0, 5.0, 10.0})
    if (m * mag >= raw) {
      step = m * mag;
      break;
    }
  for (double v = std::ceil(lo / step) * step; v <= hi + 1e-9 * step; v += step) t.push_back(std::abs(v) < 1e-12 * step ? 0.0 : v);
  return t;
}

}  // namespace

std::string RenderWaveformsSvg(const ProbeRecorder& rec, const PlotOptions& o) {
  const auto& probes = rec.probes();
  // Panels by unit, in order of first appearance.
  std::vector<std::string> units;
  std::map<std::string, std::vector<std::size_t>> members;
  for (std::size_t k = 0; k < probes.size(); ++k) {
    const std::string u = probes[k].unit();
    if (!members.count(u)) units.push_back(u);
    members[u].push_back(k);
  }
  const double t0 = o.begin, t1 = o.end > o.begin ? o.end : o.begin + 1.0;
  const int left = 90, right = 180, top = 50, gap = 60;
  const int plot_w = std::max(o.width - left - right, 1);
  const int height = top + static_cast<int>(units.size()) * (o.panel_height + gap) + 10;
  std::string s;
  s += fmt::format("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
                   "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{0}\" height=\"{1}\" viewBox=\"0 0 {0} {1}\" "
                   "font-family=\"sans-serif\" font-size=\"12\">\n",
                   o.width, height);
  s += fmt::format("<rect x=\"0\" y=\"0\" width=\"{}\" height=\"{}\" fill=\"white\"/>\n", o.width, height);
  s += fmt::format("<text x=\"{}\" y=\"24\" font-size=\"15\">{}</text>\n", left, Escape(o.title));
  // Time in ms on the axis: converter waveforms are read in milliseconds.
  const std::vector<double> xticks = Ticks(t0 * 1e3, t1 * 1e3, 8);
  auto X = [&](double t) { return left + (t - t0) / (t1 - t0) * plot_w; };

  // One pass over the rows thins each probe to its minimum and maximum per
  // pixel column (with their instants) inside [begin, end]; the panels'
  // ranges and the polylines are drawn from these.
  struct Bin {
    double vmin = 0, vmax = 0, tmin = 0, tmax = 0;
    bool seen = false;
  };
  std::vector<std::vector<Bin>> bins(probes.size(), std::vector<Bin>(static_cast<std::size_t>(plot_w) + 1));
  rec.ForEachRow([&](const double* row) {
    const double t = row[0];
    if (t < o.begin || t > o.end) return;
    const auto c = static_cast<std::size_t>(std::clamp(static_cast<int>(X(t)) - left, 0, plot_w));
    for (std::size_t k = 0; k < probes.size(); ++k) {
      const double x = row[k + 1];
      if (!std::isfinite(x)) continue;
      Bin& b = bins[k][c];
      if (!b.seen) b = {x, x, t, t, true};
      if (x < b.vmin) b.vmin = x, b.tmin = t;
      if (x > b.vmax) b.vmax = x, b.tmax = t;
    }
  });

  for (std::size_t p = 0; p < units.size(); ++p) {
    const int y_top = top + static_cast<int>(p) * (o.panel_height + gap);
    const int h = o.panel_height;
    double lo = INFINITY, hi = -INFINITY;
    for (std::size_t k : members[units[p]])
      for (const Bin& b : bins[k])
        if (b.seen) lo = std::min(lo, b.vmin), hi = std::max(hi, b.vmax);
    if (!(lo <= hi)) lo = -1, hi = 1;
    if (hi - lo < 1e-12 * std::max(1.0, std::abs(hi))) lo -= 1, hi += 1;
    const double pad = 0.05 * (hi - lo);
    lo -= pad;
    hi += pad;
    auto Y = [&](double v) { return y_top + (hi - v) / (hi - lo) * h; };

    s += fmt::format("<g>\n<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" stroke=\"#333\"/>\n", left,
                     y_top, plot_w, h);
    for (double v : Ticks(lo, hi, 6)) {
      s += fmt::format("<line x1=\"{}\" x2=\"{}\" y1=\"{:.1f}\" y2=\"{:.1f}\" stroke=\"#ddd\"/>\n", left, left + plot_w,
                       Y(v), Y(v));
      s += fmt::format("<text x=\"{}\" y=\"{:.1f}\" text-anchor=\"end\">{:g}</text>\n", left - 6, Y(v) + 4, v);
    }
    for (double v : xticks) {
      const double x = X(v * 1e-3);
      s += fmt::format("<line x1=\"{0:.1f}\" x2=\"{0:.1f}\" y1=\"{1}\" y2=\"{2}\" stroke=\"#ddd\"/>\n", x, y_top, y_top + h);
      s += fmt::format("<text x=\"{:.1f}\" y=\"{}\" text-anchor=\"middle\">{:g}</text>\n", x, y_top + h + 16, v);
    }
    s += fmt::format("<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">time [ms]</text>\n", left + plot_w / 2,
                     y_top + h + 34);
    const std::string quantity = units[p] == "V" ? "voltage " : units[p] == "A" ? "current " : units[p] == "W" ? "power " : "";
    s += fmt::format("<text transform=\"translate({},{}) rotate(-90)\" text-anchor=\"middle\">{}[{}]</text>\n", 24,
                     y_top + h / 2, quantity, Escape(units[p]));
    int legend_row = 0;
    for (std::size_t k : members[units[p]]) {
      const char* colour = kColours[k % (sizeof(kColours) / sizeof(kColours[0]))];
      // Each pixel column's extremes, in time order.
      std::string points;
      for (const Bin& b : bins[k]) {
        if (!b.seen) continue;
        const auto [ta, va, tb, vb] =
            b.tmin <= b.tmax ? std::tuple{b.tmin, b.vmin, b.tmax, b.vmax} : std::tuple{b.tmax, b.vmax, b.tmin, b.vmin};
        points += fmt::format("{:.1f},{:.1f} ", X(ta), Y(va));
        if (tb != ta) points += fmt::format("{:.1f},{:.1f} ", X(tb), Y(vb));
      }
      s += fmt::format("<polyline fill=\"none\" stroke=\"{}\" stroke-width=\"1.3\" points=\"{}\"/>\n", colour, points);
      const int ly = y_top + 14 + 18 * legend_row++;
      s += fmt::format("<line x1=\"{0}\" x2=\"{1}\" y1=\"{2}\" y2=\"{2}\" stroke=\"{3}\" stroke-width=\"2.5\"/>\n",
                       left + plot_w + 12, left + plot_w + 36, ly - 4, colour);
      s += fmt::format("<text x=\"{}\" y=\"{}\">{} [{}]</text>\n", left + plot_w + 42, ly,
                       Escape(probes[k].name), Escape(units[p]));
    }
    s += "</g>\n";
  }
  s += "</svg>\n";
  return s;
}

}  // namespace lcc
