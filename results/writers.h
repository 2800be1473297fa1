// Output files of one case.
//
//   waveforms.csv  first column `time [s]`, then one column per probe named
//                  `NAME [unit]`; one row per output sample.
//   report.txt     the readable report: what was run, the analysis window,
//                  per probe mean, rms, min and max over the recorded
//                  cycles, the bridges' commutation overlap, the run
//                  statistics, and the engineering cautions.
// Both are written atomically (results/atomic_file.h).
#pragma once

#include <string>
#include <vector>

#include "engine/simulator.h"
#include "models/circuit.h"
#include "results/recorder.h"

namespace lcc {

struct CaseOutput {
  std::string case_name;
  std::string netlist_path;
  const Circuit* circuit = nullptr;
  const ProbeRecorder* recorder = nullptr;
  const RunResult* run = nullptr;
  std::vector<std::string> notes;  // e.g. automatic references added by the checks
};

void WriteWaveformsCsv(const std::string& path, const ProbeRecorder& recorder);
std::string FormatReport(const CaseOutput& output);

// The caution printed at the top of every report (and in the README).
const char* EngineeringCaution();

}  // namespace lcc
