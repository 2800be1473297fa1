// Shooting-Newton for a periodic steady state (Aprille & Trick, "Steady-
// state analysis of nonlinear circuits with periodic inputs", Proc. IEEE
// 60(1), 1972): the state z at a cycle boundary is steady when one period
// of simulation brings it back, P(z) = z. Newton's method on
// F(z) = P(z) − z finds it in a few periods where plain simulation waits
// for every slow mode (a regulator's integral, a DC-side L/R) to die out.
//
// P is a black box (one simulated period). Its Jacobian is not built by
// finite differences, a period per state: the first Newton step solves
// J·s = −F by GCR, a Krylov method spanning GMRES's space (Saad, Iterative
// Methods for Sparse Linear Systems, 2nd ed., SIAM 2003, §6.9), J applied
// to a vector by one perturbed period (the matrix-free Newton–Krylov of
// C. T. Kelley, "Iterative Methods for Linear and Nonlinear Equations",
// SIAM 1995, ch. 6). A converter's period map damps its fast modes almost
// entirely in one cycle, so J = ∂P/∂z − I has its eigenvalues clustered at
// −1 but for the few slow modes, and the solve needs about one period per
// slow mode. What it showed (∂P/∂z on the explored directions, zero off
// them) is kept as the Jacobian and carried by Broyden's updates, one
// period a Newton step, until a step fails to halve the residual and the
// next explores afresh. The answer is the state P(z) at the end of the last
// period, so it comes from an actual simulated cycle. Nothing is assumed of
// P beyond being smooth near the steady state (switching instants move
// smoothly with the state there).
#pragma once

#include <Eigen/Core>
#include <functional>
#include <string>

namespace lcc {

struct ShootingOptions {
  int max_iterations = 12;     // Newton steps
  int max_krylov = 1000;       // Krylov directions (perturbed periods) per exploring step; never more than the states
  double perturbation = 1e-3;  // finite-difference step, rms in units of the states' scales
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
// finite-difference steps (rms of step/scale = perturbation).
ShootingResult SolvePeriodicState(const PeriodMap& period, const Eigen::VectorXd& z0, const Eigen::VectorXd& weights,
                                  const Eigen::VectorXd& scales, const ShootingOptions& options = {});

}  // namespace lcc
