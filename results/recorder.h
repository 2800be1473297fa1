// Records the probes at every output sample (a SampleSink for the engine).
#pragma once

#include <vector>

#include "engine/simulator.h"
#include "models/study.h"

namespace lcc {

class ProbeRecorder final : public SampleSink {
 public:
  explicit ProbeRecorder(const std::vector<Probe>& probes) : probes_(&probes), columns_(probes.size()) {
    for (const auto& p : probes)
      for (const auto& slot : p.slots) derivatives_ |= !slot.yp.empty();
  }
  bool wants_derivatives() const override { return derivatives_; }

  void OnSample(double t, const double* y, const double* yp) override {
    time_.push_back(t);
    for (std::size_t k = 0; k < probes_->size(); ++k) columns_[k].push_back(EvaluateProbe((*probes_)[k], y, yp));
  }
  // The same probes compiled for a circuit whose values changed.
  void OnProbesChange(const std::vector<Probe>& probes) override {
    if (probes.size() == probes_->size()) probes_ = &probes;
  }

  const std::vector<Probe>& probes() const { return *probes_; }
  const std::vector<double>& time() const { return time_; }
  const std::vector<std::vector<double>>& columns() const { return columns_; }

 private:
  const std::vector<Probe>* probes_;
  std::vector<double> time_;
  std::vector<std::vector<double>> columns_;
  bool derivatives_ = false;  // some probe needs y' (a capacitor current)
};

}  // namespace lcc
