#include "engine/phasor.h"

#include <Eigen/Dense>
#include <Eigen/SparseLU>
#include <cmath>
#include <complex>
#include <numbers>

#include "engine/real_fft.h"

namespace lcc {

namespace {

// The sources' values b_i(t_k), k = 0..N−1, over one period: column i holds
// unknown i's row of b, contiguous, as the FFT takes it.
Eigen::MatrixXd SampleSources(MnaSystem& mna, double period, int samples) {
  const int n = mna.size();
  Eigen::MatrixXd b(samples, n);
  std::vector<double> column(n);
  for (int k = 0; k < samples; ++k) {
    mna.Sources(period * k / samples, column.data());
    for (int i = 0; i < n; ++i) b(k, i) = column[i];
  }
  return b;
}

// B_h = (2/N)·Σ_k b(t_k)·e^(−j·h·2πk/N) for h = 0..N/2, in column h, by one
// real FFT per row of b that has a source (most rows have none).
Eigen::MatrixXcd SourceHarmonics(const Eigen::MatrixXd& b) {
  const int samples = static_cast<int>(b.rows()), rows = static_cast<int>(b.cols());
  Eigen::MatrixXcd bh = Eigen::MatrixXcd::Zero(rows, samples / 2 + 1);
  std::vector<std::complex<double>> dft;
  for (int i = 0; i < rows; ++i) {
    if (b.col(i).isZero(0.0)) continue;
    RealForwardDft(b.col(i).data(), samples, &dft);
    for (int h = 0; h <= samples / 2; ++h) bh(i, h) = dft[h] * (2.0 / samples);
  }
  return bh;
}

}  // namespace

// The matrix G + j·hω·C on the MNA pattern, factorised by a sparse LU
// (COLAMD ordering, partial pivoting): the network matrix has a few entries
// per column, and for a twelve-pulse circuit (about 60 unknowns) this is an
// order of magnitude fewer operations than a dense LU.
struct PhasorSolver::Impl {
  using ComplexSparse = Eigen::SparseMatrix<std::complex<double>, Eigen::ColMajor, int>;
  ComplexSparse a;
  Eigen::SparseLU<ComplexSparse, Eigen::COLAMDOrdering<int>> lu;
  bool analysed = false;
};

PhasorSolver::PhasorSolver(MnaSystem& mna, double frequency, int samples)
    : mna_(mna), frequency_(frequency), samples_(samples), impl_(std::make_unique<Impl>()) {
  const Eigen::MatrixXd b = SampleSources(mna, 1.0 / frequency, samples);
  largest_sample_ = b.cwiseAbs().maxCoeff();
  harmonics_ = SourceHarmonics(b);
  const auto& pattern = mna.pattern();
  const int n = mna.size();
  impl_->a.resize(n, n);
  impl_->a.resizeNonZeros(pattern.nonZeros());
  std::copy(pattern.outerIndexPtr(), pattern.outerIndexPtr() + n + 1, impl_->a.outerIndexPtr());
  std::copy(pattern.innerIndexPtr(), pattern.innerIndexPtr() + pattern.nonZeros(), impl_->a.innerIndexPtr());
}

PhasorSolver::~PhasorSolver() = default;

Eigen::VectorXcd PhasorSolver::SourceHarmonic(int h) const {
  // The DFT of N samples is N-periodic in h and conjugate-symmetric: an
  // order at or above N/2 reads its alias (as the sum itself would).
  const int m = ((h % samples_) + samples_) % samples_;
  if (m <= samples_ / 2) return harmonics_.col(m);
  return harmonics_.col(samples_ - m).conjugate();
}

bool PhasorSolver::SourceNegligible(const Eigen::VectorXcd& bh) const {
  return bh.cwiseAbs().maxCoeff() <= 1e-12 * (largest_sample_ + 1e-300);
}

bool PhasorSolver::Solve(int h, Eigen::VectorXcd* y) {
  const std::vector<double>& g = mna_.g_values();
  const std::vector<double>& c = mna_.c_values();
  const std::complex<double> jw(0.0, 2.0 * std::numbers::pi * frequency_ * h);
  std::complex<double>* values = impl_->a.valuePtr();
  for (std::size_t p = 0; p < g.size(); ++p) values[p] = g[p] + jw * c[p];
  if (!impl_->analysed) {
    impl_->lu.analyzePattern(impl_->a);
    impl_->analysed = true;
  }
  impl_->lu.factorize(impl_->a);
  if (impl_->lu.info() != Eigen::Success) return false;
  *y = impl_->lu.solve(SourceHarmonic(h));
  return y->allFinite();
}

bool SolveHarmonicPhasor(MnaSystem& mna, double frequency, int h, Eigen::VectorXcd* y) {
  return PhasorSolver(mna, frequency).Solve(h, y);
}

bool SolvePeriodicStart(MnaSystem& mna, double frequency, std::vector<double>* y0) {
  const int n = mna.size();
  constexpr int kMaxHarmonic = 100;
  PhasorSolver solver(mna, frequency);
  y0->assign(n, 0.0);
  for (int h = 1; h <= kMaxHarmonic; ++h) {
    if (solver.SourceNegligible(solver.SourceHarmonic(h))) continue;
    Eigen::VectorXcd yh;
    if (!solver.Solve(h, &yh)) return false;
    for (int i = 0; i < n; ++i) (*y0)[i] += yh[i].real();
  }
  return true;
}

}  // namespace lcc
