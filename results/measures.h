// Measurements over a window of uniformly spaced samples.
//
// The window is [begin, end) in time, normally a whole number of cycles, so
// that a sample at `end` (the first of the next cycle) is not counted twice.
// With N uniform samples per period the rectangle rule used here is exact for
// any periodic waveform that is a trigonometric polynomial of order below N/2.
#pragma once

#include <vector>

namespace lcc {

struct WindowStats {
  int samples = 0;
  double mean = 0.0;   // (1/N)·Σ x_k
  double rms = 0.0;    // sqrt((1/N)·Σ x_k²)
  double min = 0.0;
  double max = 0.0;
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
