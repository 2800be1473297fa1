#include "engine/lu_solver.h"

#include <cmath>

namespace lcc {

LuSolver::LuSolver(const SparseMatrix& pattern, const LuOptions& options)
    : dense_(pattern.rows() <= options.dense_limit), sparse_(pattern) {
  sparse_.makeCompressed();
  if (dense_) {
    dense_matrix_.setZero(pattern.rows(), pattern.cols());
    pivot_.assign(pattern.rows(), 0);
  }
  work_.resize(pattern.rows());
}

bool LuSolver::Factorize(const double* values) {
  const int n = static_cast<int>(sparse_.rows());
  if (dense_) {
    // Column-major storage, A[i + j·n], used through a raw pointer: at these
    // sizes Eigen's element access does not fold away entirely.
    double* A = dense_matrix_.data();
    auto at = [A, n](int i, int j) -> double& { return A[i + static_cast<std::size_t>(j) * n]; };
    // Clear what the last factorisation left (its L and U non-zeros and the
    // diagonal), rather than all n² entries.
    if (lower_start_.empty()) {
      dense_matrix_.setZero();
    } else {
      for (int j = 0; j < n; ++j) {
        at(j, j) = 0.0;
        for (int p = lower_start_[j]; p < lower_start_[j + 1]; ++p) at(lower_rows_[p], j) = 0.0;
        for (int p = upper_start_[j]; p < upper_start_[j + 1]; ++p) at(upper_rows_[p], j) = 0.0;
      }
    }
    const int* outer = sparse_.outerIndexPtr();
    const int* inner = sparse_.innerIndexPtr();
    for (int col = 0; col < n; ++col)
      for (int p = outer[col]; p < outer[col + 1]; ++p) at(inner[p], col) = values[p];
    // Right-looking elimination with partial pivoting, touching only the
    // non-zeros of each pivot column and pivot row: MNA matrices are mostly
    // zeros and stay so (little fill-in), which makes this far cheaper than
    // the n³/3 of a plain dense LU once n reaches a few dozen.
    for (int k = 0; k < n; ++k) {
      double* colk = &at(0, k);
      int p = k;
      for (int i = k + 1; i < n; ++i)
        if (std::abs(colk[i]) > std::abs(colk[p])) p = i;
      pivot_[k] = p;
      if (p != k)
        for (int j = 0; j < n; ++j) std::swap(at(k, j), at(p, j));
      // Valve resistances span 15 decades, so a tiny pivot relative to the
      // largest is normal; only an exact zero (a structural singularity the
      // topology checks missed) or a non-finite value is a failure.
      const double pivot = colk[k];
      if (!std::isfinite(pivot) || std::abs(pivot) <= 1e-300) {
        lower_start_.clear();  // the next call must clear the whole matrix
        return false;
      }
      const double inv = 1.0 / pivot;
      rows_.clear();
      for (int i = k + 1; i < n; ++i)
        if (colk[i] != 0.0) {
          colk[i] *= inv;
          rows_.push_back(i);
        }
      if (rows_.empty()) continue;
      for (int j = k + 1; j < n; ++j) {
        double* colj = &at(0, j);
        const double ukj = colj[k];
        if (ukj == 0.0) continue;
        for (int i : rows_) colj[i] -= colk[i] * ukj;
      }
    }
    // Non-zeros of L (below the diagonal) and U (above) by column, for Solve().
    lower_start_.assign(n + 1, 0);
    upper_start_.assign(n + 1, 0);
    lower_rows_.clear();
    upper_rows_.clear();
    for (int j = 0; j < n; ++j) {
      const double* colj = &at(0, j);
      for (int i = 0; i < j; ++i)
        if (colj[i] != 0.0) upper_rows_.push_back(i);
      for (int i = j + 1; i < n; ++i)
        if (colj[i] != 0.0) lower_rows_.push_back(i);
      lower_start_[j + 1] = static_cast<int>(lower_rows_.size());
      upper_start_[j + 1] = static_cast<int>(upper_rows_.size());
    }
    return true;
  }
  std::copy(values, values + sparse_.nonZeros(), sparse_.valuePtr());
  if (!analyzed_) {
    sparse_lu_.analyzePattern(sparse_);
    analyzed_ = true;
    ++analyses_;
  }
  sparse_lu_.factorize(sparse_);
  return sparse_lu_.info() == Eigen::Success;
}

void LuSolver::Solve(const double* b, double* x) {
  const int n = static_cast<int>(sparse_.rows());
  if (dense_) {
    // In place on x, with raw pointers: no temporaries on this hot path.
    if (x != b) std::copy(b, b + n, x);
    const double* a = dense_matrix_.data();  // column-major, leading dimension n
    for (int k = 0; k < n; ++k) std::swap(x[k], x[pivot_[k]]);
    for (int j = 0; j < n; ++j) {  // L·z = P·b, unit lower triangle
      const double xj = x[j];
      if (xj == 0.0) continue;
      const double* col = a + static_cast<std::size_t>(j) * n;
      for (int p = lower_start_[j]; p < lower_start_[j + 1]; ++p) x[lower_rows_[p]] -= col[lower_rows_[p]] * xj;
    }
    for (int j = n - 1; j >= 0; --j) {  // U·x = z
      const double* col = a + static_cast<std::size_t>(j) * n;
      x[j] /= col[j];
      const double xj = x[j];
      if (xj == 0.0) continue;
      for (int p = upper_start_[j]; p < upper_start_[j + 1]; ++p) x[upper_rows_[p]] -= col[upper_rows_[p]] * xj;
    }
    return;
  }
  work_ = Eigen::Map<const Eigen::VectorXd>(b, n);
  Eigen::Map<Eigen::VectorXd>(x, n) = sparse_lu_.solve(work_);
}

}  // namespace lcc
