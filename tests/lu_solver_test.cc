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
  LuSolver lu(pattern);
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
