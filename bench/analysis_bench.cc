// Benchmark: the cost of the report analysis against the simulation it
// follows. A twelve-pulse rectifier with transformers (Yy0 + Yd11, 2 MVA
// each) runs to periodic steady state and records 2 cycles; then the whole
// analysis (statistics, harmonics of every AC point, closed forms with
// their phasor solves, valve figures, an IEEE 519 check) runs on that
// 2-cycle window. Target (issue 4): analysis below 5 % of the simulation.
// Prints the fastest of five of each.
#include <fmt/format.h>

#include <algorithm>
#include <chrono>

#include "engine/simulator.h"
#include "engine/topology.h"
#include "parser/elaborate.h"
#include "results/analysis.h"
#include "results/case_recorder.h"
#include "results/channels.h"

int main() {
  const std::string text = R"(
supply G (A, B, C) Vll = 11 kV f = 50 Hz Ssc = 250 MVA xr = 12
transformer Ty hv = (A, B, C) lv = (y1, y2, y3) group = Yy0  S = 2 MVA V1 = 11 kV V2 = 1 kV z = 8 % xr = 15 im = 0.5 %
transformer Td hv = (A, B, C) lv = (d1, d2, d3) group = Yd11 S = 2 MVA V1 = 11 kV V2 = 1 kV z = 8 % xr = 15 im = 0.5 %
bridge B1 ac = (y1, y2, y3) dc = (mid, n)
bridge B2 ac = (d1, d2, d3) dc = (p, mid)
inductor Ld (p, q) L = 5 mH
resistor Rl (q, n) R = 2.4 ohm
simulate stop = 2 s reltol = 1e-6
steady cycles = 2
pcc at = G pulses = 12
probe Vd = p - n
probe Id = Ld.i
probe IA = G.a.i
)";
  lcc::Diagnostics diags;
  auto design = lcc::ElaborateText("bench.lcc", text, diags);
  if (design) lcc::CheckTopology(design->circuit, diags);
  if (diags.has_errors()) {
    fmt::print(stderr, "{}", diags.Format());
    return 2;
  }
  const lcc::Study& study = design->study;
  const auto channels = lcc::BuildAnalysisChannels(design->circuit);
  double sim_best = 1e300, analysis_best = 1e300;
  lcc::RunSummary summary;
  for (int k = 0; k < 5; ++k) {
    lcc::CaseRecorder recorder(study.probes, channels, lcc::AnalysisKeepSeconds(study, 50.0), 0.02 / 1024);
    auto run = lcc::Simulate(design->circuit, study, {}, recorder);
    if (run.summary.status != lcc::RunSummary::Status::kCompleted) {
      fmt::print(stderr, "run failed: {}\n", run.summary.message);
      return 1;
    }
    sim_best = std::min(sim_best, run.summary.wall_seconds);
    summary = run.summary;
    const auto t0 = std::chrono::steady_clock::now();
    const auto a = lcc::Analyse({"bench", "bench.lcc", {}, &design->circuit, &study, &recorder, &run});
    const double dt = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    analysis_best = std::min(analysis_best, dt);
    if (a.bridges.size() != 2 || a.ieee519.empty()) return 1;
  }
  fmt::print("twelve-pulse with transformers: steady at {:.3f} s, {} analysis channels, 2-cycle window\n",
             summary.steady_time, channels.channels.size());
  fmt::print("{:>16} {:>16} {:>10}\n", "simulation [ms]", "analysis [ms]", "ratio");
  fmt::print("{:>16.2f} {:>16.3f} {:>9.2f}%\n", sim_best * 1e3, analysis_best * 1e3, 100 * analysis_best / sim_best);
  return 0;
}
