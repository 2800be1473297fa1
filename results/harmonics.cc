#include "results/harmonics.h"

#include <Eigen/Core>
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "engine/real_fft.h"

namespace lcc {

double Spectrum::HarmonicRms() const {
  double sum = 0.0;
  for (int h = 2; h <= max_order(); ++h) sum += rms(h) * rms(h);
  return std::sqrt(sum);
}

double Spectrum::Thd() const {
  const double i1 = max_order() >= 1 ? rms(1) : 0.0;
  return i1 > 0 ? HarmonicRms() / i1 : 0.0;
}

double Spectrum::ThdAllOrders() const {
  const double i1 = max_order() >= 1 ? rms(1) : 0.0;
  if (i1 <= 0) return 0.0;
  const double rest = total_rms * total_rms - dc * dc - i1 * i1;
  return std::sqrt(std::max(rest, 0.0)) / i1;
}

Spectrum AnalyseHarmonics(const double* x, int n, int cycles, int max_order) {
  if (cycles < 1 || n < 2 * cycles || n % cycles != 0)
    throw std::invalid_argument(fmt::format("harmonic analysis needs whole cycles: {} samples over {} cycles", n, cycles));
  Spectrum s;
  s.cycles = cycles;
  s.samples_per_cycle = n / cycles;
  const int resolved = (s.samples_per_cycle - 1) / 2;  // highest order below the Nyquist limit
  const int orders = std::min(max_order, resolved);

  const Eigen::Map<const Eigen::VectorXd> samples(x, n);
  const double sum2 = samples.squaredNorm();
  thread_local std::vector<std::complex<double>> dft;
  RealForwardDft(x, n, &dft);
  // X_m = Σ x_k·e^(−j2πmk/n); for m = cycles·h the peak phasor of harmonic h
  // is 2·X_m/n (its cosine part is the real part).
  s.dc = dft[0].real() / n;
  s.total_rms = std::sqrt(sum2 / n);
  s.phasor.assign(orders + 1, {0.0, 0.0});
  s.phasor[0] = {s.dc, 0.0};
  for (int h = 1; h <= orders; ++h) s.phasor[h] = dft[static_cast<std::size_t>(h) * cycles] * (2.0 / n);
  return s;
}

}  // namespace lcc
