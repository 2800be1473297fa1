// Records the probes at every output sample (a SampleSink for the engine)
// for the waveform files and the probe figures.
//
// A row is the sample's time followed by one value per probe. Rows are held
// in memory up to RecorderOptions::memory_bytes; past that they go, a block
// at a time, to a spool: an unnamed temporary file that the system removes
// when the recorder closes it (or the process ends, however it ends). So
// peak memory does not grow with the simulated duration. Readers walk the
// rows in time order with ForEachRow, whichever way they were kept.
//
// A spool that cannot be written (a full disk) loses nothing: the recorder
// keeps every later row in memory and spool_error() says why.
#pragma once

#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "engine/simulator.h"
#include "models/study.h"

namespace lcc {

struct RecorderOptions {
  // Bytes of rows held in memory before a block goes to the spool; 0 keeps
  // the whole run in memory (tests, benchmarks, short runs).
  std::size_t memory_bytes = 0;
  // The folder of the spool file; empty: the system's temporary folder.
  // Put it on the disk the results go to, so that a full disk shows there.
  std::string spool_folder;
};

class ProbeRecorder final : public SampleSink {
 public:
  explicit ProbeRecorder(const std::vector<Probe>& probes, RecorderOptions options = {});
  ~ProbeRecorder() override;
  ProbeRecorder(const ProbeRecorder&) = delete;
  ProbeRecorder& operator=(const ProbeRecorder&) = delete;

  bool wants_derivatives() const override { return derivatives_; }
  std::optional<std::vector<int>> unknowns_read() const override;
  void OnSample(double t, const double* y, const double* yp) override;
  // The same probes compiled for a circuit whose values changed.
  void OnProbesChange(const std::vector<Probe>& probes) override {
    if (probes.size() == probes_->size()) probes_ = &probes;
  }

  const std::vector<Probe>& probes() const { return *probes_; }
  std::size_t rows() const { return rows_; }

  // Calls f(row) for every row in time order: row[0] is the time in s,
  // row[1 + k] probe k's value. The pointer is valid during the call only.
  // Throws std::runtime_error if the spool cannot be read back.
  void ForEachRow(const std::function<void(const double* row)>& f) const;

  // The smallest and largest finite value of each probe over the run
  // (any = false: no finite sample), kept as the rows arrive.
  struct Range {
    double min = 0.0, max = 0.0;
    bool any = false;
  };
  const std::vector<Range>& ranges() const { return ranges_; }

  // The whole run of one probe, or of the time (k = -1), as a vector: a
  // convenience for tests and benchmarks, as large as the run.
  std::vector<double> Column(int k) const;
  std::vector<double> Time() const { return Column(-1); }

  // Rows that went to the spool file, and why the spool stopped (empty
  // when it did not).
  std::size_t spooled_rows() const { return spooled_rows_; }
  const std::string& spool_error() const { return spool_error_; }

 private:
  void Spill();  // the rows in memory to the spool

  const std::vector<Probe>* probes_;
  RecorderOptions options_;
  std::size_t width_;                // 1 + probes
  std::vector<double> memory_;       // rows not spooled, row after row
  std::vector<Range> ranges_;
  std::size_t rows_ = 0;
  std::size_t spooled_rows_ = 0;
  int spool_fd_ = -1;
  std::string spool_error_;
  bool derivatives_ = false;  // some probe needs y' (a capacitor current)
};

}  // namespace lcc
