#include "engine/phasor.h"

#include <Eigen/Dense>
#include <Eigen/SparseLU>
#include <cmath>
#include <complex>
#include <numbers>

namespace lcc {

namespace {

// B_h = (2/N)·Σ_k b(t_k)·e^(−j·h·2πk/N) over one period of b(t), N samples.
Eigen::MatrixXd SampleSources(MnaSystem& mna, double period, int samples) {
  const int n = mna.size();
  Eigen::MatrixXd b(n, samples);
  std::vector<double> column(n);
  for (int k = 0; k < samples; ++k) {
    mna.Sources(period * k / samples, column.data());
    for (int i = 0; i < n; ++i) b(i, k) = column[i];
  }
  return b;
}

Eigen::VectorXcd Harmonic(const Eigen::MatrixXd& b, int h) {
  const int samples = static_cast<int>(b.cols());
  Eigen::VectorXcd bh = Eigen::VectorXcd::Zero(b.rows());
  for (int k = 0; k < samples; ++k) {
    const std::complex<double> w = std::polar(2.0 / samples, -2.0 * std::numbers::pi * h * k / samples);
    for (int i = 0; i < b.rows(); ++i)
      if (b(i, k) != 0.0) bh[i] += b(i, k) * w;
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
    : mna_(mna), frequency_(frequency), samples_(SampleSources(mna, 1.0 / frequency, samples)),
      impl_(std::make_unique<Impl>()) {
  const auto& pattern = mna.pattern();
  const int n = mna.size();
  impl_->a.resize(n, n);
  impl_->a.resizeNonZeros(pattern.nonZeros());
  std::copy(pattern.outerIndexPtr(), pattern.outerIndexPtr() + n + 1, impl_->a.outerIndexPtr());
  std::copy(pattern.innerIndexPtr(), pattern.innerIndexPtr() + pattern.nonZeros(), impl_->a.innerIndexPtr());
}

PhasorSolver::~PhasorSolver() = default;

Eigen::VectorXcd PhasorSolver::SourceHarmonic(int h) const { return Harmonic(samples_, h); }

bool PhasorSolver::SourceNegligible(const Eigen::VectorXcd& bh) const {
  return bh.cwiseAbs().maxCoeff() <= 1e-12 * (samples_.cwiseAbs().maxCoeff() + 1e-300);
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
