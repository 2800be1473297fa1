#include "engine/shooting.h"

#include <Eigen/LU>
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

  // The Jacobian of F = P − I, a column per state.
  Eigen::MatrixXd jacobian(n, n);
  for (Eigen::Index j = 0; j < n; ++j) {
    const double h = o.perturbation * scales[j];
    Eigen::VectorXd zj = z, fj(n);
    zj[j] += h;
    if (!evaluate(zj, &fj)) {
      r.message = "a perturbed period could not be simulated";
      return r;
    }
    jacobian.col(j) = (fj - f) / h;
  }

  double best_residual = r.residual;
  Eigen::VectorXd best_end = r.z_end;
  int best_evaluation = r.end_evaluation;
  for (r.iterations = 1; r.iterations <= o.max_iterations; ++r.iterations) {
    Eigen::FullPivLU<Eigen::MatrixXd> lu(jacobian);
    if (lu.rank() < n) {
      r.message = "the Jacobian of the period map is singular";
      return r;
    }
    Eigen::VectorXd step = -lu.solve(f);
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
    // Broyden's update: the least change (in each state's own scale, as
    // the states mix amperes, volts and radians) that meets the secant
    // condition J·step = F(z + step) − F(z).
    const Eigen::VectorXd scaled = step.cwiseQuotient(scales.cwiseProduct(scales));
    const double denominator = step.dot(scaled);
    if (denominator > 0) jacobian += ((f_new - f) - jacobian * step) * scaled.transpose() / denominator;
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
