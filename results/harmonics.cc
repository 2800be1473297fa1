#include "results/harmonics.h"

#include <fftw3.h>
#include <Eigen/Core>
#include <fmt/format.h>

#include <cmath>
#include <map>
#include <mutex>
#include <stdexcept>

namespace lcc {
namespace {

// One plan per transform length, made on first use and kept for the life
// of the process: planning (even FFTW_ESTIMATE) computes the twiddle
// factors, which cost more than the transform itself. FFTW's planner is
// not thread-safe, so the cache is guarded; executing a plan on new arrays
// (fftw_execute_dft_r2c) is, given arrays aligned as at planning, which
// fftw_alloc_* guarantees.
struct PlanCache {
  std::mutex mutex;
  std::map<int, fftw_plan> plans;
  ~PlanCache() {  // at exit: nothing left for a leak checker to report
    for (auto& [n, plan] : plans) fftw_destroy_plan(plan);
    fftw_cleanup();
  }
};

fftw_plan PlanFor(int n) {
  static PlanCache cache;
  std::lock_guard<std::mutex> lock(cache.mutex);
  auto it = cache.plans.find(n);
  if (it != cache.plans.end()) return it->second;
  double* in = fftw_alloc_real(n);
  fftw_complex* out = fftw_alloc_complex(n / 2 + 1);
  fftw_plan plan = fftw_plan_dft_r2c_1d(n, in, out, FFTW_ESTIMATE);
  fftw_free(in);
  fftw_free(out);
  cache.plans.emplace(n, plan);
  return plan;
}

}  // namespace

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

  // Work arrays kept per thread between calls (fftw_alloc alignment, as
  // the plan needs); a report makes dozens of transforms of one length.
  struct Buffers {
    int n = 0;
    double* in = nullptr;
    fftw_complex* out = nullptr;
    ~Buffers() {
      fftw_free(in);
      fftw_free(out);
    }
  };
  thread_local Buffers buffers;
  if (buffers.n != n) {
    fftw_free(buffers.in);
    fftw_free(buffers.out);
    buffers.in = fftw_alloc_real(n);
    buffers.out = fftw_alloc_complex(n / 2 + 1);
    buffers.n = n;
  }
  double* in = buffers.in;
  fftw_complex* out = buffers.out;
  const fftw_plan plan = PlanFor(n);
  const Eigen::Map<const Eigen::VectorXd> samples(x, n);
  Eigen::Map<Eigen::VectorXd>(in, n) = samples;
  const double sum2 = samples.squaredNorm();
  fftw_execute_dft_r2c(plan, in, out);
  // X_m = Σ x_k·e^(−j2πmk/n); for m = cycles·h the peak phasor of harmonic h
  // is 2·X_m/n (its cosine part is the real part).
  s.dc = out[0][0] / n;
  s.total_rms = std::sqrt(sum2 / n);
  s.phasor.assign(orders + 1, {0.0, 0.0});
  s.phasor[0] = {s.dc, 0.0};
  for (int h = 1; h <= orders; ++h) {
    const int m = h * cycles;
    s.phasor[h] = std::complex<double>(out[m][0], out[m][1]) * (2.0 / n);
  }
  return s;
}

}  // namespace lcc
