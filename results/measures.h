// Measurements over a window of uniformly spaced samples.
//
// The window is [begin, end) in time, normally a whole number of cycles, so
// that a sample at `end` (the first of the next cycle) is not counted twice.
// With N uniform samples per period the rectangle rule used here is exact for
// any periodic waveform that is a trigonometric polynomial of order below N/2.
#pragma once

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <vector>

namespace lcc {

struct WindowStats {
  int samples = 0;
  double mean = 0.0;   // (1/N)·Σ x_k
  double rms = 0.0;    // sqrt((1/N)·Σ x_k²)
  double min = 0.0;
  double max = 0.0;

  // Derived figures (zero where the mean is zero and a ratio is undefined).
  double peak() const { return std::max(std::abs(min), std::abs(max)); }
  double ripple_pp() const { return max - min; }
  // rms of the AC part, sqrt(rms² − mean²).
  double ripple_rms() const { return std::sqrt(std::max(rms * rms - mean * mean, 0.0)); }
  // Ripple factor = ripple rms / |mean|; form factor = rms / |mean|
  // (e.g. Rashid, Power Electronics, 3rd ed., Ch. 3 definitions).
  double ripple_factor() const { return mean != 0.0 ? ripple_rms() / std::abs(mean) : 0.0; }
  double form_factor() const { return mean != 0.0 ? rms / std::abs(mean) : 0.0; }
};

// WindowStats built sample by sample, for samples that arrive one at a time
// (a run read back from its spool): Add each sample of the window.
class WindowAccumulator {
 public:
  void Add(double v) {
    if (s_.samples == 0) s_.min = s_.max = v;
    s_.min = std::min(s_.min, v);
    s_.max = std::max(s_.max, v);
    sum_ += v;
    sum2_ += v * v;
    ++s_.samples;
  }
  WindowStats Result() const;

 private:
  WindowStats s_;
  double sum_ = 0.0, sum2_ = 0.0;
};

// Whether a sample at t belongs to the window [begin, end) of samples
// `sample` apart: half a sample of rounding allowed at each end.
inline bool InWindow(double t, double begin, double end, double sample) {
  return t >= begin - 0.5 * sample && t < end - 0.5 * sample;
}

// Statistics of x over the samples whose time lies in [begin, end); the
// comparison allows half a sample of rounding. No samples: samples = 0.
WindowStats Measure(const std::vector<double>& t, const std::vector<double>& x, double begin, double end);

// The settling time of a regulated quantity: the first time after which the
// mean of x over the preceding `window` (one period, to average out the
// converter ripple) stays within band·|target| of target to the end of the
// record. Negative if it never settles (or the record is shorter than a
// window).
double SettlingTime(const std::vector<double>& t, const std::vector<double>& x, double target, double band,
                    double window);

// SettlingTime for samples that arrive in time order, `window_samples`
// to a window: it keeps the last window's samples only.
class SettlingTracker {
 public:
  SettlingTracker(double target, double band, std::size_t window_samples)
      : target_(target), band_(band), ring_(window_samples, 0.0) {}
  void Add(double t, double x);
  // The settling time, or negative (never settled, or too few samples).
  double Result() const { return settled_; }

 private:
  double target_, band_;
  std::vector<double> ring_;
  std::size_t count_ = 0;
  double sum_ = 0.0;
  double settled_ = -1.0;
};

}  // namespace lcc
