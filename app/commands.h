// The command-line commands as functions: each returns the process exit code
// (0 all good, 1 a simulation failed, 2 an input error) and writes its
// messages to the streams it is given, so tests can run them in-process.
#pragma once

#include <ostream>
#include <set>
#include <string>

#include "engine/simulator.h"

namespace lcc {

enum ExitCode { kExitOk = 0, kExitSimulationFailed = 1, kExitInputError = 2 };

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
};

int RunCommand(const RunCommandOptions& options, std::ostream& out, std::ostream& err);
// Prints the report of a finished case again from CASE/analysis.json.
int ReportCommand(const std::string& case_dir, std::ostream& out, std::ostream& err);
int CheckCommand(const std::string& netlist, std::ostream& out, std::ostream& err);

}  // namespace lcc
