// Shooting-Newton for the periodic steady state (engine/shooting.h): the
// solver on maps whose fixed points are known, and the engine's `steady
// method = shooting` on a circuit whose slow DC-side time constant makes
// plain simulation wait hundreds of cycles.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <numbers>

#include "engine/shooting.h"
#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

TEST_CASE("ShootingFindsTheFixedPointOfAnAffineMapInOneNewtonStep", "[shooting]") {
  // P(z) = A·z + b: F(z) = (A − I)·z + b is linear, so one Newton step
  // whose linear solve is exact lands on z* = (I − A)⁻¹·b, computed here by
  // Eigen's LU as the reference. A's three eigenvalues are distinct, so the
  // Krylov solve needs all three directions (GMRES terminates at the degree
  // of the minimal polynomial: Saad, Iterative Methods for Sparse Linear
  // Systems, 2nd ed., SIAM 2003, §6.5).
  Eigen::MatrixXd a(3, 3);
  a << 0.9, 0.05, 0.0, -0.1, 0.95, 0.02, 0.0, 0.3, 0.5;  // slow modes, as a converter's DC side
  const Eigen::Vector3d b(1.0, -2.0, 0.5);
  const Eigen::VectorXd expected = (Eigen::Matrix3d::Identity() - a).partialPivLu().solve(b);
  const PeriodMap map = [&](const Eigen::VectorXd& z, Eigen::VectorXd* end) {
    *end = a * z + b;
    return true;
  };
  const Eigen::VectorXd weights = Eigen::VectorXd::Constant(3, 1e-9);
  const ShootingResult r = SolvePeriodicState(map, Eigen::VectorXd::Zero(3), weights, Eigen::VectorXd::Ones(3));
  REQUIRE(r.converged);
  REQUIRE(r.iterations == 1);
  REQUIRE(r.periods == 1 + 3 + 1);  // the start, three directions, the step
  REQUIRE(r.end_evaluation == 4);   // the step's period
  REQUIRE((r.z_end - expected).norm() < 1e-9);
}

TEST_CASE("ShootingPaysAPeriodPerSlowModeNotPerState", "[shooting]") {
  // Twenty states, of which a period damps all but two completely: A =
  // Q·diag(0.95, 0.8, 0, …, 0)·Q⁻¹, as a converter's period map damps its
  // fast modes and keeps its DC-side L/R and regulator modes. J = A − I then
  // has three distinct eigenvalues (−0.05, −0.2, −1), so the Krylov solve
  // ends after three directions (Saad, 2nd ed., §6.5) where a finite-
  // difference Jacobian takes twenty periods. The fixed point is checked
  // against (I − A)⁻¹·b by Eigen's LU.
  const int n = 20;
  Eigen::MatrixXd q = Eigen::MatrixXd::Identity(n, n);
  for (int i = 0; i < n; ++i)
    for (int j = 0; j < n; ++j)
      if (i != j) q(i, j) = 0.1 * std::sin(1.0 + i + 3.0 * j);  // any well-conditioned mixing
  Eigen::VectorXd eigen = Eigen::VectorXd::Zero(n);
  eigen[0] = 0.95;
  eigen[1] = 0.8;
  const Eigen::MatrixXd a = q * eigen.asDiagonal() * q.partialPivLu().inverse();
  Eigen::VectorXd b(n);
  for (int i = 0; i < n; ++i) b[i] = std::cos(0.7 * i);
  const Eigen::VectorXd expected = (Eigen::MatrixXd::Identity(n, n) - a).partialPivLu().solve(b);
  const PeriodMap map = [&](const Eigen::VectorXd& z, Eigen::VectorXd* end) {
    *end = a * z + b;
    return true;
  };
  const ShootingResult r = SolvePeriodicState(map, Eigen::VectorXd::Zero(n), Eigen::VectorXd::Constant(n, 1e-9),
                                              Eigen::VectorXd::Ones(n));
  REQUIRE(r.converged);
  REQUIRE(r.iterations == 1);
  REQUIRE(r.periods == 1 + 3 + 1);
  // Converged means rms(F) ≤ 0.25 × the 1e-9 weights; (I − A)⁻¹, whose
  // largest gain is about 1/0.05 = 20 (Q is near the identity), turns that
  // into about 5e-9 per state, 2e-8 over the twenty. 1e-8 of |z*| (about
  // 21 here, 2e-7) sits above that and far below the error of any wrong
  // solve.
  REQUIRE((r.z_end - expected).norm() < 1e-8 * expected.norm());
}

