// The LU used for IDA's Newton systems and the consistency solves, against
// Eigen's full-pivoting LU (a general-purpose reference), on MNA-like
// matrices whose entries span many decades as valve resistances do.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <random>

#include "engine/lu_solver.h"

namespace lcc {
namespace {

// A sparse matrix with a non-zero diagonal and a few off-diagonal entries,
// scaled column by column over `decades` decades.
LuSolver::SparseMatrix MakeMatrix(int n, double decades, unsigned seed) {
  std::mt19937 gen(seed);
  std::uniform_real_distribution<double> u(-1.0, 1.0);
  std::vector<Eigen::Triplet<double, int>> t;
  for (int j = 0; j < n; ++j) {
    const double scale = std::pow(10.0, decades * (j % 5) / 4.0 - decades / 2);
    t.emplace_back(j, j, (2.0 + u(gen)) * scale);
    for (int k = 0; k < 3; ++k) t.emplace_back((j * 7 + k * 3 + 1) % n, j, u(gen) * scale);
  }
  LuSolver::SparseMatrix m(n, n);
  m.setFromTriplets(t.begin(), t.end());
  m.makeCompressed();
  return m;
}

void CheckAgainstReference(int n, int supernodal_above) {
  auto m = MakeMatrix(n, 12.0, 42u + n);
  LuSolver lu(m, LuOptions{supernodal_above});
  REQUIRE(lu.supernodal() == (n > supernodal_above));
  REQUIRE(lu.Factorize(m.valuePtr()));
  Eigen::VectorXd b = Eigen::VectorXd::LinSpaced(n, -1.0, 2.0);
  Eigen::VectorXd x(n);
  lu.Solve(b.data(), x.data());
  const Eigen::MatrixXd dense(m);
  const Eigen::VectorXd reference = dense.fullPivLu().solve(b);
  // Backward error, as LAPACK reports it: ‖A·x − b‖ / (‖A‖·‖x‖) near machine precision.
  const double backward = (dense * x - b).norm() / (dense.norm() * x.norm());
  INFO("n = " << n << ", backward error " << backward);
  REQUIRE(backward < 1e-13);
  REQUIRE((x - reference).norm() <= 1e-6 * reference.norm());
  // The transposed solve on the same factors, judged the same way against Aᵀ.
  Eigen::VectorXd xt(n);
  lu.SolveTransposed(b.data(), xt.data());
  const Eigen::MatrixXd dense_t = dense.transpose();
  const double backward_t = (dense_t * xt - b).norm() / (dense_t.norm() * xt.norm());
  INFO("transposed: backward error " << backward_t);
  REQUIRE(backward_t < 1e-13);
  REQUIRE((xt - dense_t.fullPivLu().solve(b)).norm() <= 1e-6 * xt.norm());
}

TEST_CASE("BothLuPathsAgreeWithAFullPivotingReference", "[lu]") {
  // Solve and SolveTransposed, dense and sparse, square systems of 1..300.
  for (int n : {1, 5, 20, 64, 300}) CheckAgainstReference(n, 2000);  // left-looking
  for (int n : {20, 120}) CheckAgainstReference(n, 8);               // supernodal
}

TEST_CASE("TheLeftLookingLuRepivotsWhenTheValuesChangeByDecades", "[lu]") {
  // A valve switching moves an entry by ten decades: the pivot rows of the
  // last factorisation may no longer be acceptable, and must not be reused.
  auto m = MakeMatrix(40, 6.0, 11u);
  LuSolver lu(m);
  const Eigen::VectorXd b = Eigen::VectorXd::LinSpaced(40, 1.0, 3.0);
  for (int round = 0; round < 4; ++round) {
    for (int k = round; k < m.nonZeros(); k += 7) m.valuePtr()[k] *= (round % 2 ? 1e-10 : 1e10);
    REQUIRE(lu.Factorize(m.valuePtr()));
    Eigen::VectorXd x(40);
    lu.Solve(b.data(), x.data());
    const Eigen::MatrixXd dense(m);
    const double backward = (dense * x - b).norm() / (dense.norm() * x.norm());
    INFO("round " << round << ", backward error " << backward);
    REQUIRE(backward < 1e-13);
  }
}

TEST_CASE("RefactorisingWithNewValuesReusesThePattern", "[lu]") {
  auto m = MakeMatrix(30, 6.0, 7u);
  for (int supernodal_above : {8, 2000}) {
    LuSolver lu(m, LuOptions{supernodal_above});
    REQUIRE(lu.Factorize(m.valuePtr()));
    for (int k = 0; k < m.nonZeros(); ++k) m.valuePtr()[k] *= 1.0 + 0.1 * (k % 3);
    REQUIRE(lu.Factorize(m.valuePtr()));
    REQUIRE(lu.analyses() == 1);  // the symbolic analysis (ordering) ran once
  }
}

TEST_CASE("AKeptPivotPlanIsReusedOnlyWhileItsPivotsAreStillTheLargest", "[lu]") {
  // [[a, 1], [c, −1]]: partial pivoting takes the larger of |a| and |c|.
  // Both pairs below share the binary exponents of their entries (all in
  // [1, 2)), hence the signature under which plans are kept; only the
  // second keeps the first's pivot row.
  auto solve = [](LuSolver& lu, double a, double c) {
    LuSolver::SparseMatrix m(2, 2);
    std::vector<Eigen::Triplet<double, int>> t{{0, 0, a}, {1, 0, c}, {0, 1, 1.0}, {1, 1, -1.0}};
    m.setFromTriplets(t.begin(), t.end());
    m.makeCompressed();
    REQUIRE(lu.Factorize(m.valuePtr()));
    const Eigen::Vector2d b(1.0, -1.0);
    Eigen::Vector2d x;
    lu.Solve(b.data(), x.data());
    const Eigen::Matrix2d dense(m);
    REQUIRE((dense * x - b).norm() <= 1e-15 * dense.norm() * x.norm());
  };
  LuSolver::SparseMatrix pattern(2, 2);
  pattern.setIdentity();
  pattern.coeffRef(1, 0) = pattern.coeffRef(0, 1) = 1.0;
  LuSolver lu(pattern, LuOptions{.pivot_threshold = 1.0});  // strict: the pivots partial pivoting would choose
  solve(lu, 1.0, 1.5);  // pivot on row 1
  REQUIRE(lu.full_factorizations() == 1);
  solve(lu, 1.1, 1.7);  // row 1 still the larger: the plan is reused
  REQUIRE(lu.refactorizations() == 1);
  solve(lu, 1.9, 1.2);  // row 0 now larger: the plan is refused and redone
  REQUIRE(lu.full_factorizations() == 2);
  REQUIRE(lu.refactorizations() == 1);
  solve(lu, 1.9, 1.2);  // the same matrix again: its factors are taken as they are
  REQUIRE(lu.reused_factorizations() == 1);
  REQUIRE(lu.full_factorizations() == 2);
}

TEST_CASE("ANewSignatureBorrowsTheLastPlanWhileItsPivotsPassTheThreshold", "[lu]") {
  // The same decade-spanning matrix with every entry scaled by 2.5 to 3.5:
  // every binary exponent moves, so the signature is new, but no entry moves
  // against another by more than 1.4, so the old pivots stay far above
  // the threshold's 0.001 of their columns. Threshold pivoting allows some
  // growth where partial pivoting allows none beyond a factor of 2 a step
  // (Duff, Erisman & Reid, Direct Methods for Sparse Matrices, Oxford
  // 1986, §5.4, from memory): the backward error is held to 1e-12, ten
  // times the partial-pivoting check above.
  const int n = 64;
  LuSolver::SparseMatrix m = MakeMatrix(n, 12.0, 7u);
  LuSolver lu(m);
  REQUIRE(lu.Factorize(m.valuePtr()));
  std::mt19937 gen(11u);
  std::uniform_real_distribution<double> factor(2.5, 3.5);
  for (int p = 0; p < m.nonZeros(); ++p) m.valuePtr()[p] *= factor(gen);
  REQUIRE(lu.Factorize(m.valuePtr()));
  REQUIRE(lu.borrowed_factorizations() == 1);
  REQUIRE(lu.full_factorizations() == 1);
  const Eigen::VectorXd b = Eigen::VectorXd::LinSpaced(n, -1.0, 2.0);
  Eigen::VectorXd x(n);
  lu.Solve(b.data(), x.data());
  const Eigen::MatrixXd dense(m);
  REQUIRE((dense * x - b).norm() / (dense.norm() * x.norm()) < 1e-12);

  // [[a, 1], [c, −1]] pivoted on row 1 (c = 1.5 > a = 1), then with
  // c = 1e−4 and a = 3 (new exponents, a new signature): the old pivot is
  // 3·10⁻⁵ of its column's largest entry, below the threshold, so the
  // borrowed plan is refused and the pivots are found afresh.
  auto two = [](double a, double c) {
    LuSolver::SparseMatrix t(2, 2);
    std::vector<Eigen::Triplet<double, int>> e{{0, 0, a}, {1, 0, c}, {0, 1, 1.0}, {1, 1, -1.0}};
    t.setFromTriplets(e.begin(), e.end());
    t.makeCompressed();
    return t;
  };
  LuSolver small(two(1.0, 1.5));
  REQUIRE(small.Factorize(two(1.0, 1.5).valuePtr()));
  const LuSolver::SparseMatrix refused = two(3.0, 1e-4);
  REQUIRE(small.Factorize(refused.valuePtr()));
  REQUIRE(small.borrowed_factorizations() == 0);
  REQUIRE(small.full_factorizations() == 2);
  const Eigen::Vector2d b2(1.0, -1.0);
  Eigen::Vector2d x2;
  small.Solve(b2.data(), x2.data());
  const Eigen::Matrix2d d2(refused);
  REQUIRE((d2 * x2 - b2).norm() <= 1e-15 * d2.norm() * x2.norm());
}

TEST_CASE("ARefusedPlanIsResumedFromItsFirstFailingPivot", "[lu]") {
  // One diagonal entry at a time made a billion times smaller: a new
  // signature, so the last plan is tried; where that entry was its
  // column's pivot the check refuses it at that column's step, and the
  // pivot search resumes there, keeping the steps before. Every solve is
  // held to the backward error of the partial-pivoting check above
  // (1e-13) times ten, as threshold pivoting allows some growth.
  const int n = 64;
  const LuSolver::SparseMatrix base = MakeMatrix(n, 12.0, 5u);
  LuSolver lu(base);
  REQUIRE(lu.Factorize(base.valuePtr()));
  const Eigen::VectorXd b = Eigen::VectorXd::LinSpaced(n, -1.0, 2.0);
  for (int j = 0; j < n; ++j) {
    LuSolver::SparseMatrix m = base;
    m.coeffRef(j, j) *= 1e-9;
    REQUIRE(lu.Factorize(m.valuePtr()));
    Eigen::VectorXd x(n);
    lu.Solve(b.data(), x.data());
    const Eigen::MatrixXd dense(m);
    INFO("column " << j);
    REQUIRE((dense * x - b).norm() / (dense.norm() * x.norm()) < 1e-12);
  }
  // The resumed path was taken (not only refusals at the first step).
  REQUIRE(lu.resumed_factorizations() > 0);
}

TEST_CASE("AStructurallySingularMatrixIsReported", "[lu]") {
  LuSolver::SparseMatrix m(3, 3);
  std::vector<Eigen::Triplet<double, int>> t{{0, 0, 1.0}, {1, 1, 0.0}, {2, 2, 1.0}, {1, 0, 0.0}};
  m.setFromTriplets(t.begin(), t.end());
  m.makeCompressed();
  LuSolver left_looking(m);
  REQUIRE_FALSE(left_looking.Factorize(m.valuePtr()));
  // A zero pivot is refused, and the solver factorises a good matrix afterwards.
  m.coeffRef(1, 1) = 2.0;
  REQUIRE(left_looking.Factorize(m.valuePtr()));
}

}  // namespace
}  // namespace lcc
