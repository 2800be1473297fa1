// One case of a batch, from netlist to files: elaborates the case's design
// (the file with the case's and sweep point's values), one design more per
// instant of an `at ... set` line, resolves the other actions to devices,
// simulates, analyses and writes the case folder. Never throws: a case that
// cannot be elaborated or simulated comes back with status `failed` and the
// reason, and the others go on.
#pragma once

#include <cstddef>
#include <set>
#include <string>

#include "engine/simulator.h"
#include "engine/topology.h"
#include "parser/batch.h"
#include "parser/elaborate.h"
#include "results/analysis.h"

namespace lcc {

// Parses, elaborates (with `overrides`, if any) and checks the topology;
// nullptr when `diags` holds errors.
std::unique_ptr<Design> LoadDesign(const std::string& netlist, const Overrides* overrides, Diagnostics& diags,
                                   TopologyReport* topology);

struct CaseRunOptions {
  std::string netlist;
  std::string out_dir;
  EngineOptions engine;
  std::set<std::string> formats;
  // Probe rows held in memory before they go to a spool file in out_dir
  // (results/recorder.h): bounds a case's memory whatever its duration.
  std::size_t waveform_memory_bytes = 4'000'000;
};

struct CaseRunResult {
  CaseAnalysis analysis;
  bool interrupted = false;  // stopped by Ctrl-C: not written, to be run again
  double wall_seconds = 0;   // simulation and analysis
};

CaseRunResult RunCase(const CaseRunOptions& options, const CaseInstance& instance);

// The case folder's analysis, if the case was completed before (its
// analysis.json, written last, exists and reads back).
bool LoadFinishedCase(const std::string& out_dir, const CaseInstance& instance, CaseAnalysis* analysis);

}  // namespace lcc