TEST_CASE("ShootingFindsTheFixedPointOfTheCosine", "[shooting]") {
  // z = cos z has the single real solution 0.7390851332151607 (the Dottie
  // number, OEIS A003957; the value here from memory, and checked by the
  // equation itself below). Newton's steps carry it there.
  const PeriodMap map = [](const Eigen::VectorXd& z, Eigen::VectorXd* end) {
    *end = z.array().cos();
    return true;
  };
  const ShootingResult r =
      SolvePeriodicState(map, Eigen::VectorXd::Constant(1, 0.2), Eigen::VectorXd::Constant(1, 1e-12),
                         Eigen::VectorXd::Ones(1));
  REQUIRE(r.converged);
  REQUIRE(r.z_end[0] == Approx(0.7390851332151607).margin(1e-11));
  REQUIRE(std::abs(std::cos(r.z_end[0]) - r.z_end[0]) < 1e-11);
}

TEST_CASE("ShootingSaysWhyWhenTheMapCannotBeSimulated", "[shooting]") {
  int calls = 0;
  const PeriodMap map = [&](const Eigen::VectorXd& z, Eigen::VectorXd* end) {
    *end = 0.5 * z;
    return ++calls == 1;  // every period after the first fails
  };
  const ShootingResult r = SolvePeriodicState(map, Eigen::VectorXd::Ones(2), Eigen::VectorXd::Constant(2, 1e-6),
                                              Eigen::VectorXd::Ones(2));
  REQUIRE_FALSE(r.converged);
  REQUIRE(r.message == "a perturbed period could not be simulated");
  REQUIRE(r.periods == 1 + 4);  // the start, then the perturbation each way, full and a tenth
}

TEST_CASE("AFailedPerturbedPeriodIsTakenTheOtherWay", "[shooting]") {
  // P(z) = z/2 + 1 (fixed point 2) cannot be simulated below z = 0.5, as a
  // state pushed past a valve's threshold: the start sits on that edge, so
  // the first perturbation (along −F, the first Krylov direction, here
  // downwards) fails and the difference quotient is taken from above; the
  // map being linear, one Newton step is exact.
  const PeriodMap map = [](const Eigen::VectorXd& z, Eigen::VectorXd* end) {
    *end = (0.5 * z.array() + 1.0).matrix();
    return z[0] >= 0.5;
  };
  const ShootingResult r = SolvePeriodicState(map, Eigen::VectorXd::Constant(1, 0.5), Eigen::VectorXd::Constant(1, 1e-9),
                                              Eigen::VectorXd::Ones(1));
  REQUIRE(r.converged);
  REQUIRE(r.periods == 1 + 2 + 1);  // the start, the failed and the reversed perturbation, the step
  REQUIRE(r.z_end[0] == Approx(2.0).margin(1e-8));  // linear: exact to rounding, as above
}

// A diode bridge on a stiff 400 V supply behind 1 mH, feeding 1 ohm
// through 1 H: the DC current settles with τ = L/R ≈ 0.77 s (the
// commutation adds 3ωLs/π = 0.3 ohm), some 38 cycles, so a change below
// 1e-5 a cycle takes about 450 cycles of plain simulation. The steady
// current is Id = Vdo/(R + 3ωLs/π) from Vd = Vdo − (3ωLs/π)·Id, Vdo =
// (3√2/π)·VLL (Mohan, Undeland & Robbins, Power Electronics, 3rd ed.,
// §5-3 and §5-7); the 1 H leaves a ripple far below the 0.1 % checked.
std::string SlowBridge(const std::string& method) {
  return R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 1 mH
bridge B ac = (a, b, c) dc = (p, n) Ron = 1 uohm
inductor Ld (p, q) L = 1 H
resistor Rl (q, n) R = 1 ohm
simulate stop = 400 ms
steady cycles = 2 )" + method + R"(
probe Id = Ld.i
probe Vd = p - n
)";
}

