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

void CheckAgainstReference(int n, int dense_limit) {
  auto m = MakeMatrix(n, 12.0, 42u + n);
  LuSolver lu(m, LuOptions{dense_limit});
  REQUIRE(lu.dense() == (n <= dense_limit));
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
}

TEST_CASE("DenseAndSparseLuAgreeWithAFullPivotingReference", "[lu]") {
  for (int n : {5, 20, 64}) CheckAgainstReference(n, 64);   // dense path
  for (int n : {20, 120}) CheckAgainstReference(n, 8);      // sparse path
}

TEST_CASE("RefactorisingWithNewValuesReusesThePattern", "[lu]") {
  auto m = MakeMatrix(30, 6.0, 7u);
  LuSolver lu(m, LuOptions{8});
  REQUIRE(lu.Factorize(m.valuePtr()));
  for (int k = 0; k < m.nonZeros(); ++k) m.valuePtr()[k] *= 1.0 + 0.1 * (k % 3);
  REQUIRE(lu.Factorize(m.valuePtr()));
  REQUIRE(lu.analyses() == 1);  // the symbolic analysis ran once
}

TEST_CASE("AStructurallySingularMatrixIsReported", "[lu]") {
  LuSolver::SparseMatrix m(3, 3);
  std::vector<Eigen::Triplet<double, int>> t{{0, 0, 1.0}, {1, 1, 0.0}, {2, 2, 1.0}, {1, 0, 0.0}};
  m.setFromTriplets(t.begin(), t.end());
  m.makeCompressed();
  LuSolver dense(m, LuOptions{64});
  REQUIRE_FALSE(dense.Factorize(m.valuePtr()));
}

}  // namespace
}  // namespace lcc
