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

}  // namespace lcc
