#include "results/measures.h"

#include <algorithm>
#include <cmath>

namespace lcc {

WindowStats Measure(const std::vector<double>& t, const std::vector<double>& x, double begin, double end) {
  WindowStats s;
  if (t.size() < 2 || x.size() != t.size()) return s;
  const double half = 0.5 * (t[1] - t[0]);
  double sum = 0.0, sum2 = 0.0;
  for (std::size_t k = 0; k < t.size(); ++k) {
    if (t[k] < begin - half || t[k] >= end - half) continue;
    const double v = x[k];
    if (s.samples == 0) s.min = s.max = v;
    s.min = std::min(s.min, v);
    s.max = std::max(s.max, v);
    sum += v;
    sum2 += v * v;
    ++s.samples;
  }
  if (s.samples > 0) {
    s.mean = sum / s.samples;
    s.rms = std::sqrt(sum2 / s.samples);
  }
  return s;
}

double SettlingTime(const std::vector<double>& t, const std::vector<double>& x, double target, double band,
                    double window) {
  if (t.size() < 2 || x.size() != t.size() || window <= 0) return -1.0;
  const double dt = t[1] - t[0];
  const std::size_t n = static_cast<std::size_t>(std::llround(window / dt));
  if (n == 0 || n >= t.size()) return -1.0;
  // Walk backwards from the end: the last window whose mean is out of band.
  double sum = 0.0;
  for (std::size_t k = t.size() - n; k < t.size(); ++k) sum += x[k];
  double settled = -1.0;
  for (std::size_t end = t.size(); end >= n + 1; --end) {  // window [end - n, end)
    if (end < t.size()) sum += x[end - n] - x[end];
    if (std::abs(sum / n - target) > band * std::abs(target)) return settled;
    settled = t[end - 1];
  }
  return settled;
}

}  // namespace lcc
