// What the benchmarks share: netlist text elaborated and checked (the
// process exits with code 2 and the diagnostics if it does not elaborate),
// the fastest of three runs of a design (exit code 1 if one fails), with or
// without the report's analysis, probe rows kept as `lccsim run` keeps
// them, and the process's peak RSS.
#pragma once

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <fstream>
#include <memory>
#include <string>

#include "engine/simulator.h"
#include "engine/topology.h"
#include "parser/elaborate.h"
#include <sys/resource.h>

#include "app/commands.h"
#include "results/analysis.h"
#include "results/case_recorder.h"
#include "results/channels.h"
#include "results/recorder.h"

namespace lcc::bench {

inline std::unique_ptr<Design> ElaborateOrExit(const std::string& text) {
  Diagnostics diags;
  auto design = ElaborateText("bench.lcc", text, diags);
  if (design) CheckTopology(design->circuit, diags);
  if (diags.has_errors()) {
    fmt::print(stderr, "{}", diags.Format());
    std::exit(2);
  }
  return design;
}

// Probe rows kept as `lccsim run` keeps them by default: a few MB in
// memory, then spooled (RunCommandOptions::waveform_memory_bytes). With 0,
// the whole run in one growing vector, three probes at T/1024 cost the
// six-pulse benchmark 36 ms a second instead of 27 (reallocation and the
// page faults of fresh memory), which is not what a user's run pays.
inline RecorderOptions ProgramRecorderOptions() {
  return RecorderOptions{static_cast<std::size_t>(RunCommandOptions{}.waveform_memory_bytes), ""};
}

inline RunSummary FastestOfThree(const Design& design) {
  RunSummary best;
  best.wall_seconds = 1e300;
  for (int k = 0; k < 3; ++k) {
    ProbeRecorder recorder(design.study.probes, ProgramRecorderOptions());
    auto run = Simulate(design.circuit, design.study, {}, recorder);
    if (run.summary.status != RunSummary::Status::kCompleted) {
      fmt::print(stderr, "run failed: {}\n", run.summary.message);
      std::exit(1);
    }
    if (run.summary.wall_seconds < best.wall_seconds) best = run.summary;
  }
  return best;
}

// A run analysed as `lccsim run` analyses it: the bridges' Vd and overlap
// beside their closed forms (results/analysis.h).
struct AnalysedRun {
  RunSummary summary;
  CaseAnalysis analysis;
};

// The fastest of three by the simulation's wall time (the analysis is not
// timed); exit code 1 if a run fails.
inline AnalysedRun FastestAnalysedOfThree(const Design& design) {
  AnalysedRun best;
  best.summary.wall_seconds = 1e300;
  const AnalysisChannels channels = BuildAnalysisChannels(design.circuit);
  for (int k = 0; k < 3; ++k) {
    const auto recorder = RecorderFor(design.study, channels, ProgramRecorderOptions());
    auto run = Simulate(design.circuit, design.study, {}, *recorder);
    if (run.summary.status != RunSummary::Status::kCompleted) {
      fmt::print(stderr, "run failed: {}\n", run.summary.message);
      std::exit(1);
    }
    if (run.summary.wall_seconds < best.summary.wall_seconds) {
      best.summary = run.summary;
      best.analysis = Analyse({"bench", "bench.lcc", 0, "bench", {}, &design.circuit, &design.study, recorder.get(), &run});
    }
  }
  return best;
}

// The largest |Vd − closed form| in % and |overlap − closed form| in degrees
// over the bridges (−1 where no bridge has the figure).
struct ClosedFormErrors {
  double vd_pct = -1, overlap_deg = -1;
};
inline ClosedFormErrors WorstClosedFormErrors(const CaseAnalysis& a) {
  ClosedFormErrors e;
  for (const auto& b : a.bridges) {
    if (b.vd_closed_form_V != 0) e.vd_pct = std::max(e.vd_pct, std::abs(b.vd_difference_pct));
    if (b.overlap_deg >= 0 && b.overlap_closed_form_deg >= 0)
      e.overlap_deg = std::max(e.overlap_deg, std::abs(b.overlap_deg - b.overlap_closed_form_deg));
  }
  return e;
}

// The twelve-pulse benchmark circuit: Yy0 + Yd11 from one 11 kV supply,
// bridges in series carrying a constant 1 kA, rtol 1e-6, no probes.
inline std::string TwelvePulseNetlist(double seconds) {
  return fmt::format(R"(
supply G (A, B, C) Vll = 11 kV f = 50 Hz Ssc = 250 MVA xr = 12
transformer Ty hv = (A, B, C) lv = (y1, y2, y3) group = Yy0  S = 2 MVA V1 = 11 kV V2 = 1 kV z = 8 % xr = 15 im = 0.5 %
transformer Td hv = (A, B, C) lv = (d1, d2, d3) group = Yd11 S = 2 MVA V1 = 11 kV V2 = 1 kV z = 8 % xr = 15 im = 0.5 %
bridge B1 ac = (y1, y2, y3) dc = (mid, n) Ron = 10 uohm
bridge B2 ac = (d1, d2, d3) dc = (p, mid) Ron = 10 uohm
current_source Iload (n, p) dc = 1 kA
simulate stop = {} s reltol = 1e-6
)",
                     seconds);
}

// A performance target, as every benchmark ends (issue 7's, and the batch
// targets before them): the target, what was measured, and whether it is
// met. scripts/bench.sh collects these lines (they start with "target:")
// into one table after running every benchmark, so that the targets are
// read side by side from one run.
inline void PrintTarget(const std::string& target, const std::string& measured, bool met) {
  fmt::print("target: {} | {} | {}\n", target, measured, met ? "met" : "NOT MET");
}

// A batch's simulation time, summed over its cases, from the timing.csv
// `lccsim run` writes into `out_dir` (last column, seconds), and the
// number of cases listed there.
struct BatchTiming {
  int cases = 0;
  double simulation_seconds = 0.0;
};
inline BatchTiming ReadBatchTiming(const std::string& out_dir) {
  BatchTiming b;
  std::ifstream timing(out_dir + "/timing.csv");
  std::string line;
  std::getline(timing, line);  // the header
  while (std::getline(timing, line)) {
    b.simulation_seconds += std::stod(line.substr(line.rfind(',') + 1));
    ++b.cases;
  }
  return b;
}

inline double PeakRssMegabytes() {
  rusage usage{};
  getrusage(RUSAGE_SELF, &usage);
  return static_cast<double>(usage.ru_maxrss) / 1024.0;  // Linux reports kilobytes
}

}  // namespace lcc::bench
