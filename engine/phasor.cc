#include "engine/phasor.h"

#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <numbers>

namespace lcc {

bool SolvePeriodicStart(MnaSystem& mna, double frequency, std::vector<double>* y0) {
  const int n = mna.size();
  constexpr int kSamples = 256;  // harmonics up to 127 are exact
  constexpr int kMaxHarmonic = 100;
  const double period = 1.0 / frequency;
  // b(t) over one period.
  Eigen::MatrixXd b(n, kSamples);
  std::vector<double> column(n);
  for (int k = 0; k < kSamples; ++k) {
    mna.Sources(period * k / kSamples, column.data());
    for (int i = 0; i < n; ++i) b(i, k) = column[i];
  }
  y0->assign(n, 0.0);
  const auto& pattern = mna.pattern();
  const std::vector<double>& g = mna.g_values();
  const std::vector<double>& c = mna.c_values();
  for (int h = 1; h <= kMaxHarmonic; ++h) {
    // B_h = (2/N)·Σ_k b(t_k)·e^(−j·h·2πk/N)
    Eigen::VectorXcd bh = Eigen::VectorXcd::Zero(n);
    for (int k = 0; k < kSamples; ++k) {
      const std::complex<double> w = std::polar(2.0 / kSamples, -2.0 * std::numbers::pi * h * k / kSamples);
      for (int i = 0; i < n; ++i)
        if (b(i, k) != 0.0) bh[i] += b(i, k) * w;
    }
    if (bh.cwiseAbs().maxCoeff() <= 1e-12 * (b.cwiseAbs().maxCoeff() + 1e-300)) continue;
    Eigen::MatrixXcd a = Eigen::MatrixXcd::Zero(n, n);
    const std::complex<double> jw(0.0, 2.0 * std::numbers::pi * frequency * h);
    for (int col = 0; col < n; ++col)
      for (int p = pattern.outerIndexPtr()[col]; p < pattern.outerIndexPtr()[col + 1]; ++p)
        a(pattern.innerIndexPtr()[p], col) += g[p] + jw * c[p];
    Eigen::PartialPivLU<Eigen::MatrixXcd> lu(a);
    const Eigen::VectorXcd yh = lu.solve(bh);
    if (!yh.allFinite()) return false;
    for (int i = 0; i < n; ++i) (*y0)[i] += yh[i].real();
  }
  return true;
}

}  // namespace lcc
