// Records one case: every probe over the whole run (for waveforms.csv and
// COMTRADE; spooled to disk as results/recorder.h says), and the analysis
// channels (results/channels.h) over the
// analysis window only.
//
// The window is known only at the end of a steady run, so the channels go
// into a ring buffer holding the last `keep` seconds; with a chosen window
// only the samples inside it are kept. Memory for the channels is bounded
// by the window, not by the run's length.
#pragma once

#include <memory>
#include <optional>
#include <span>
#include <vector>

#include "engine/simulator.h"
#include "results/channels.h"
#include "results/recorder.h"

namespace lcc {

class CaseRecorder final : public SampleSink {
 public:
  // keep: seconds of channel history to hold (the window's length, plus a
  // margin); from/to: a chosen window instead (to > from); probes: how the
  // probe rows are kept; longest: the run's length, s, which no ring
  // exceeds (0: unbounded).
  CaseRecorder(const std::vector<Probe>& probes, const AnalysisChannels& channels, double keep, double sample,
               double from = 0.0, double to = 0.0, RecorderOptions probes_options = {}, double longest = 0.0);

  bool wants_derivatives() const override { return probes_.wants_derivatives(); }
  std::optional<std::vector<int>> unknowns_read() const override;
  void OnSample(double t, const double* y, const double* yp) override;
  void OnProbesChange(const std::vector<Probe>& probes) override { probes_.OnProbesChange(probes); }

  // Figures over the whole run and from a fault instant on, per channel,
  // accumulated sample by sample (the window alone would miss them).
  void SetFaultTime(double t) { fault_time_ = t; }
  // Whole-run extremes are tracked only when asked (valve ratings to check)
  // or after a fault instant: otherwise samples outside the window cost
  // nothing but the probes.
  void SetTrackWholeRun(bool track) { track_whole_run_ = track; }
  double fault_time() const { return fault_time_; }
  struct Extremes {
    double min = 0.0, max = 0.0;           // whole run
    double peak_after_fault = 0.0;         // max |x| from the fault instant
    double square_integral_after_fault = 0.0;  // ∫x² dt from the fault instant
    double first_zero_after_fault = -1.0;  // s; the first sample at or through zero (−1: none)
    double sign_at_fault = 0.0;
    bool seen = false;
  };
  const std::vector<Extremes>& extremes() const { return extremes_; }
  std::size_t capacity() const { return capacity_; }  // rows the channel ring holds

  const ProbeRecorder& probes() const { return probes_; }
  const AnalysisChannels& channels() const { return channels_; }

  // The channel samples with time in [begin, end) (half a sample of
  // rounding allowed), oldest first: time, and one column per channel.
  // Views into the recorder, valid until the next sample; taking them puts
  // the ring in time order in place (no copy of the data is made).
  struct Window {
    std::span<const double> t;
    std::vector<std::span<const double>> columns;
  };
  Window Extract(double begin, double end);

 private:
  ProbeRecorder probes_;
  const AnalysisChannels& channels_;
  int width_ = 0;
  std::size_t capacity_ = 0;   // rows in the ring
  std::size_t count_ = 0;      // rows written in all
  std::vector<double> times_;                 // ring of times
  std::vector<std::vector<double>> columns_;  // ring of each channel
  double from_ = 0.0, to_ = 0.0, half_ = 0.0, sample_ = 0.0;
  double fault_time_ = -1.0;
  bool track_whole_run_ = false;
  std::vector<Extremes> extremes_;
};

// A recorder sized for `study`'s analysis window: the chosen `window`; the
// last cycles before stop when the run does not wait for steady state; else
// a ring holding the last `cycles` cycles of a steady run.
std::unique_ptr<CaseRecorder> RecorderFor(const Study& study, const AnalysisChannels& channels,
                                          const RecorderOptions& probes_options = {});

}  // namespace lcc
