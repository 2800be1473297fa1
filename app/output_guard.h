// Checks made before a batch writes anything, so that a mistake costs a
// message rather than somebody's files or the disk:
//
// - OutputFolderCheck: results go only into a folder lccsim made (it leaves
//   a marker file there) or an empty one; a folder with other contents is
//   refused unless the user says --overwrite.
// - EstimateWaveformBytes: the waveform data a batch would write (samples ×
//   columns × bytes per value × cases, per format), compared by the caller
//   with --max-output (default 2 GB) before any case runs.
#pragma once

#include <cstdint>
#include <set>
#include <string>

#include "models/study.h"

namespace lcc {

// The marker lccsim leaves in every output folder it writes.
inline constexpr const char* kOutputMarker = ".lccsim-output";

// Returns an empty string if results may be written into `dir` (it does not
// exist, is empty, or holds the marker; or `overwrite`), else why not, with
// what to do. Creates the folder and its marker when it may.
std::string PrepareOutputFolder(const std::string& dir, bool overwrite);

struct WaveformEstimate {
  std::uint64_t bytes = 0;       // all cases, all waveform formats
  std::uint64_t samples = 0;     // per case
  std::size_t columns = 0;       // probes, per case
  std::size_t cases = 0;
};

// Estimated from the study as elaborated: samples up to `stop` at the output
// interval (a run that reaches steady state early writes less), one column
// per probe, about 16 bytes per value in CSV and 12 in COMTRADE's ASCII
// data file (a time column each); SVG is thinned to the plot's width and
// not counted. Cases that change `stop` or the probes are not seen: the
// base study stands for all.
WaveformEstimate EstimateWaveformBytes(const Study& study, const std::set<std::string>& formats, std::size_t cases);

// "2 GB", "500 MB", "1.5 GB", "4096" (bytes): decimal units. False if unreadable.
bool ParseByteSize(const std::string& text, std::uint64_t* bytes);
std::string FormatBytes(double bytes);

}  // namespace lcc
