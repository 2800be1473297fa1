// Output files of one case and of a batch.
//
//   CASE/waveforms.csv  first column `time [s]`, then one column per probe
//                       named `NAME [unit]`; one row per output sample.
//   summary.csv         one row per case: status, window, and the main
//                       figures (probes, bridges, AC points, IEEE 519), each
//                       column headed `NAME [unit]`; columns in a stable
//                       order (first appearance over the cases).
//   summary.json        every case's full CaseAnalysis, units in the names.
// All are written atomically (results/atomic_file.h).
#pragma once

#include <string>
#include <vector>

#include "results/analysis.h"
#include "results/recorder.h"

namespace lcc {

void WriteWaveformsCsv(const std::string& path, const ProbeRecorder& recorder);
void WriteSummaryCsv(const std::string& path, const std::vector<CaseAnalysis>& cases);
void WriteSummaryJson(const std::string& path, const std::vector<CaseAnalysis>& cases);

// The summary table as (header, rows) — what WriteSummaryCsv writes.
struct SummaryTable {
  std::vector<std::string> columns;
  std::vector<std::vector<std::string>> rows;
};
SummaryTable BuildSummaryTable(const std::vector<CaseAnalysis>& cases);

}  // namespace lcc
