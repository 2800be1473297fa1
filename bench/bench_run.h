// What the benchmarks share: netlist text elaborated and checked (the
// process exits with code 2 and the diagnostics if it does not elaborate),
// and the fastest of three runs of a design (exit code 1 if one fails).
#pragma once

#include <fmt/format.h>

#include <cstdlib>
#include <memory>
#include <string>

#include "engine/simulator.h"
#include "engine/topology.h"
#include "parser/elaborate.h"
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

inline RunSummary FastestOfThree(const Design& design) {
  RunSummary best;
  best.wall_seconds = 1e300;
  for (int k = 0; k < 3; ++k) {
    ProbeRecorder recorder(design.study.probes);
    auto run = Simulate(design.circuit, design.study, {}, recorder);
    if (run.summary.status != RunSummary::Status::kCompleted) {
      fmt::print(stderr, "run failed: {}\n", run.summary.message);
      std::exit(1);
    }
    if (run.summary.wall_seconds < best.wall_seconds) best = run.summary;
  }
  return best;
}

}  // namespace lcc::bench
