// A SUNDIALS linear solver backed by Eigen's sparse LU.
//
// IDA assembles J = ∂F/∂y + cj·∂F/∂y' into a compressed-sparse-column
// SUNMatrix through the Jacobian function; this solver copies its values
// into an Eigen matrix of the same, fixed, pattern and factorises it. The
// symbolic analysis (column ordering) runs on the first setup only; every
// later setup is a numeric factorisation. A zero pivot is reported to IDA as
// a recoverable failure, so IDA retries with a smaller step.
#pragma once

#include <sundials/sundials_context.h>
#include <sundials/sundials_linearsolver.h>

#include <Eigen/SparseCore>

namespace lcc {

struct EigenSolverStats {
  long setups = 0;            // numeric factorisations
  long analyses = 0;          // symbolic analyses (1 for a run)
  long solves = 0;
  long singular = 0;          // factorisations that met a zero pivot
};

// Creates the solver for matrices with the pattern of `pattern`. The caller
// owns the result (free it with SUNLinSolFree). `stats` must outlive it.
SUNLinearSolver MakeEigenSparseLu(SUNContext ctx,
                                  const Eigen::SparseMatrix<double, Eigen::ColMajor, int>& pattern,
                                  EigenSolverStats* stats);

}  // namespace lcc
