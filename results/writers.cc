#include "results/writers.h"

#include <fmt/format.h>

#include <numbers>

#include "results/atomic_file.h"
#include "results/commutation.h"
#include "results/measures.h"

namespace lcc {

const char* EngineeringCaution() {
  return "Results are engineering estimates from a circuit model. Check them against the\n"
         "applicable codes, the manufacturers' data and a licensed engineer's review before\n"
         "they inform a decision about equipment or safety.";
}

void WriteWaveformsCsv(const std::string& path, const ProbeRecorder& recorder) {
  AtomicFile file(path);
  std::ostream& out = file.stream();
  out << "time [s]";
  for (const auto& p : recorder.probes()) out << ',' << p.name << " [" << p.unit() << ']';
  out << '\n';
  const auto& t = recorder.time();
  const auto& cols = recorder.columns();
  std::string line;
  for (std::size_t k = 0; k < t.size(); ++k) {
    line.clear();
    fmt::format_to(std::back_inserter(line), "{:.9g}", t[k]);
    for (const auto& c : cols) fmt::format_to(std::back_inserter(line), ",{:.9g}", c[k]);
    line.push_back('\n');
    out << line;
  }
  file.Commit();
}

std::string FormatReport(const CaseOutput& o) {
  const RunSummary& s = o.run->summary;
  std::string out;
  out += fmt::format("lccsim report: case '{}'\n", o.case_name);
  out += fmt::format("netlist: {}\n\n", o.netlist_path);
  out += "CAUTION\n";
  out += EngineeringCaution();
  out += "\n\n";
  if (s.status == RunSummary::Status::kFailed) {
    out += fmt::format("THE SIMULATION FAILED: {}\n", s.message);
    out += "The waveforms were kept up to that time and are partial.\n\n";
  }
  if (s.steady_requested && !s.steady_reached)
    out += "Steady state was NOT reached; the figures below are over the last cycles simulated.\n\n";
  for (const auto& note : o.notes) out += "note: " + note + "\n";
  if (!o.notes.empty()) out += "\n";

  out += fmt::format("Probes over {:.6g} s .. {:.6g} s", s.window_begin, s.window_end);
  if (s.period > 0) out += fmt::format(" ({:.4g} cycles)", (s.window_end - s.window_begin) / s.period);
  out += "\n";
  out += fmt::format("  {:<16} {:>6} {:>14} {:>14} {:>14} {:>14}\n", "probe", "unit", "mean", "rms", "min", "max");
  const auto& probes = o.recorder->probes();
  for (std::size_t k = 0; k < probes.size(); ++k) {
    WindowStats w = Measure(o.recorder->time(), o.recorder->columns()[k], s.window_begin, s.window_end);
    out += fmt::format("  {:<16} {:>6} {:>14.6g} {:>14.6g} {:>14.6g} {:>14.6g}\n", probes[k].name,
                       probes[k].unit(), w.mean, w.rms, w.min, w.max);
  }
  out += "\n";

  if (s.period > 0 && !o.circuit->valve_groups().empty()) {
    out += "Bridges: commutation overlap in the window\n";
    for (const auto& g : o.circuit->valve_groups()) {
      auto list = BridgeCommutations(g, o.run->events, 1.0 / s.period, s.window_begin, s.window_end);
      if (list.empty()) {
        out += fmt::format("  {:<16} no complete commutation\n", g.name);
        continue;
      }
      double sum = 0, lo = 1e300, hi = -1e300;
      for (const auto& c : list) {
        sum += c.overlap;
        lo = std::min(lo, c.overlap);
        hi = std::max(hi, c.overlap);
      }
      const double deg = 180.0 / std::numbers::pi;
      out += fmt::format("  {:<16} {} commutations, overlap mean {:.3f} deg (min {:.3f}, max {:.3f})\n", g.name,
                         list.size(), sum / list.size() * deg, lo * deg, hi * deg);
    }
    out += "\n";
  }
  if (!o.circuit->firings().empty()) {
    out += "Firing\n";
    const auto& firings = o.circuit->firings();
    for (std::size_t f = 0; f < firings.size(); ++f) {
      const Firing& fr = firings[f];
      const double alpha = f < o.run->final_alpha.size() ? o.run->final_alpha[f] : fr.alpha;
      out += fmt::format("  {:<16} alpha at the end {:.3f} deg", fr.name, alpha * 180.0 / std::numbers::pi);
      if (fr.regulate_probe >= 0) {
        const auto& column = o.recorder->columns()[fr.regulate_probe];
        const WindowStats w = Measure(o.recorder->time(), column, s.window_begin, s.window_end);
        const double settle = s.period > 0 ? SettlingTime(o.recorder->time(), column, fr.target, 0.01, s.period) : -1;
        out += fmt::format("; regulates {} to {:.6g} A: mean {:.6g} A ({:+.3f} %), ", fr.regulate, fr.target, w.mean,
                           100.0 * (w.mean - fr.target) / fr.target);
        out += settle >= 0 ? fmt::format("within 1 % from {:.4g} s", settle) : std::string("not settled within 1 %");
      }
      out += "\n";
    }
    out += "\n";
  }
  out += "Run statistics\n";
  out += s.FullReport();
  return out;
}

}  // namespace lcc
