// LU factorisation of a square matrix with a fixed sparsity pattern.
//
// Small systems (up to `dense_limit` unknowns) are factorised in dense
// storage with partial pivoting, by a right-looking elimination written
// here that skips the zeros of each pivot row and column: below a hundred or
// so unknowns that is several times cheaper than a sparse LU (whose
// supernodal bookkeeping then dominates) and than Eigen's blocked dense LU
// (measured with callgrind: bench/six_pulse_bench, 14 unknowns, and
// bench/twelve_pulse_bench, 54 unknowns). Larger systems use Eigen's sparse
// LU; its symbolic analysis (the COLAMD column ordering) runs on the first
// factorisation only, the pattern never changing. Factorize() reports a
// zero or non-finite pivot as failure instead of producing infinities.
#pragma once

#include <Eigen/Dense>
#include <Eigen/SparseCore>
#include <Eigen/SparseLU>
#include <memory>
#include <vector>

namespace lcc {

struct LuOptions {
  int dense_limit = 64;  // largest system factorised densely
};

class LuSolver {
 public:
  using SparseMatrix = Eigen::SparseMatrix<double, Eigen::ColMajor, int>;

  LuSolver(const SparseMatrix& pattern, const LuOptions& options = {});

  // Factorises the matrix whose non-zeros, in the pattern's order, are
  // `values`. Returns false if it is singular.
  bool Factorize(const double* values);
  // x = A⁻¹·b for the last factorised A (x and b may alias).
  void Solve(const double* b, double* x);

  bool dense() const { return dense_; }
  long analyses() const { return analyses_; }

 private:
  bool dense_;
  SparseMatrix sparse_;
  Eigen::SparseLU<SparseMatrix, Eigen::COLAMDOrdering<int>> sparse_lu_;
  bool analyzed_ = false;
  Eigen::MatrixXd dense_matrix_;  // L and U in place after Factorize()
  std::vector<int> pivot_;        // row exchanged with row k at step k
  std::vector<int> rows_;         // scratch: non-zero rows of the pivot column
  std::vector<int> lower_start_, lower_rows_, upper_start_, upper_rows_;  // L and U non-zeros by column
  Eigen::VectorXd work_;
  long analyses_ = 0;
};

}  // namespace lcc
