// Shooting-Newton for a periodic steady state (Aprille & Trick, "Steady-
// state analysis of nonlinear circuits with periodic inputs", Proc. IEEE
// 60(1), 1972): the state z at a cycle boundary is steady when one period
// of simulation brings it back, P(z) = z. Newton's method on
// F(z) = P(z) − z finds it in a few periods where plain simulation waits
// for every slow mode (a regulator's integral, a DC-side L/R) to die out.
//
// P is a black box (one simulated period). Its Jacobian is built once by
// finite differences, a period per state, and then kept current by
// Broyden's rank-one updates, one period per iteration. The answer is the
// state P(z) at the end of the last period, so it comes from an actual
// simulated cycle. Nothing is assumed of P beyond being smooth near the
// steady state (switching instants move smoothly with the state there).
#pragma once

#include <Eigen/Core>
#include <functional>
#include <string>

namespace lcc {

struct ShootingOptions {
  int max_iterations = 8;      // Newton steps after the Jacobian
  double perturbation = 1e-3;  // finite-difference step, in units of each state's scale
  // Converged: the weighted rms of P(z) − z at most `tolerance`; or, once
  // the Newton steps are spent, at most `accept` for the best one (a
  // period map computed to a tolerance has noise of its own, and Newton
  // stalls at that level).
  double tolerance = 0.25;
  double accept = 0.5;
};

struct ShootingResult {
  bool converged = false;
  int iterations = 0;           // Newton steps taken
  int periods = 0;              // evaluations of P (simulated periods)
  double residual = 0.0;        // weighted rms of P(z) − z at the last evaluation
  Eigen::VectorXd z_end;        // P(z) of the evaluation returned (the last, or the best)
  int end_evaluation = -1;      // which evaluation of P (0-based, in call order) gave z_end
  std::string message;          // why it stopped, when not converged
};

// One period from z: false if it could not be simulated.
using PeriodMap = std::function<bool(const Eigen::VectorXd& z, Eigen::VectorXd* end)>;

// Solves P(z) = z from z0. `weights`: each state's tolerance (the residual is
// rms((P(z) − z)/weights)); `scales`: each state's size, for the
// finite-difference steps (perturbation · scale).
ShootingResult SolvePeriodicState(const PeriodMap& period, const Eigen::VectorXd& z0, const Eigen::VectorXd& weights,
                                  const Eigen::VectorXd& scales, const ShootingOptions& options = {});

}  // namespace lcc
