#include "engine/real_fft.h"

#include <fftw3.h>

#include <algorithm>
#include <map>
#include <mutex>

namespace lcc {
namespace {

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

// Work arrays kept per thread between calls, allocated by fftw_alloc_* so
// that they are aligned as the plans (made on other arrays) assume.
struct Buffers {
  int n = 0;
  double* in = nullptr;
  fftw_complex* out = nullptr;
  ~Buffers() {
    fftw_free(in);
    fftw_free(out);
  }
  void Resize(int size) {
    if (n == size) return;
    fftw_free(in);
    fftw_free(out);
    in = fftw_alloc_real(size);
    out = fftw_alloc_complex(size / 2 + 1);
    n = size;
  }
};

}  // namespace

void RealForwardDft(const double* x, int n, std::vector<std::complex<double>>* out) {
  thread_local Buffers buffers;
  buffers.Resize(n);
  std::copy(x, x + n, buffers.in);
  fftw_execute_dft_r2c(PlanFor(n), buffers.in, buffers.out);
  out->resize(n / 2 + 1);
  for (int m = 0; m <= n / 2; ++m) (*out)[m] = {buffers.out[m][0], buffers.out[m][1]};
}

}  // namespace lcc
