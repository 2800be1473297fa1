#include "engine/eigen_linear_solver.h"

#include <sunmatrix/sunmatrix_sparse.h>

#include <Eigen/SparseLU>
#include <algorithm>

namespace lcc {
namespace {

using Matrix = Eigen::SparseMatrix<double, Eigen::ColMajor, int>;

struct Content {
  Matrix matrix;
  Eigen::SparseLU<Matrix, Eigen::COLAMDOrdering<int>> lu;
  bool analyzed = false;
  EigenSolverStats* stats = nullptr;
};

Content* Get(SUNLinearSolver s) { return static_cast<Content*>(s->content); }

SUNLinearSolver_Type GetType(SUNLinearSolver) { return SUNLINEARSOLVER_DIRECT; }
SUNLinearSolver_ID GetId(SUNLinearSolver) { return SUNLINEARSOLVER_CUSTOM; }
int Initialize(SUNLinearSolver) { return SUNLS_SUCCESS; }

int Setup(SUNLinearSolver s, SUNMatrix a) {
  Content* c = Get(s);
  // The Jacobian function wrote exactly our pattern, so values line up.
  std::copy(SM_DATA_S(a), SM_DATA_S(a) + c->matrix.nonZeros(), c->matrix.valuePtr());
  if (!c->analyzed) {
    c->lu.analyzePattern(c->matrix);
    c->analyzed = true;
    ++c->stats->analyses;
  }
  c->lu.factorize(c->matrix);
  ++c->stats->setups;
  if (c->lu.info() != Eigen::Success) {
    ++c->stats->singular;
    return SUNLS_LUFACT_FAIL;  // positive: IDA may recover with a smaller step
  }
  return SUNLS_SUCCESS;
}

int Solve(SUNLinearSolver s, SUNMatrix, N_Vector x, N_Vector b, realtype) {
  Content* c = Get(s);
  const auto n = c->matrix.rows();
  Eigen::Map<const Eigen::VectorXd> rhs(N_VGetArrayPointer(b), n);
  Eigen::Map<Eigen::VectorXd> sol(N_VGetArrayPointer(x), n);
  sol = c->lu.solve(rhs);
  ++c->stats->solves;
  return SUNLS_SUCCESS;
}

int Free(SUNLinearSolver s) {
  if (!s) return SUNLS_SUCCESS;
  delete Get(s);
  s->content = nullptr;
  SUNLinSolFreeEmpty(s);
  return SUNLS_SUCCESS;
}

}  // namespace

SUNLinearSolver MakeEigenSparseLu(SUNContext ctx, const Matrix& pattern, EigenSolverStats* stats) {
  SUNLinearSolver s = SUNLinSolNewEmpty(ctx);
  if (!s) return nullptr;
  auto* content = new Content;
  content->matrix = pattern;
  content->stats = stats;
  s->content = content;
  s->ops->gettype = GetType;
  s->ops->getid = GetId;
  s->ops->initialize = Initialize;
  s->ops->setup = Setup;
  s->ops->solve = Solve;
  s->ops->free = Free;
  return s;
}

}  // namespace lcc