TEST_CASE("ShootingReachesASlowDcSideSteadyStateInAFewCycles", "[shooting][steady]") {
  const double w = 2 * std::numbers::pi * 50, ls = 1e-3, vll = 400.0, r = 1.0;
  const double vdo = 3 * std::sqrt(2.0) / std::numbers::pi * vll;
  const double id = vdo / (r + 3 * w * ls / std::numbers::pi);

  const auto shot = testing::Simulate(SlowBridge("method = shooting"));
  const RunSummary& s = shot.run.summary;
  INFO(s.FullReport());
  REQUIRE(s.shooting_converged);
  REQUIRE(s.steady_reached);
  REQUIRE(s.steady_time <= 5 * 0.02 + 1e-9);
  REQUIRE(shot.Window("Id").mean == Approx(id).epsilon(1e-3));
  // Vd spans the 1 H reactor: its samples are L·dId/dt + R·Id, and the
  // derivative of a state is known only to about its tolerance over the
  // step, so across 1 H the sampled mean is off by 0.10–0.15 % at the
  // default 2° largest step (measured; 0.05 % at 0.125°), whatever the
  // current's own accuracy.
  REQUIRE(shot.Window("Vd").mean == Approx(r * id).epsilon(2e-3));

  // Plain simulation over the same 400 ms (20 cycles) is still settling:
  // about 40 % of the way, 1 − e^(−0.4/0.77).
  const auto plain = testing::Simulate(SlowBridge(""));
  REQUIRE_FALSE(plain.run.summary.steady_reached);
  REQUIRE(plain.Window("Id").mean < 0.5 * id);
}

TEST_CASE("ShootingIsNotTriedAtTheRunsLastBoundary", "[shooting][steady]") {
  // A run of one cycle ends on the boundary where shooting would start:
  // nothing would be left to simulate from the state it found, so it is
  // not tried (it was, and the run then failed stepping from its end to
  // its end). What the one cycle gives is the DC current's rise from rest:
  // over whole cycles the rectified voltage averages Vd = Vdo − (3ωLs/π)·Id
  // (Mohan, Undeland & Robbins, Power Electronics, 3rd ed., §5-7), so
  // L·dId/dt = Vdo − (R + 3ωLs/π)·Id, and Id(T) = Vdo/(R + 3ωLs/π)·
  // (1 − e^(−T/τ)), τ = L/(R + 3ωLs/π) (our derivation; the ripple's part
  // is far below the 1 % checked).
  std::string text = SlowBridge("method = shooting");
  text.replace(text.find("stop = 400 ms"), 13, "stop = 20 ms");
  const auto c = testing::Simulate(text);
  const RunSummary& s = c.run.summary;
  INFO(s.FullReport());
  REQUIRE(s.status == RunSummary::Status::kCompleted);
  REQUIRE(s.shooting_periods == 0);
  const double w = 2 * std::numbers::pi * 50, ls = 1e-3, r = 1.0 + 3 * w * ls / std::numbers::pi;
  const double vdo = 3 * std::sqrt(2.0) / std::numbers::pi * 400.0;
  REQUIRE(c.Column("Id").back() == Approx(vdo / r * (1 - std::exp(-0.02 * r / 1.0))).epsilon(0.01));
}

TEST_CASE("TheStepLimitCountsShootingsTrialPeriods", "[shooting][errors]") {
  // The limits bound the whole case: a trial period gets what the run has
  // left, not limits of its own (each had the full ones, and a case could
  // run for the step limit times its trial periods).
  Diagnostics diags;
  auto design = ElaborateText("s.lcc", SlowBridge("method = shooting"), diags);
  REQUIRE(design);
  EngineOptions o;
  o.limits.max_steps = 700;  // more than the first cycle takes, less than shooting needs
  ProbeRecorder recorder(design->study.probes);
  const RunResult run = lcc::Simulate(design->circuit, design->study, o, recorder);
  INFO(run.summary.FullReport());
  REQUIRE(run.summary.status == RunSummary::Status::kFailed);
  REQUIRE(run.summary.message.find("step limit of 700 steps") != std::string::npos);
  REQUIRE(run.summary.shooting_steps > 0);
  REQUIRE(run.summary.steps + run.summary.shooting_steps <= 700);
}

}  // namespace
}  // namespace lcc
