#include "engine/shooting.h"

#include <Eigen/LU>
#include <Eigen/QR>
#include <cmath>

namespace lcc {
namespace {

double WeightedRms(const Eigen::VectorXd& f, const Eigen::VectorXd& w) {
  return f.size() == 0 ? 0.0 : std::sqrt(f.cwiseQuotient(w).squaredNorm() / static_cast<double>(f.size()));
}

}  // namespace

ShootingResult SolvePeriodicState(const PeriodMap& period, const Eigen::VectorXd& z0, const Eigen::VectorXd& weights,
                                  const Eigen::VectorXd& scales, const ShootingOptions& o) {
  ShootingResult r;
  const Eigen::Index n = z0.size();
  Eigen::VectorXd z = z0, end(n);
  auto evaluate = [&](const Eigen::VectorXd& at, Eigen::VectorXd* f) {
    ++r.periods;
    if (!period(at, &end)) return false;
    *f = end - at;
    return true;
  };
  Eigen::VectorXd f(n);
  if (!evaluate(z, &f)) {
    r.message = "the first period could not be simulated";
    return r;
  }
  r.z_end = end;
  r.end_evaluation = r.periods - 1;
  r.residual = WeightedRms(f, weights);
  if (r.residual <= o.tolerance) {
    r.converged = true;
    return r;
  }

  // Everything below works in units of each state's tolerance, x̃ = x/w, so
  // that the least-squares solves minimise the very norm the test reads.
  const Eigen::VectorXd& w = weights;
  // The target of the linear solve: the residual that would pass the test.
  const double target = 0.5 * o.tolerance * std::sqrt(static_cast<double>(n));
  const Eigen::Index max_directions = std::min<Eigen::Index>(n, o.max_krylov);

  // The Jacobian in those units, J̃ = W⁻¹·J·W, as far as it is known: built
  // from a Krylov solve, then kept current by Broyden's updates.
  Eigen::MatrixXd model;
  bool explore = true;  // the next step starts a Krylov solve

  double best_residual = r.residual;
  Eigen::VectorXd best_end = r.z_end;
  int best_evaluation = r.end_evaluation;
  for (r.iterations = 1; r.iterations <= o.max_iterations; ++r.iterations) {
    const Eigen::VectorXd f_scaled = f.cwiseQuotient(w);
    const double residual_before = WeightedRms(f, weights);
    Eigen::VectorXd step_scaled;
    if (!explore) {
      const Eigen::FullPivLU<Eigen::MatrixXd> lu(model);
      if (lu.rank() < n) {
        explore = true;  // Broyden's updates made the model singular
      } else {
        step_scaled = -lu.solve(f_scaled);
      }
    }
    if (explore) {
      // Minimise ‖f̃ + J̃·s̃‖ over the directions explored (GCR, which spans
      // the same Krylov space as GMRES: Saad, Iterative Methods for Sparse
      // Linear Systems, 2nd ed., SIAM 2003, §6.9); while the prediction
      // misses the target, the residual left is the next direction, applied
      // by one perturbed period, J·d ≈ (F(z + c·d) − F(z))/c, with c sizing
      // the perturbation to `perturbation` of the states' scales (rms).
      Eigen::MatrixXd directions(n, 0), images(n, 0);
      Eigen::VectorXd coefficients = Eigen::VectorXd::Zero(0);
      while (true) {
        Eigen::VectorXd left = -f_scaled;
        if (images.cols() > 0) {
          coefficients = images.colPivHouseholderQr().solve(-f_scaled);
          left -= images * coefficients;
        }
        if (left.norm() <= target || directions.cols() == max_directions) break;
        const Eigen::VectorXd d_scaled = left / left.norm();
        const Eigen::VectorXd direction = d_scaled.cwiseProduct(w);
        const double size = std::sqrt(direction.cwiseQuotient(scales).squaredNorm() / static_cast<double>(n));
        // A perturbed period can fail where the plain one does not: a state
        // pushed across a valve's threshold at the boundary (a conducting
        // valve's current just below zero) can leave a start IDA cannot
        // integrate. The difference quotient is then taken the other way,
        // and then with a perturbation ten times smaller, each way.
        Eigen::VectorXd fj(n);
        double c = 0.0;
        bool ok = false;
        for (const double factor : {1.0, -1.0, 0.1, -0.1}) {
          c = factor * o.perturbation / size;
          if ((ok = evaluate(z + c * direction, &fj))) break;
        }
        if (!ok) {
          r.message = "a perturbed period could not be simulated";
          return r;
        }
        const Eigen::Index k = directions.cols();
        directions.conservativeResize(Eigen::NoChange, k + 1);
        images.conservativeResize(Eigen::NoChange, k + 1);
        directions.col(k) = d_scaled;
        images.col(k) = ((fj - f) / c).cwiseQuotient(w);
      }
      step_scaled = directions * coefficients;
      // The model: P's Jacobian M = J + I is what the directions showed on
      // their span and zero off it (the modes a period damps away), so
      // J̃ = (images + directions)·directions⁺ − I.
      model = (images + directions) * directions.completeOrthogonalDecomposition().pseudoInverse() -
              Eigen::MatrixXd::Identity(n, n);
      explore = false;
    }
    Eigen::VectorXd step = step_scaled.cwiseProduct(w);

    // A step the simulation cannot follow (a state far outside the range it
    // was linearised in) is halved, up to three times.
    Eigen::VectorXd f_new(n);
    bool ok = false;
    for (int halving = 0; halving < 4 && !ok; ++halving) {
      ok = evaluate(z + step, &f_new);
      if (!ok) step *= 0.5;
    }
    if (!ok) {
      r.message = "a Newton step could not be simulated";
      return r;
    }
    const double residual = WeightedRms(f_new, weights);
    if (residual < best_residual) best_residual = residual, best_end = end, best_evaluation = r.periods - 1;
    r.z_end = end;
    r.end_evaluation = r.periods - 1;
    r.residual = residual;
    if (r.residual <= o.tolerance) {
      r.converged = true;
      return r;
    }
    // Broyden's update in the same units: the least change that meets the
    // secant condition J̃·s̃ = ΔF̃. A step that did not halve the residual
    // means the model has gone stale: the next step explores afresh.
    const Eigen::VectorXd s_scaled = step.cwiseQuotient(w);
    const double denominator = s_scaled.squaredNorm();
    if (denominator > 0)
      model += ((f_new - f).cwiseQuotient(w) - model * s_scaled) * s_scaled.transpose() / denominator;
    explore = residual > 0.5 * residual_before;
    z += step;
    f = f_new;
  }
  --r.iterations;
  if (best_residual <= o.accept) {
    r.converged = true;
    r.residual = best_residual;
    r.z_end = best_end;
    r.end_evaluation = best_evaluation;
    return r;
  }
  r.message = "no convergence within the Newton steps allowed";
  return r;
}

}  // namespace lcc
