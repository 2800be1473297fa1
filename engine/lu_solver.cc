#include "engine/lu_solver.h"

#include <Eigen/OrderingMethods>
#include <algorithm>
#include <cmath>
#include <cstring>

namespace lcc {

LuSolver::LuSolver(const SparseMatrix& pattern, const LuOptions& options)
    : n_(static_cast<int>(pattern.rows())),
      supernodal_(pattern.rows() > options.supernodal_above),
      sparse_(pattern),
      options_(options) {
  sparse_.makeCompressed();
  work_.resize(n_);
  if (supernodal_) return;
  // The column order is the symbolic analysis of this path: done here, once.
  // Partial pivoting picks the rows as the values come, so the order must
  // keep the fill small whatever rows it picks. COLAMD does: it orders the
  // columns for a sparse Cholesky factor of AᵀA, whose pattern contains
  // those of L and U under any row interchanges (George & Ng, SIAM J. Sci.
  // Stat. Comput. 8(6), 1987; Davis, Gilbert, Larimore & Ng, ACM TOMS
  // 30(3), 2004). A symmetric order (AMD on A + Aᵀ) assumes pivots on the
  // diagonal, where the valves' fifteen decades do not leave them: on the
  // pulse benchmarks it gave L and U 587 entries against COLAMD's 394 (12
  // pulses, 54 unknowns) and 6 009 against 2 916 (48 pulses, 247 unknowns).
  // Eigen's permutation maps old index j to new position indices()(j);
  // the elimination needs the inverse, position → column.
  Eigen::PermutationMatrix<Eigen::Dynamic, Eigen::Dynamic, int> permutation;
  Eigen::COLAMDOrdering<int>()(sparse_, permutation);
  column_order_.assign(n_, 0);
  for (int j = 0; j < n_; ++j) column_order_[permutation.indices()(j)] = j;
  ++analyses_;
  plans_.reserve(std::max(1, options_.max_plans));
  x_.assign(n_, 0.0);
  stack_.assign(n_, 0);
  dfs_.assign(n_, 0);
  next_edge_.assign(n_, 0);
  mark_.assign(n_, 0);
}

bool LuSolver::Factorize(const double* values) {
  if (supernodal_) {
    std::copy(values, values + sparse_.nonZeros(), sparse_.valuePtr());
    if (!analyzed_) {
      sparse_lu_.analyzePattern(sparse_);
      analyzed_ = true;
      ++analyses_;
    }
    sparse_lu_.factorize(sparse_);
    return sparse_lu_.info() == Eigen::Success;
  }
  const std::uint64_t signature = Signature(values);
  int slot = -1;
  for (int i = 0; i < static_cast<int>(plans_.size()); ++i)
    if (plans_[i].signature == signature) slot = i;
  const std::size_t bytes = sizeof(double) * static_cast<std::size_t>(sparse_.nonZeros());
  if (slot >= 0 && std::memcmp(plans_[slot].matrix.data(), values, bytes) == 0) {
    ++reused_;  // the very matrix factorised before (same switch states, same step): nothing to do
    plans_[slot].last_used = ++clock_;
    active_ = slot;
    return true;
  }
  // Where the factorisation must find pivots afresh: 0 for all of it, or
  // the first step whose kept pivot failed the check (the steps before it
  // are factorised already, on the kept plan's pattern).
  int search_from = 0;
  bool done = false;
  if (slot >= 0) {
    search_from = Refactorize(values, plans_[slot]);
    done = search_from == n_;
    if (done) ++refactored_;
  } else {
    if (static_cast<int>(plans_.size()) < std::max(1, options_.max_plans)) {
      slot = static_cast<int>(plans_.size());
      plans_.emplace_back();
    } else {
      slot = static_cast<int>(std::min_element(plans_.begin(), plans_.end(),
                                               [](const Plan& a, const Plan& b) { return a.last_used < b.last_used; }) -
                              plans_.begin());
    }
    // A new signature is most often the last matrix with another step
    // size, or with one valve switched: the last plan's pivots are then
    // usually still acceptable, and the pivot check says whether they are.
    // Tried on a copy of its pattern, so that the last plan stays intact.
    if (active_ >= 0 && active_ != slot) {
      CopyPattern(plans_[active_], plans_[slot]);
      search_from = Refactorize(values, plans_[slot]);
      done = search_from == n_;
      if (done) ++borrowed_;
    }
  }
  if (!done) {
    ++full_;
    if (search_from > 0) ++resumed_;
    if (!FactorizeFully(values, plans_[slot], search_from)) {
      plans_[slot].signature = 0;  // nothing worth keeping
      plans_[slot].last_used = 0;
      active_ = -1;
      return false;
    }
  }
  plans_[slot].signature = signature;
  plans_[slot].matrix.assign(values, values + sparse_.nonZeros());
  plans_[slot].last_used = ++clock_;
  active_ = slot;
  return true;
}

std::uint64_t LuSolver::Signature(const double* values) const {
  // FNV-1a over the sign-less binary exponent of each entry: matrices that
  // differ only within a factor of two entry by entry share it.
  std::uint64_t h = 1469598103934665603ull;
  for (int p = 0; p < sparse_.nonZeros(); ++p) {
    std::uint64_t bits;
    std::memcpy(&bits, &values[p], sizeof bits);
    h = (h ^ ((bits >> 52) & 0x7ff)) * 1099511628211ull;
  }
  return h | 1;  // never 0, which marks an empty plan
}

void LuSolver::CopyPattern(const Plan& from, Plan& to) {
  // Refactorize writes every value; only the sizes must match.
  to.pivot_step = from.pivot_step;
  to.lower_start = from.lower_start;
  to.lower_rows = from.lower_rows;
  to.upper_start = from.upper_start;
  to.upper_rows = from.upper_rows;
  to.lower_values.resize(from.lower_values.size());
  to.upper_values.resize(from.upper_values.size());
  to.inverse_diagonal.resize(from.inverse_diagonal.size());
}

int LuSolver::Reach(int col, const Plan& plan) {
  // Depth-first search without recursion (Davis, §3.2): a row that is
  // already pivoted leads on to the rows of its column of L; a row not yet
  // pivoted is a leaf. Rows finish in reverse topological order, so they
  // are pushed onto stack_ from the top down.
  if (++stamp_ == 0) {  // after 2³² columns the marks wrap: clear them once
    std::fill(mark_.begin(), mark_.end(), 0);
    stamp_ = 1;
  }
  const int* outer = sparse_.outerIndexPtr();
  const int* inner = sparse_.innerIndexPtr();
  const int* step_of = plan.pivot_step.data();
  const int* lower_start = plan.lower_start.data();
  const int* lower_rows = plan.lower_rows.data();
  int top = n_;
  for (int p = outer[col]; p < outer[col + 1]; ++p) {
    const int start = inner[p];
    if (mark_[start] == stamp_) continue;
    int depth = 0;
    dfs_[0] = start;
    mark_[start] = stamp_;
    next_edge_[start] = step_of[start] >= 0 ? lower_start[step_of[start]] : 0;
    while (depth >= 0) {
      const int row = dfs_[depth];
      const int step = step_of[row];
      bool descended = false;
      if (step >= 0) {
        const int end = lower_start[step + 1];
        for (int q = next_edge_[row]; q < end; ++q) {
          const int child = lower_rows[q];
          if (mark_[child] == stamp_) continue;
          next_edge_[row] = q + 1;  // resume here when the child is done
          mark_[child] = stamp_;
          next_edge_[child] = step_of[child] >= 0 ? lower_start[step_of[child]] : 0;
          dfs_[++depth] = child;
          descended = true;
          break;
        }
      }
      if (!descended) {
        stack_[--top] = row;
        --depth;
      }
    }
  }
  return top;
}

bool LuSolver::FactorizeFully(const double* values, Plan& plan, int from) {
  const int* outer = sparse_.outerIndexPtr();
  const int* inner = sparse_.innerIndexPtr();
  if (from <= 0) {
    from = 0;
    plan.pivot_step.assign(n_, -1);
    plan.lower_start.assign(n_ + 1, 0);
    plan.upper_start.assign(n_ + 1, 0);
    plan.inverse_diagonal.assign(n_, 0.0);
    plan.lower_rows.clear();
    plan.lower_values.clear();
    plan.upper_rows.clear();
    plan.upper_values.clear();
  } else {
    // Steps before `from` stand (Refactorize computed them on this plan).
    // The search works on rows of A, a finished plan on pivot steps: L's
    // rows so far go back to rows of A, and the rows pivoted from `from` on
    // are free again. U's rows so far are steps before `from`, unchanged.
    std::vector<int>& row_of_step = dfs_;  // scratch until the search below uses it
    for (int i = 0; i < n_; ++i) row_of_step[plan.pivot_step[i]] = i;
    const int lower_end = plan.lower_start[from];
    for (int q = 0; q < lower_end; ++q) plan.lower_rows[q] = row_of_step[plan.lower_rows[q]];
    for (int& step : plan.pivot_step)
      if (step >= from) step = -1;
    plan.lower_rows.resize(lower_end);
    plan.lower_values.resize(lower_end);
    plan.upper_rows.resize(plan.upper_start[from]);
    plan.upper_values.resize(plan.upper_start[from]);
  }
  for (int k = from; k < n_; ++k) {
    const int col = column_order_[k];
    plan.lower_start[k] = static_cast<int>(plan.lower_rows.size());
    plan.upper_start[k] = static_cast<int>(plan.upper_rows.size());
    // x = L⁻¹·A(:, col) over the reach only; x_ is zero elsewhere.
    const int top = Reach(col, plan);
    for (int p = outer[col]; p < outer[col + 1]; ++p) x_[inner[p]] = values[p];
    for (int p = top; p < n_; ++p) {
      const int row = stack_[p];
      const int step = plan.pivot_step[row];
      if (step < 0) continue;
      const double xr = x_[row];
      if (xr == 0.0) continue;
      for (int q = plan.lower_start[step]; q < plan.lower_start[step + 1]; ++q)
        x_[plan.lower_rows[q]] -= plan.lower_values[q] * xr;
    }
    // Entries on pivoted rows belong to U (kept in the topological order,
    // which a refactorisation follows); the largest of the others is the pivot.
    int pivot_row = -1;
    double largest = -1.0;
    for (int p = top; p < n_; ++p) {
      const int row = stack_[p];
      if (plan.pivot_step[row] >= 0) {
        plan.upper_rows.push_back(plan.pivot_step[row]);
        plan.upper_values.push_back(x_[row]);
      } else if (std::abs(x_[row]) > largest) {
        largest = std::abs(x_[row]);
        pivot_row = row;
      }
    }
    // Valve resistances span fifteen decades, so a tiny pivot relative to
    // others is normal; only an exact zero (a structural singularity the
    // topology checks missed) or a non-finite value is a failure.
    if (pivot_row < 0 || !std::isfinite(largest) || largest <= 1e-300) {
      for (int p = top; p < n_; ++p) x_[stack_[p]] = 0.0;
      return false;
    }
    const double pivot = x_[pivot_row];
    plan.pivot_step[pivot_row] = k;
    const double inverse = 1.0 / pivot;
    plan.inverse_diagonal[k] = inverse;
    for (int p = top; p < n_; ++p) {
      const int row = stack_[p];
      if (plan.pivot_step[row] < 0) {  // rows of L keep their row of A until every pivot is known
        plan.lower_rows.push_back(row);
        plan.lower_values.push_back(x_[row] * inverse);
      }
      x_[row] = 0.0;
    }
  }
  plan.lower_start[n_] = static_cast<int>(plan.lower_rows.size());
  plan.upper_start[n_] = static_cast<int>(plan.upper_rows.size());
  for (int& row : plan.lower_rows) row = plan.pivot_step[row];
  return true;
}

int LuSolver::Refactorize(const double* values, Plan& plan) {
  // The same left-looking elimination on a known pattern, x_ indexed by
  // pivot step: no search, only the arithmetic and the pivot check.
  const int* outer = sparse_.outerIndexPtr();
  const int* inner = sparse_.innerIndexPtr();
  const int* step_of = plan.pivot_step.data();
  const int* lower_start = plan.lower_start.data();
  const int* lower_rows = plan.lower_rows.data();
  double* lower_values = plan.lower_values.data();
  double* x = x_.data();
  const double threshold = options_.pivot_threshold;
  for (int k = 0; k < n_; ++k) {
    const int col = column_order_[k];
    for (int p = outer[col]; p < outer[col + 1]; ++p) x[step_of[inner[p]]] = values[p];
    for (int q = plan.upper_start[k]; q < plan.upper_start[k + 1]; ++q) {
      const int s = plan.upper_rows[q];
      const double u = x[s];
      x[s] = 0.0;
      plan.upper_values[q] = u;
      if (u == 0.0) continue;
      for (int r = lower_start[s]; r < lower_start[s + 1]; ++r) x[lower_rows[r]] -= lower_values[r] * u;
    }
    const double pivot = x[k];
    x[k] = 0.0;
    double largest = 0.0;
    for (int r = lower_start[k]; r < lower_start[k + 1]; ++r) largest = std::max(largest, std::abs(x[lower_rows[r]]));
    const bool acceptable = std::isfinite(pivot) && std::abs(pivot) > 1e-300 && std::isfinite(largest) &&
                            std::abs(pivot) >= threshold * largest;
    const double inverse = 1.0 / pivot;
    for (int r = lower_start[k]; r < lower_start[k + 1]; ++r) {
      lower_values[r] = x[lower_rows[r]] * inverse;
      x[lower_rows[r]] = 0.0;
    }
    if (!acceptable) return k;  // x_ is clean: this column's entries were all cleared
    plan.inverse_diagonal[k] = inverse;
  }
  return n_;
}

LuSolver::Factors LuSolver::FactorsOf(const Plan& plan) {
  return {plan.pivot_step.data(), plan.lower_start.data(), plan.lower_rows.data(),   plan.lower_values.data(),
          plan.upper_start.data(), plan.upper_rows.data(),  plan.upper_values.data(), plan.inverse_diagonal.data()};
}

void LuSolver::Solve(const double* b, double* x) {
  if (supernodal_) {
    work_ = Eigen::Map<const Eigen::VectorXd>(b, n_);
    Eigen::Map<Eigen::VectorXd>(x, n_) = sparse_lu_.solve(work_);
    return;
  }
  // P·A·Q = L·U: w = P·b, w ← L⁻¹·w, w ← U⁻¹·w, x = Q·w.
  const Factors f = FactorsOf(plans_[active_]);
  double* w = work_.data();
  for (int i = 0; i < n_; ++i) w[f.pivot_step[i]] = b[i];
  for (int k = 0; k < n_; ++k) {
    const double wk = w[k];
    if (wk == 0.0) continue;
    for (int q = f.lower_start[k]; q < f.lower_start[k + 1]; ++q) w[f.lower_rows[q]] -= f.lower_values[q] * wk;
  }
  for (int k = n_ - 1; k >= 0; --k) {
    const double wk = (w[k] *= f.inverse_diagonal[k]);
    if (wk == 0.0) continue;
    for (int q = f.upper_start[k]; q < f.upper_start[k + 1]; ++q) w[f.upper_rows[q]] -= f.upper_values[q] * wk;
  }
  for (int k = 0; k < n_; ++k) x[column_order_[k]] = w[k];
}

void LuSolver::SolveTransposed(const double* c, double* x) {
  if (supernodal_) {
    work_ = Eigen::Map<const Eigen::VectorXd>(c, n_);
    Eigen::Map<Eigen::VectorXd>(x, n_) = sparse_lu_.transpose().solve(work_);
    return;
  }
  // Aᵀ = Q·Uᵀ·Lᵀ·P: w = Qᵀ·c, w ← U⁻ᵀ·w, w ← L⁻ᵀ·w, x = Pᵀ·w. A column of
  // U or L is a row of its transpose, so each step is a dot product.
  const Factors f = FactorsOf(plans_[active_]);
  double* w = work_.data();
  for (int k = 0; k < n_; ++k) w[k] = c[column_order_[k]];
  for (int k = 0; k < n_; ++k) {
    double sum = w[k];
    for (int q = f.upper_start[k]; q < f.upper_start[k + 1]; ++q) sum -= f.upper_values[q] * w[f.upper_rows[q]];
    w[k] = sum * f.inverse_diagonal[k];
  }
  for (int k = n_ - 1; k >= 0; --k) {
    double sum = w[k];
    for (int q = f.lower_start[k]; q < f.lower_start[k + 1]; ++q) sum -= f.lower_values[q] * w[f.lower_rows[q]];
    w[k] = sum;
  }
  for (int i = 0; i < n_; ++i) x[i] = w[f.pivot_step[i]];
}

}  // namespace lcc
