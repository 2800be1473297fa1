// Benchmark: the cost of the report analysis against the simulation it
// follows. Twelve-pulse rectifiers with transformers (Yy0 + Yd11) run to
// periodic steady state and record 2 cycles; then the whole analysis
// (statistics, harmonics of every AC point, closed forms with their phasor
// solves, valve figures, an IEEE 519 check) runs on that 2-cycle window.
// Two cases: the twelve-pulse demo (circuits/, run from the repository
// root), and a variant with a short DC time constant that is steady after
// three cycles, the least simulation an analysis can follow. Target (issue
// 4): analysis below 5 % of the simulation. Prints the fastest of five of
// each; the first analysis of a process also pays FFTW's one-time set-up.
#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <memory>

#include "engine/simulator.h"
#include "engine/topology.h"
#include "parser/elaborate.h"
#include "results/analysis.h"
#include "results/case_recorder.h"
#include "results/channels.h"

namespace {

const char* kShortTimeConstant = R"(
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

int Bench(const char* title, std::unique_ptr<lcc::Design> design, lcc::Diagnostics& diags) {
  if (design) lcc::CheckTopology(design->circuit, diags);
  if (!design || diags.has_errors()) {
    fmt::print(stderr, "{}", diags.Format());
    return 2;
  }
  const lcc::Study& study = design->study;
  const auto channels = lcc::BuildAnalysisChannels(design->circuit);
  double sim_best = 1e300, analysis_best = 1e300;
  lcc::RunSummary summary;
  for (int k = 0; k < 5; ++k) {
    const auto recorder_ptr = lcc::RecorderFor(study, channels);
    lcc::CaseRecorder& recorder = *recorder_ptr;
    auto run = lcc::Simulate(design->circuit, study, {}, recorder);
    if (run.summary.status != lcc::RunSummary::Status::kCompleted) {
      fmt::print(stderr, "run failed: {}\n", run.summary.message);
      return 1;
    }
    sim_best = std::min(sim_best, run.summary.wall_seconds);
    summary = run.summary;
    const auto t0 = std::chrono::steady_clock::now();
    const auto a = lcc::Analyse({"bench", title, 0, "bench", {}, &design->circuit, &study, &recorder, &run});
    const double dt = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    analysis_best = std::min(analysis_best, dt);
    if (a.bridges.size() != 2) return 1;
  }
  fmt::print("{:<44} {:>8.3f} {:>9} {:>12.2f} {:>12.3f} {:>8.2f}%\n", title, summary.steady_time,
             channels.channels.size(), sim_best * 1e3, analysis_best * 1e3, 100 * analysis_best / sim_best);
  return 0;
}

}  // namespace

int main() {
  fmt::print("{:<44} {:>8} {:>9} {:>12} {:>12} {:>9}\n", "case (2-cycle window)", "steady s", "channels",
             "sim [ms]", "analysis [ms]", "ratio");
  lcc::Diagnostics d1, d2;
  int rc = Bench("circuits/twelve_pulse_electrolyser.lcc", lcc::ElaborateFile("circuits/twelve_pulse_electrolyser.lcc", d1), d1);
  rc |= Bench("twelve-pulse, DC time constant 2 ms", lcc::ElaborateText("bench.lcc", kShortTimeConstant, d2), d2);
  return rc;
}
