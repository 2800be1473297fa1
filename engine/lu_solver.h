// LU factorisation of a square matrix with a fixed sparsity pattern.
//
// Circuit-sized systems are factorised by a left-looking sparse LU written
// here (Gilbert & Peierls, SIAM J. Sci. Stat. Comput. 9(5), 1988; laid out
// in T. A. Davis, "Direct Methods for Sparse Linear Systems", SIAM 2006,
// ch. 6): columns in a fill-reducing order found once from the pattern
// (column approximate minimum degree, COLAMD), each column a sparse triangular
// solve against the L built so far, and partial pivoting (the largest entry
// among the rows not yet pivoted: valve resistances span fifteen decades,
// so the pivot rows change with the switch states).
//
// That search for the pivot rows and the pattern of L and U costs several
// times the arithmetic itself at circuit sizes (54 unknowns, ~1 300
// multiply-adds). But a converter's matrices repeat: the same switch states
// and step sizes come back every cycle. So each factorisation's pivot
// sequence and pattern is kept as a plan, filed under a signature of the
// values (the binary exponent of every entry); a later matrix with the same
// signature is refactorised on that plan, arithmetic only (Davis §6.4,
// "refactorisation"), and the plan is accepted only if every pivot is still
// at least `pivot_threshold` times the largest entry below it (threshold
// pivoting). Otherwise the pivot search runs again from the first step
// whose pivot failed, the steps before it standing, and replaces the plan. A
// matrix under a signature not seen before is first tried on a copy of the
// last plan, with the same check: with many bridges the switch states of
// all of them and the step sizes combine into more signatures than are
// kept, but one step's matrix is mostly the last one's with another step
// size or one valve switched. A matrix identical to the one a plan last
// factorised (the consistency and relaxation matrices after an event
// depend on the switch states alone) takes its factors as they are.
//
// Very large systems (more than `supernodal_above` unknowns) use Eigen's
// supernodal sparse LU, whose symbolic analysis runs on the first
// factorisation only. Factorize() reports a zero or non-finite pivot as
// failure instead of producing infinities.
//
// There is no dense path for small systems: measured on the benchmarks'
// own Jacobians (portable build, no -march), Eigen's dense partial-pivoting
// LU lost at every circuit size, even the smallest. Six-pulse bridge, 14
// unknowns: factorisation 0.71 µs dense against 0.23 µs here on a kept
// plan, solve 0.25 against 0.11 µs. Twelve-pulse, 54 unknowns: 15.0 against
// 1.6 µs, and 1.2 against 0.44 µs.
#pragma once

#include <Eigen/SparseCore>
#include <Eigen/SparseLU>
#include <cstdint>
#include <vector>

namespace lcc {

struct LuOptions {
  // Largest system factorised by the left-looking LU; larger ones go to
  // Eigen's supernodal LU, which pays off only when columns share long
  // dense runs, as they do not in circuits of a few hundred nodes.
  int supernodal_above = 2000;
  // A kept plan is reused only if each pivot is at least this fraction of
  // the largest entry in its column below the diagonal. 1 would mean the
  // very pivots partial pivoting chooses; any τ bounds the growth of an
  // elimination step by 1 + 1/τ (Duff, Erisman & Reid, "Direct Methods for
  // Sparse Matrices", Oxford 1986, §5.4 and §7.8, from memory), and 0.001
  // is the tolerance a circuit-oriented sparse LU uses by default (Davis &
  // Palamadai Natarajan, ACM TOMS 37(3), 2010, from memory). At 1 the plans
  // were refused on near-ties (most refusals had the old pivot above half
  // the largest entry: rounding decided) and the 48-pulse benchmark
  // refactorised on a kept plan in 4 of 15 131 factorisations; at 0.001 in
  // 13 103, the run 1.6 s → 0.9 s, its waveform equal to the strict run's
  // after the first half-cycle (1e-4 of full scale in it: another, equally
  // valid, path through the start).
  double pivot_threshold = 1e-3;
  // Plans kept per solver (least recently used replaced first).
  int max_plans = 128;
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
  // x = A⁻ᵀ·c for the last factorised A (x and c may alias): the same
  // factors used the other way round, for one row of A⁻¹ at a time.
  void SolveTransposed(const double* c, double* x);

