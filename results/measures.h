// Measurements over a window of uniformly spaced samples.
//
// The window is [begin, end) in time, normally a whole number of cycles, so
// that a sample at `end` (the first of the next cycle) is not counted twice.
// With N uniform samples per period the rectangle rule used here is exact for
// any periodic waveform that is a trigonometric polynomial of order below N/2.
#pragma once

#include <algorithm>
#include <cmath>
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

}  // namespace lcc
