#include "engine/phasor.h"

#include <Eigen/Dense>
#include <Eigen/SparseLU>
#include <cmath>
#include <complex>
#include <numbers>

namespace lcc {

namespace {

constexpr int kSamples = 256;  // harmonics up to 127 are exact

// B_h = (2/N)·Σ_k b(t_k)·e^(−j·h·2πk/N) over one period of b(t).
Eigen::MatrixXd SampleSources(MnaSystem& mna, double period) {
  const int n = mna.size();
  Eigen::MatrixXd b(n, kSamples);
  std::vector<double> column(n);
  for (int k = 0; k < kSamples; ++k) {
    mna.Sources(period * k / kSamples, column.data());
    for (int i = 0; i < n; ++i) b(i, k) = column[i];
  }
  return b;
}

Eigen::VectorXcd Harmonic(const Eigen::MatrixXd& b, int h) {
  Eigen::VectorXcd bh = Eigen::VectorXcd::Zero(b.rows());
  for (int k = 0; k < kSamples; ++k) {
    const std::complex<double> w = std::polar(2.0 / kSamples, -2.0 * std::numbers::pi * h * k / kSamples);
    for (int i = 0; i < b.rows(); ++i)
      if (b(i, k) != 0.0) bh[i] += b(i, k) * w;
  }
  return bh;
}

// A sparse LU (COLAMD ordering, partial pivoting): the network matrix has
// a few entries per column, and for a twelve-pulse circuit (about 60
// unknowns) this is an order of magnitude fewer operations than a dense LU.
bool SolveAt(MnaSystem& mna, double frequency, int h, const Eigen::VectorXcd& bh, Eigen::VectorXcd* y) {
  using ComplexSparse = Eigen::SparseMatrix<std::complex<double>, Eigen::ColMajor, int>;
  const int n = mna.size();
  const auto& pattern = mna.pattern();
  const std::vector<double>& g = mna.g_values();
  const std::vector<double>& c = mna.c_values();
  const std::complex<double> jw(0.0, 2.0 * std::numbers::pi * frequency * h);
  ComplexSparse a(n, n);
  a.resizeNonZeros(pattern.nonZeros());
  std::copy(pattern.outerIndexPtr(), pattern.outerIndexPtr() + n + 1, a.outerIndexPtr());
  std::copy(pattern.innerIndexPtr(), pattern.innerIndexPtr() + pattern.nonZeros(), a.innerIndexPtr());
  for (int p = 0; p < pattern.nonZeros(); ++p) a.valuePtr()[p] = g[p] + jw * c[p];
  Eigen::SparseLU<ComplexSparse, Eigen::COLAMDOrdering<int>> lu;
  lu.compute(a);
  if (lu.info() != Eigen::Success) return false;
  *y = lu.solve(bh);
  return y->allFinite();
}

}  // namespace

bool SolveHarmonicPhasor(MnaSystem& mna, double frequency, int h, Eigen::VectorXcd* y) {
  const Eigen::MatrixXd b = SampleSources(mna, 1.0 / frequency);
  return SolveAt(mna, frequency, h, Harmonic(b, h), y);
}

bool SolvePeriodicStart(MnaSystem& mna, double frequency, std::vector<double>* y0) {
  const int n = mna.size();
  constexpr int kMaxHarmonic = 100;
  const Eigen::MatrixXd b = SampleSources(mna, 1.0 / frequency);
  y0->assign(n, 0.0);
  for (int h = 1; h <= kMaxHarmonic; ++h) {
    const Eigen::VectorXcd bh = Harmonic(b, h);
    if (bh.cwiseAbs().maxCoeff() <= 1e-12 * (b.cwiseAbs().maxCoeff() + 1e-300)) continue;
    Eigen::VectorXcd yh;
    if (!SolveAt(mna, frequency, h, bh, &yh)) return false;
    for (int i = 0; i < n; ++i) (*y0)[i] += yh[i].real();
  }
  return true;
}

}  // namespace lcc
