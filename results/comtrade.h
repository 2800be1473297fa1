// COMTRADE output per IEEE Std C37.111-1999, ASCII data file:
// CASE/waveforms.cfg and CASE/waveforms.dat, every probe an analog channel.
//
// Each channel is scaled to integers with its own multiplier and offset,
// value = a·x + b, b at the middle of the channel's range and a so that
// the range spans ±99 990 (the 1999 data file allows −99 999..99 998;
// 99 999 marks a missing value, written for a non-finite sample). The
// quantisation step of a channel is therefore a, about range/200 000.
//
// A simulation has no wall-clock date: simulated time zero is written as
// 01/01/2000 00:00:00.000000, for both the first sample and the trigger.
// Timestamps are in microseconds (timemult 1); the sampling rate line is
// exact and is what readers should prefer (C37.111 says so too).
#pragma once

#include <string>

#include "results/recorder.h"

namespace lcc {

struct ComtradeHeader {
  std::string station = "lccsim";  // station_name field
  std::string device;              // rec_dev_id field (the case name)
  double line_frequency = 50.0;    // lf field, Hz
  double sample_interval = 0.0;    // s
};

// Writes `base`.cfg and `base`.dat atomically.
void WriteComtrade(const std::string& base, const ComtradeHeader& header, const ProbeRecorder& recorder);

}  // namespace lcc
