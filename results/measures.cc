#include "results/measures.h"

#include <algorithm>
#include <cmath>

namespace lcc {

WindowStats WindowAccumulator::Result() const {
  WindowStats s = s_;
  if (s.samples > 0) {
    s.mean = sum_ / s.samples;
    s.rms = std::sqrt(sum2_ / s.samples);
  }
  return s;
}

WindowStats Measure(const std::vector<double>& t, const std::vector<double>& x, double begin, double end) {
  if (t.size() < 2 || x.size() != t.size()) return {};
  const double sample = t[1] - t[0];
  WindowAccumulator acc;
  for (std::size_t k = 0; k < t.size(); ++k)
    if (InWindow(t[k], begin, end, sample)) acc.Add(x[k]);
  return acc.Result();
}

double SettlingTime(const std::vector<double>& t, const std::vector<double>& x, double target, double band,
                    double window) {
  if (t.size() < 2 || x.size() != t.size() || window <= 0) return -1.0;
  const auto n = static_cast<std::size_t>(std::llround(window / (t[1] - t[0])));
  if (n == 0) return -1.0;
  SettlingTracker tracker(target, band, n);
  for (std::size_t k = 0; k < t.size(); ++k) tracker.Add(t[k], x[k]);
  return tracker.Result();
}

void SettlingTracker::Add(double t, double x) {
  // The window of sample k holds samples k − n + 1 … k: the mean of x over
  // the period up to t. The first window judged is that of sample n (its
  // first sample is the record's second), as in SettlingTime.
  const std::size_t n = ring_.size();
  if (n == 0) return;
  const std::size_t slot = count_ % n;
  if (count_ >= n) sum_ -= ring_[slot];
  ring_[slot] = x;
  sum_ += x;
  if (count_ >= n) {
    if (std::abs(sum_ / static_cast<double>(n) - target_) > band_ * std::abs(target_)) settled_ = -1.0;
    else if (settled_ < 0) settled_ = t;
  }
  ++count_;
}

}  // namespace lcc