  bool supernodal() const { return supernodal_; }
  long analyses() const { return analyses_; }
  // Left-looking path: factorisations that found their pivots afresh, and
  // those that reused a kept plan.
  long full_factorizations() const { return full_; }
  long refactorizations() const { return refactored_; }
  // Factorisations under a new signature that the last plan's pivots still
  // suited (refactorised on a copy of it, then kept under the new one).
  long borrowed_factorizations() const { return borrowed_; }
  // Of the full factorisations, those that kept the steps a refused plan
  // had factorised before its first failing pivot.
  long resumed_factorizations() const { return resumed_; }
  // Factorisations of a matrix equal to the one a kept plan last factorised:
  // its factors are used again as they are.
  long reused_factorizations() const { return reused_; }

 private:
  // A pivot sequence with the pattern of L and U it gives, and the values
  // of its last factorisation. P·A·Q = L·U, L unit lower triangular; rows of
  // L and U are pivot steps.
  struct Plan {
    std::uint64_t signature = 0;
    long last_used = 0;
    std::vector<int> pivot_step;  // row i of A is pivot row pivot_step[i]
    std::vector<int> lower_start, lower_rows, upper_start, upper_rows;
    // U's diagonal is kept inverted: the back substitution is a chain, each
    // step waiting for the one before, and a multiplication is several
    // times shorter than a division on it.
    std::vector<double> lower_values, upper_values, inverse_diagonal;
    std::vector<double> matrix;  // the values of A factorised
  };

  // A plan's factors as raw arrays, for the triangular solves' inner loops.
  struct Factors {
    const int* pivot_step;
    const int* lower_start;
    const int* lower_rows;
    const double* lower_values;
    const int* upper_start;
    const int* upper_rows;
    const double* upper_values;
    const double* inverse_diagonal;
  };
  static Factors FactorsOf(const Plan& plan);

  std::uint64_t Signature(const double* values) const;
  // Finds the pivots and the pattern afresh from step `from` on; the steps
  // before it are kept as the plan holds them (a refactorisation that
  // failed at `from` left them computed for these values).
  bool FactorizeFully(const double* values, Plan& plan, int from = 0);
  // Arithmetic only, on the plan's pattern. Returns n if every pivot passed
  // the check, else the first step whose pivot did not (the steps before
  // it are factorised).
  int Refactorize(const double* values, Plan& plan);
  // The pattern and pivots of `from` into `to`, values sized but not copied.
  void CopyPattern(const Plan& from, Plan& to);
  // Rows reachable from the non-zeros of column `col` of A through the
  // columns of L built so far, written to stack_[top..n) in topological
  // order; returns top.
  int Reach(int col, const Plan& plan);

  int n_ = 0;
  bool supernodal_ = false;
  SparseMatrix sparse_;
  long analyses_ = 0;

  // Supernodal path.
  Eigen::SparseLU<SparseMatrix, Eigen::COLAMDOrdering<int>> sparse_lu_;
  bool analyzed_ = false;

  // Left-looking path.
  LuOptions options_;
  std::vector<int> column_order_;  // step k eliminates column column_order_[k] of A
  std::vector<Plan> plans_;
  int active_ = -1;                // the plan of the last successful factorisation
  long clock_ = 0, full_ = 0, refactored_ = 0, reused_ = 0, borrowed_ = 0, resumed_ = 0;
  // Scratch: the dense column being solved, the DFS stacks and visit marks.
  std::vector<double> x_;
  std::vector<int> stack_, dfs_, next_edge_, mark_;
  int stamp_ = 0;
  Eigen::VectorXd work_;
};

}  // namespace lcc
