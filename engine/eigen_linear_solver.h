// A SUNDIALS linear solver backed by Eigen (engine/lu_solver.h).
//
// IDA assembles J = ∂F/∂y + cj·∂F/∂y' into a compressed-sparse-column
// SUNMatrix through the Jacobian function; this solver factorises its
// values with the left-looking sparse LU of engine/lu_solver.h (Eigen's
// supernodal LU for very large systems); the symbolic analysis runs once. A zero pivot is
// reported to IDA as a recoverable failure, so IDA retries with a smaller
// step.
#pragma once

#include <sundials/sundials_context.h>
#include <sundials/sundials_linearsolver.h>

#include <Eigen/SparseCore>

#include "engine/lu_solver.h"

namespace lcc {

struct EigenSolverStats {
  long setups = 0;            // numeric factorisations
  long reused_plans = 0;      // of which on a kept pivot plan (engine/lu_solver.h)
  long analyses = 0;          // symbolic analyses (1 for a run)
  long solves = 0;
  long singular = 0;          // factorisations that met a zero pivot
  bool supernodal = false;    // Eigen's supernodal LU (very large system)
};

// Creates the solver for matrices with the pattern of `pattern`. The caller
// owns the result (free it with SUNLinSolFree). `stats` must outlive it.
SUNLinearSolver MakeEigenLu(SUNContext ctx, const Eigen::SparseMatrix<double, Eigen::ColMajor, int>& pattern,
                            const LuOptions& options, EigenSolverStats* stats);

}  // namespace lcc
