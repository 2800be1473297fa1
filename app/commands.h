// The command-line commands as functions: each returns the process exit code
// (0 all good, 1 a simulation failed, 2 an input error) and writes its
// messages to the streams it is given, so tests can run them in-process.
#pragma once

#include <ostream>
#include <string>

#include "engine/simulator.h"

namespace lcc {

enum ExitCode { kExitOk = 0, kExitSimulationFailed = 1, kExitInputError = 2 };

struct RunCommandOptions {
  std::string netlist;
  std::string out_dir = "out";  // results go to OUT/CASE/
  EngineOptions engine;         // limits and numerical settings
};

int RunCommand(const RunCommandOptions& options, std::ostream& out, std::ostream& err);
int CheckCommand(const std::string& netlist, std::ostream& out, std::ostream& err);

}  // namespace lcc
