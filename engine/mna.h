// The modified-nodal-analysis system of a circuit:
//     F(t, y, y') = C·y' + G(s)·y − b(t, s) = 0.
//
// G and C share one compressed-column pattern that is fixed for the life of
// the circuit (devices stamp the same positions whatever their state), so a
// switching event changes values only: the Jacobian J = G + cj·C keeps its
// sparsity and the LU's symbolic analysis is done once.
//
// Differential unknowns are those with a non-zero column in C (inductor
// currents, capacitor voltages); all node voltages and the other branch
// currents are algebraic.
//
// SolveConsistent() gives consistent (y, y') at an instant for given
// differential values, by one sparse solve of the index-1 system
//     [C_d  G_a]·[y'_d; y_a] = b(t) − G_d·y_d,
// the algebraic y' being set to zero.
#pragma once

#include <Eigen/SparseCore>
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "engine/lu_solver.h"
#include "models/circuit.h"

namespace lcc {

class MnaSystem {
 public:
  using SparseMatrix = Eigen::SparseMatrix<double, Eigen::ColMajor, int>;

  explicit MnaSystem(const Circuit& circuit, const LuOptions& lu = {});

  int size() const { return n_; }
  const std::vector<char>& differential() const { return differential_; }
  const std::vector<int>& differential_indices() const { return differential_indices_; }
  // Pattern of J (and of G, C and the consistency matrix).
  const SparseMatrix& pattern() const { return pattern_; }
  const std::vector<std::uint8_t>& switch_states() const { return states_; }

  // Re-stamps G for the given switch states (one entry per switch slot).
  void SetSwitchStates(const std::vector<std::uint8_t>& states);

  // Takes the values of `other`, a circuit of the same structure (the same
  // devices and unknowns, other parameter values: a case's `at ... set`).
  // Returns false, with the reason, if the structure or the set of
  // differential unknowns differs.
  bool Rebind(const Circuit& other, std::string* error);

  // b(t) for the present switch states.
  void Sources(double t, double* b) const;
  const std::vector<double>& g_values() const { return g_values_; }
  const std::vector<double>& c_values() const { return c_values_; }

  // r = C·y' + G·y − b(t).
  void Residual(double t, const double* y, const double* yp, double* r) const;
  // Values of J = G + cj·C in pattern order.
  void JacobianValues(double cj, double* values) const;

  // Replaces the algebraic entries of y, and all of y', by consistent values
  // for the differential entries of y. Returns false (with a reason) if the
  // system is singular in the present switch states.
  bool SolveConsistent(double t, double* y, double* yp, std::string* error);

  // Recomputes the algebraic entries of y at t from its differential
  // entries, reusing the factorisation of the last SolveConsistent() (valid
  // while the switch states are unchanged). Output samples use it: IDA's
  // interpolant is accurate for the states it controls, but between steps
  // the algebraic unknowns (node voltages, source and valve currents) would
  // only be as good as the interpolating polynomial's order, which in a
  // circuit with few states may be 1.
  void RecomputeAlgebraic(double t, double* y);
  // Limits RecomputeAlgebraic() to the algebraic unknowns among `unknowns`
  // (indices into y; differential ones are ignored), leaving the other
  // entries of y as they are: an output that reads a few unknowns pays for
  // those only. Until it is called, every algebraic unknown is recomputed.
  void SetOutputUnknowns(const std::vector<int>& unknowns);

  // One backward-Euler step of size h from (t, y): y ← y(t + h), solving
  //     (G + C/h)·y₁ = b(t + h) + (C/h)·y₀.
  // Used right after a switching event to let modes far faster than any
  // step IDA would take (an inductor's current through a valve's Roff,
  // τ = L/Roff ~ 0.1 ns) settle before IDA restarts: BE is L-stable, so
  // they decay in one step, while the physical states move by h·y' only.
  bool BackwardEulerStep(double t, double h, double* y, std::string* error);

 private:
  const Circuit* circuit_;
  int n_ = 0;
  SparseMatrix pattern_;
  std::vector<int> g_slot_;  // stamp order -> value index
  std::vector<int> c_slot_;
  std::vector<double> g_values_, c_values_;
  std::vector<char> differential_;
  std::vector<int> differential_indices_;
  std::vector<std::uint8_t> states_;
  std::vector<const Device*> source_devices_;
  // b(t) of the last Residual call: IDA's Newton iterations evaluate the
  // residual again at the same t (39 % of the calls on the six-pulse
  // benchmark), and b is the part of it that costs a sine per source.
  // Valid while the switch states (a conducting valve's Vf) and the
  // values stay as they were.
  mutable std::vector<double> b_;
  mutable double b_time_ = 0.0;
  mutable bool b_valid_ = false;

  std::vector<double> consistency_values_;
  Eigen::VectorXd rhs_, z_;
  // For RecomputeAlgebraic(): the algebraic unknowns it recomputes, the
  // rows b(t) can touch, and, per switch-state configuration, the response
  // of each recomputed unknown (a row) to each such b_r and to each
  // differential unknown d (a column each: the entries of M⁻¹·e_r and
  // M⁻¹·G[:,d]). A converter goes through the same few configurations
  // every cycle, so the responses are kept, not rebuilt after each event:
  // up to kKeptResponseBytes of them, the least recently used dropped first.
  struct KeptResponse {
    std::vector<std::uint8_t> states;
    long last_used = 0;
    int direct = 0;      // samples solved directly in this configuration so far
    bool built = false;  // `rows` holds the responses
    Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor> rows;
  };
  static constexpr std::size_t kKeptResponseBytes = std::size_t{16} << 20;
  KeptResponse& ResponseForPresentStates();
  std::vector<int> output_rows_;
  std::vector<int> source_rows_;
  std::vector<KeptResponse> kept_responses_;
  int present_response_ = -1;  // index into kept_responses_ for states_ (−1: not looked up)
  long response_clock_ = 0;
  Eigen::VectorXd drive_;  // [b_r(t); −y_d], what the responses multiply
  std::unique_ptr<LuSolver> consistency_lu_;
  std::unique_ptr<LuSolver> step_lu_;
  // The factorisations depend only on the switch states (and the step h):
  // they are redone only when those change.
  bool consistency_factored_ = false;
  double step_factored_h_ = 0.0;
};

}  // namespace lcc
