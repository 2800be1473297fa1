#include "engine/eigen_linear_solver.h"

#include <sunmatrix/sunmatrix_sparse.h>

#include <algorithm>
#include <memory>

#include "engine/lu_solver.h"

namespace lcc {
namespace {

using Matrix = Eigen::SparseMatrix<double, Eigen::ColMajor, int>;

struct Content {
  std::unique_ptr<LuSolver> lu;
  long nonzeros = 0;
  EigenSolverStats* stats = nullptr;
};

Content* Get(SUNLinearSolver s) { return static_cast<Content*>(s->content); }

SUNLinearSolver_Type GetType(SUNLinearSolver) { return SUNLINEARSOLVER_DIRECT; }
SUNLinearSolver_ID GetId(SUNLinearSolver) { return SUNLINEARSOLVER_CUSTOM; }
int Initialize(SUNLinearSolver) { return SUNLS_SUCCESS; }

int Setup(SUNLinearSolver s, SUNMatrix a) {
  Content* c = Get(s);
  // The Jacobian function wrote exactly our pattern, so values line up.
  const bool ok = c->lu->Factorize(SM_DATA_S(a));
  ++c->stats->setups;
  c->stats->analyses = c->lu->analyses();
  c->stats->reused_plans = c->lu->refactorizations() + c->lu->borrowed_factorizations() + c->lu->reused_factorizations();
  if (!ok) {
    ++c->stats->singular;
    return SUNLS_LUFACT_FAIL;  // positive: IDA may recover with a smaller step
  }
  return SUNLS_SUCCESS;
}

int Solve(SUNLinearSolver s, SUNMatrix, N_Vector x, N_Vector b, realtype) {
  Content* c = Get(s);
  c->lu->Solve(N_VGetArrayPointer(b), N_VGetArrayPointer(x));
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

SUNLinearSolver MakeEigenLu(SUNContext ctx, const Matrix& pattern, const LuOptions& options,
                            EigenSolverStats* stats) {
  SUNLinearSolver s = SUNLinSolNewEmpty(ctx);
  if (!s) return nullptr;
  auto* content = new Content;
  content->lu = std::make_unique<LuSolver>(pattern, options);
  stats->supernodal = content->lu->supernodal();
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
