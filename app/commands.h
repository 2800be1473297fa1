// The command-line commands as functions: each returns the process exit code
// (0 all good, 1 a simulation failed, 2 an input error) and writes its
// messages to the streams it is given, so tests can run them in-process.
#pragma once

#include <cstdint>
#include <ostream>
#include <set>
#include <string>
#include <vector>

#include "engine/simulator.h"

namespace lcc {

// 130: stopped by Ctrl-C (128 + SIGINT, the shell's convention).
enum ExitCode { kExitOk = 0, kExitSimulationFailed = 1, kExitInputError = 2, kExitInterrupted = 130 };

// Output formats; report.txt, analysis.json and events.csv are always written.
//   csv       CASE/waveforms.csv and OUT/summary.csv
//   json      OUT/summary.json
//   comtrade  CASE/waveforms.cfg + .dat (IEEE C37.111-1999, ASCII)
//   svg       CASE/waveforms.svg
const std::set<std::string>& AllFormats();

struct RunCommandOptions {
  std::string netlist;
  std::string out_dir = "out";  // results go to OUT/CASE/
  EngineOptions engine;         // limits and numerical settings
  std::set<std::string> formats = AllFormats();
  int jobs = 0;                 // cases run at once (0: one per core)
  bool resume = false;          // skip cases whose results are complete
  int shard_index = 0;          // run only the cases k with k % shard_count == shard_index
  int shard_count = 1;
  bool progress = false;        // progress lines on the error stream
  // Write into an existing non-empty folder that lccsim did not make
  // (app/output_guard.h); without it such a folder is refused.
  bool overwrite = false;
  // Largest waveform output a batch may write, estimated before it runs.
  std::uint64_t max_output_bytes = 2'000'000'000;
  // Probe samples a case holds in memory before they go to a spool file in
  // OUT (results/recorder.h); 0 keeps the whole run in memory.
  std::uint64_t waveform_memory_bytes = 4'000'000;
};

// Runs every case of the netlist (its cases × sweep points), `jobs` at a
// time; OUT/summary.csv and .json list them in batch order, identical for
// any `jobs` (wall-clock times go to OUT/timing.csv only). With shards, the
// summaries are OUT/summary-shard-I-of-N.*; `merge` joins them.
int RunCommand(const RunCommandOptions& options, std::ostream& out, std::ostream& err);
// Lists the cases of a netlist: index, folder, name.
int CasesCommand(const std::string& netlist, std::ostream& out, std::ostream& err);
// Reads every finished case under the folders and writes OUT/summary.csv
// and OUT/summary.json, as one run of all of them would have.
int MergeCommand(const std::vector<std::string>& dirs, const std::string& out_dir, std::ostream& out,
                 std::ostream& err, bool overwrite = false);
// Prints the report of a finished case again from CASE/analysis.json.
int ReportCommand(const std::string& case_dir, std::ostream& out, std::ostream& err);
int CheckCommand(const std::string& netlist, std::ostream& out, std::ostream& err);

}  // namespace lcc
