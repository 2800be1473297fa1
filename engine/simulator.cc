#include "engine/simulator.h"

#include <ida/ida.h>
#include <nvector/nvector_serial.h>
#include <sundials/sundials_context.h>
#include <sunmatrix/sunmatrix_sparse.h>

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <cmath>
#include <memory>
#include <numbers>
#include <optional>
#include <set>
#include <stdexcept>

#include "engine/eigen_linear_solver.h"
#include "engine/fast_vector_ops.h"
#include "engine/mna.h"
#include "engine/phasor.h"
#include "engine/shooting.h"
#include "models/source_branch.h"
#include "models/valve.h"

namespace lcc {
namespace {

// ---- owners of SUNDIALS handles ---------------------------------------------

struct ContextDeleter {
  void operator()(SUNContext* c) const {
    if (c && *c) SUNContext_Free(c);
    delete c;
  }
};
struct VectorDeleter {
  void operator()(_generic_N_Vector* v) const { if (v) N_VDestroy(v); }
};
struct MatrixDeleter {
  void operator()(_generic_SUNMatrix* m) const { if (m) SUNMatDestroy(m); }
};
struct SolverDeleter {
  void operator()(_generic_SUNLinearSolver* s) const { if (s) SUNLinSolFree(s); }
};
struct IdaDeleter {
  void operator()(void* mem) const {
    if (mem) IDAFree(&mem);
  }
};
using Vector = std::unique_ptr<_generic_N_Vector, VectorDeleter>;
using Matrix = std::unique_ptr<_generic_SUNMatrix, MatrixDeleter>;
using Solver = std::unique_ptr<_generic_SUNLinearSolver, SolverDeleter>;
using IdaMemory = std::unique_ptr<void, IdaDeleter>;

// Throws with the SUNDIALS call's name and code; used for set-up calls that
// fail only on programming errors.
void Check(int flag, const char* call) {
  if (flag < 0) throw std::runtime_error(fmt::format("{} failed with code {}", call, flag));
}

// ---- the run ---------------------------------------------------------------

// Everything a run carries from one cycle into the next, taken at a cycle
// boundary: what a period of simulation starts from when shooting for the
// steady state (engine/shooting.h).
struct CycleState {
  std::vector<double> x;                // the differential unknowns
  std::vector<std::uint8_t> switches;   // every switch slot
  std::vector<double> recover_left;     // per valve: recovery (tq) still to run, s (< 0: none)
  // Per firing element: its delay angle, and for a regulator its integral,
  // the probe's integral since its last sample and the probe's value at the
  // boundary, and the time since that sample.
  std::vector<double> alpha, integral, regulated_integral, last_value, since_sample;
  // The absolute tolerances of the run it was taken from (empty: the
  // circuit-wide ones), so that a trial period integrates as the run does.
  std::vector<double> atol;
};

// Takes samples and keeps none (the trial periods of shooting).
class DiscardingSink final : public SampleSink {
 public:
  void OnSample(double, const double*, const double*) override {}
  bool wants_derivatives() const override { return false; }
};

class Run {
 public:
  Run(const Circuit& circuit, const Study& study, const EngineOptions& options, SampleSink& sink,
      const std::vector<EngineAction>& actions, const CycleState* trial_start = nullptr)
      : circuit_(&circuit), study_(&study), options_(options), actions_(actions), sink_(sink),
        mna_(circuit, options.lu), n_(mna_.size()), trial_start_(trial_start) {
    std::stable_sort(actions_.begin(), actions_.end(),
                     [](const EngineAction& a, const EngineAction& b) { return a.t < b.t; });
    SelectOutputs();
  }

  RunResult Execute() {
    const auto start = std::chrono::steady_clock::now();
    start_ = start;
    try {
      if (Prepare()) Integrate();
    } catch (const std::exception& e) {
      Fail(e.what());
    }
    Accumulate();
    auto& s = result_.summary;
    s.wall_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    s.jacobian_evaluations = jac_evals_;
    s.linear_setups = solver_stats_.setups;
    s.symbolic_analyses = solver_stats_.analyses;
    s.reused_pivot_plans = solver_stats_.reused_plans;
    s.supernodal_lu = solver_stats_.supernodal;
    if (s.status == RunSummary::Status::kNotRun) s.status = RunSummary::Status::kCompleted;
    FinishWindow();
    return std::move(result_);
  }

 private:
  // -- set-up ---------------------------------------------------------------

  // Returns false if the initial configuration cannot be settled.
  bool Prepare() {
    const SimulateSpec& sim = *study_->simulate;
    auto& s = result_.summary;
    s.stop_given = sim.stop;
    s.reltol_used = sim.reltol;
    const double f = RunFrequency(*study_);
    period_ = f > 0 ? 1.0 / f : 0.0;
    s.period = period_;
    s.sample_used = OutputInterval(*study_);
    s.max_step_used = sim.max_step > 0                ? sim.max_step
                      : period_ > 0                   ? period_ * options_.default_max_step_degrees / 360.0
                                                      : sim.stop / 1000.0;
    s.steady_requested = study_->steady.has_value();
    t_end_ = sim.stop;
    if (study_->steady && study_->steady->settle_max > 0 && period_ > 0)
      t_end_ = std::min(sim.stop, study_->steady->settle_max + study_->steady->cycles * period_);
    if (trial_start_) t_end_ = period_;  // one period, from a cycle boundary

    // Scales for the absolute tolerances and the valve hysteresis.
    double v_ref = 0.0, i_ref = 0.0, r_min = 0.0;
    for (const auto& d : circuit_->devices()) {
      v_ref = std::max(v_ref, d->voltage_scale());
      i_ref = std::max(i_ref, d->current_scale());
      const double r = d->resistance_scale();
      if (r > 0 && (r_min == 0 || r < r_min)) r_min = r;
    }
    if (v_ref <= 0) v_ref = 1.0;
    i_ref = std::max(i_ref, v_ref / (r_min > 0 ? r_min : 1.0));
    v_ref_ = v_ref;
    i_ref_ = i_ref;
    const double fraction = options_.tolerances.abstol_fraction;
    const double atol_v = sim.reltol * fraction * v_ref;
    const double atol_i = sim.reltol * fraction * i_ref;
    eps_v_ = options_.tolerances.hysteresis * atol_v;
    eps_i_ = options_.tolerances.hysteresis * atol_i;

    for (std::size_t k = 0; k < circuit_->devices().size(); ++k) {
      const Device& d = *circuit_->devices()[k];
      if (d.natural()) valves_.push_back({static_cast<int>(k), static_cast<const Valve*>(&d)});
    }

    ctx_.reset(new SUNContext(nullptr));
    Check(SUNContext_Create(nullptr, ctx_.get()), "SUNContext_Create");
    y_.reset(N_VNew_Serial(n_, *ctx_));
    // Optimised vector kernels (engine/fast_vector_ops.h); every vector
    // below and every one IDA clones inherits them from y_.
    UseFastVectorOps(y_.get());
    yp_.reset(N_VClone(y_.get()));
    work_.reset(N_VClone(y_.get()));
    work_p_.reset(N_VClone(y_.get()));
    Vector id(N_VClone(y_.get()));
    double* idv = N_VGetArrayPointer(id.get());
    const double unit = sim.reltol * options_.tolerances.abstol_fraction;
    atol_.assign(n_, atol_v);  // node voltages; branch unknowns below
    for (const auto& d : circuit_->devices())
      for (int k = 0; k < d->num_branches(); ++k) atol_[d->branch(k)] = unit * d->unknown_scale(k, v_ref, i_ref);
    for (int k = 0; k < n_; ++k) idv[k] = mna_.differential()[k] ? 1.0 : 0.0;
    tolerance_ = atol_;
    if (trial_start_ && !trial_start_->atol.empty()) tolerance_ = trial_start_->atol;
    next_tolerance_boundary_ = period_;

    // Initial state: differential unknowns from i0 / v0, switches as given.
    double* y = N_VGetArrayPointer(y_.get());
    double* yp = N_VGetArrayPointer(yp_.get());
    std::fill(y, y + n_, 0.0);
    std::fill(yp, yp + n_, 0.0);
    for (const auto& d : circuit_->devices())
      for (int k = 0; k < d->num_branches(); ++k) y[d->branch(k)] = d->initial_value(k);
    states_.assign(circuit_->num_switch_slots(), 0);
    for (const auto& d : circuit_->devices())
      if (d->has_switch_state()) states_[d->switch_slot()] = d->initially_on();
    if (trial_start_) {
      const auto& diff = mna_.differential_indices();
      for (std::size_t i = 0; i < diff.size(); ++i) y[diff[i]] = trial_start_->x[i];
    } else if (sim.periodic_start && study_->fundamental > 0) {
      // Start from the AC steady state of the network (engine/phasor.h),
      // except where the user gave an initial value.
      mna_.SetSwitchStates(states_);
      std::vector<double> y0;
      if (SolvePeriodicStart(mna_, study_->fundamental, &y0)) {
        for (const auto& d : circuit_->devices()) {
          if (d->has_initial_value()) continue;
          for (int k = 0; k < d->num_branches(); ++k)
            if (mna_.differential()[d->branch(k)]) y[d->branch(k)] = y0[d->branch(k)];
        }
      }
    }
    ComputeFiringReferences();
    for (const auto& f : circuit_->firings()) {
      alpha_now_.push_back(f.alpha);
      integral_.push_back(0.0);
      last_regulation_.push_back(0.0);
      if (f.regulate_probe >= 0) {
        regulated_integral_.assign(circuit_->firings().size(), 0.0);
        last_regulated_value_.assign(circuit_->firings().size(), 0.0);
        for (const auto& slot : study_->probes[f.regulate_probe].slots) wants_regulated_derivative_ |= !slot.yp.empty();
      }
    }
    result_.final_alpha = alpha_now_;
    previous_alpha_ = alpha_now_;
    recover_until_.assign(valves_.size(), -1.0);
    forced_.assign(valves_.size(), 0);
    misfire_left_.assign(valves_.size(), 0);
    misfire_from_.assign(valves_.size(), 0.0);
    suppressed_from_.assign(valves_.size(), 0.0);
    suppressed_until_.assign(valves_.size(), -1.0);
    t_off_.assign(valves_.size(), -1.0);
    awaiting_forward_.assign(valves_.size(), 0);
    if (trial_start_) LoadCycleState(*trial_start_, 0.0, true);
    StartPlls();  // before the first Settle, which fires by the loops' angles
    if (!Settle(0.0, {})) return false;
    next_gate_edge_ = NextGateEdge(0.0);

    ida_.reset(IDACreate(*ctx_));
    if (!ida_) throw std::runtime_error("IDACreate failed");
    void* mem = ida_.get();
    Check(IDAInit(mem, &Run::ResidualFn, 0.0, y_.get(), yp_.get()), "IDAInit");
    Check(IDASetUserData(mem, this), "IDASetUserData");
    Check(IDASetErrHandlerFn(mem, &Run::ErrorFn, this), "IDASetErrHandlerFn");
    // The error weights come from tolerance_, which the run tightens once
    // a period has shown the states' sizes (TightenTolerances).
    Check(IDAWFtolerances(mem, &Run::ErrorWeights), "IDAWFtolerances");
    Check(IDASetId(mem, id.get()), "IDASetId");
    Check(IDASetSuppressAlg(mem, SUNTRUE), "IDASetSuppressAlg");
    Check(IDASetMaxStep(mem, s.max_step_used), "IDASetMaxStep");
    ArmStopTime(0.0);

    const auto& pattern = mna_.pattern();
    jacobian_.reset(SUNSparseMatrix(n_, n_, pattern.nonZeros(), CSC_MAT, *ctx_));
    solver_.reset(MakeEigenLu(*ctx_, pattern, options_.lu, &solver_stats_));
    Check(IDASetLinearSolver(mem, solver_.get(), jacobian_.get()), "IDASetLinearSolver");
    Check(IDASetJacFn(mem, &Run::JacobianFn), "IDASetJacFn");
    if (!valves_.empty()) {
      Check(IDARootInit(mem, static_cast<int>(2 * valves_.size()), &Run::RootFn), "IDARootInit");
      Check(IDASetNoInactiveRootWarn(mem), "IDASetNoInactiveRootWarn");
      SetRootDirections();
    }
    shooting_armed_ = !trial_start_ && study_->steady && study_->steady->shooting && period_ > 0;
    if (shooting_armed_) {
      for (const auto& fr : circuit_->firings())
        if (fr.measured_sync()) shooting_armed_ = false;  // a PLL's state is not carried over
      if (!shooting_armed_) result_.summary.shooting_message = "not used: a firing element has a PLL";
      // A case with timed actions is run for its transient (a load step's
      // settling, a fault's currents): shooting would skip what it is for.
      if (shooting_armed_ && !actions_.empty()) {
        shooting_armed_ = false;
        result_.summary.shooting_message = "not used: the case's timed actions make its transient the result";
      }
    }
    if (study_->steady && period_ > 0 && !trial_start_) {
      next_boundary_ = period_;
      previous_state_ = DifferentialState(y);
      cycle_peak_.assign(previous_state_.size(), 0.0);
      for (std::size_t i = 0; i < previous_state_.size(); ++i) cycle_peak_[i] = std::abs(previous_state_[i]);
    }
    return true;
  }

  // -- the main loop ----------------------------------------------------------

  void Integrate() {
    void* mem = ida_.get();
    const double dt = result_.summary.sample_used;
    double t = 0.0;
    std::vector<int> roots(2 * valves_.size());
    if (next_action_ < actions_.size() && actions_[next_action_].t <= 0.0) {
      if (!ApplyActions(0.0)) return;
      ArmStopTime(0.0);
    }
    while (true) {
      // An action that fell inside the relaxation step of an event at the
      // same instant is applied where IDA now is.
      if (next_action_ < actions_.size() && actions_[next_action_].t <= t_restart_ && t_restart_ > t) {
        t = t_restart_;
        if (!ApplyActions(t)) return;
        ArmStopTime(t);
      }
      if (options_.limits.cancel && options_.limits.cancel->load(std::memory_order_relaxed)) {
        Fail(fmt::format("interrupted at t = {:.6g} s", t));
        return;
      }
      if (options_.limits.max_steps > 0 && TotalSteps() >= options_.limits.max_steps) {
        const long trials = result_.summary.shooting_steps;
        Fail(fmt::format("step limit of {} steps reached at t = {:.6g} s{}", options_.limits.max_steps, t,
                         trials > 0 ? fmt::format(" ({} of them in shooting's trial periods)", trials) : ""));
        return;
      }
      if (options_.limits.max_wall_seconds > 0 && ElapsedSeconds() > options_.limits.max_wall_seconds) {
        Fail(fmt::format("wall-clock limit of {:g} s reached at t = {:.6g} s",
                         options_.limits.max_wall_seconds, t));
        return;
      }
      double tret = t;
      int flag = IDASolve(mem, t_end_, &tret, y_.get(), yp_.get(), IDA_ONE_STEP);
      if (flag < 0 && RetryRestart()) continue;
      if (flag < 0) {
        Fail(fmt::format("the integrator failed at t = {:.9g} s: {}{}{}{}", tret, IDAGetReturnFlagName(flag),
                         last_ida_message_.empty() ? "" : " (" + last_ida_message_ + ")", RecentSwitchingText(tret),
                         ValveStateText()));
        return;
      }
      t = tret;
      AccumulateRegulated(t);
      if (!pll_.empty() && t < next_gate_edge_) UpdatePlls(t, N_VGetArrayPointer(y_.get()));
      EmitSamples(std::min(t, t_end_), dt);
      TrackCycles(t);
      TightenTolerances(t);
      result_.summary.t_reached = t;
      if (shoot_now_) {
        shoot_now_ = false;
        if (!Shoot(t)) return;
        ArmStopTime(t);
        continue;
      }
      if (flag == IDA_TSTOP_RETURN && shooting_armed_ && t < next_gate_edge_ && t < t_end_) ArmStopTime(t);
      if (flag == IDA_ROOT_RETURN) {
        Check(IDAGetRootInfo(mem, roots.data()), "IDAGetRootInfo");
        std::vector<int> flagged;
        for (std::size_t k = 0; k < valves_.size(); ++k)
          if (roots[2 * k] != 0 || roots[2 * k + 1] != 0) flagged.push_back(static_cast<int>(k));
        ++result_.summary.events;
        if (!HandleEvent(t, flagged)) return;
      }
      // Done; also when an event a rounding error short of the end leaves
      // less than IDA can step (its "tout too close to t0").
      if (t >= t_end_ - 1e-9 * result_.summary.sample_used) {
        if (t < t_end_) EmitSamples(t_end_, dt);
        if (trial_start_) trial_end_ = CaptureCycleState(t);
        break;
      }
      if (next_action_ < actions_.size() && t >= actions_[next_action_].t) {
        if (!ApplyActions(t)) return;
        ArmStopTime(t);
      }
      if ((flag == IDA_TSTOP_RETURN || pulse_due_now_) && t >= next_gate_edge_) {
        // A gate pulse starts: the thyristors found gated and forward biased
        // fire, then the regulators take their sample and set the delay of
        // the pulses to come (not of the one that just started).
        pulse_due_now_ = false;
        last_gate_edge_ = t;
        next_gate_edge_ = NextGateEdge(t);
        RegisterMisfires(t);
        if (!HandleEvent(t, {})) return;
        if (Regulate(t)) {
          // A pulse whose start the new delay moved to just before now is
          // on already: fire its valve if it is forward biased.
          next_gate_edge_ = NextGateEdge(t);
          if (!HandleEvent(t, {})) return;
        }
        ArmStopTime(t);
      }
    }
  }

  // `force`: restart IDA even if nothing switched (a case action changed
  // the circuit).
  bool HandleEvent(double t, const std::vector<int>& flagged, bool force = false) {
    // Chattering guard.
    const double window = options_.events.chatter_window * (period_ > 0 ? period_ : t_end_);
    if (t - last_event_time_ < window) {
      if (++rapid_events_ >= options_.events.chatter_events) {
        Fail(fmt::format("valve(s) {} switched {} times within {:.3g} s at t = {:.9g} s: chattering; "
                         "consider a snubber or a larger Roff",
                         ValveNames(flagged), rapid_events_, t - chatter_start_, t));
        return false;
      }
    } else {
      rapid_events_ = 0;
      chatter_start_ = t;
    }
    last_event_time_ = t;

    // Roots of blocking thyristors that are not armed (no gate pulse, fully
    // recovered) only mark their voltage turning positive: the end of the
    // extinction interval. They change nothing.
    std::vector<int> flips;
    const double* y = N_VGetArrayPointer(y_.get());
    for (int k : flagged) {
      const Valve& v = *valves_[k].valve;
      if (states_[v.switch_slot()] || Armed(k, t)) {
        flips.push_back(k);
      } else if (awaiting_forward_[k] && v.Voltage(y) >= v.params().v_f) {
        result_.forward_voltage.push_back({t, valves_[k].device, t_off_[k]});
        awaiting_forward_[k] = 0;
        ControlExtinction(v, t - t_off_[k], t);
      }
    }
    if (flips.empty() && !flagged.empty()) return true;

    const long switchings_before = result_.summary.switchings;
    if (!Settle(t, flips)) return false;
    if (flagged.empty() && !force && result_.summary.switchings == switchings_before) return true;
    Accumulate();  // IDAReInit below resets IDA's counters
    // Relax the parasitic fast modes (see MnaSystem::BackwardEulerStep) with
    // one tiny implicit step, then restart IDA from there.
    double h_relax = options_.events.relax_step_fraction * result_.summary.max_step_used;
    if (h_relax > 0 && t + h_relax < t_end_) {
      double* y = N_VGetArrayPointer(y_.get());
      std::string error;
      // The step must not carry a valve across its switching threshold: in
      // a circuit whose own commutations take microseconds (a stiff supply
      // behind a few µH) a fixed fraction of the largest step can be longer
      // than a whole commutation, and the crossing would go unlocated (IDA
      // then restarts in a state it cannot integrate). A step that leaves a
      // valve past its rule by more than twice the settling tolerance (a
      // marginal valve is settled below) is retried at an eighth of its
      // length, and dropped below 1e-9 of the largest step.
      const std::vector<double> y_event(y, y + mna_.size());
      while (true) {
        if (!mna_.BackwardEulerStep(t, h_relax, y, &error)) {
          Fail(error + ValveStateText());
          return false;
        }
        if (WorstViolation(t + h_relax, y) <= 1.0) break;
        std::copy(y_event.begin(), y_event.end(), y);
        h_relax /= 8.0;
        if (h_relax < 1e-9 * result_.summary.max_step_used) {
          h_relax = 0.0;
          break;
        }
      }
    }
    if (h_relax > 0 && t + h_relax < t_end_) {
      double* y = N_VGetArrayPointer(y_.get());
      double* yp = N_VGetArrayPointer(yp_.get());
      t += h_relax;
      // The step moves the states a little: a valve that was marginal at the
      // event (a commutation ending on the leakage of the others' Roff) may
      // now be on the wrong side of its rule, where its roots would never
      // see a sign change. Settle again.
      if (!Settle(t, {})) return false;
      // Samples inside the relaxation step take its end state (the step is
      // far shorter than the sample interval).
      EmitStateSamples(t, y, yp);
      if (options_.events.restart_derivative_from_step) DerivativeFromStep(t, h_relax);
    }
    void* mem = ida_.get();
    // IDA would otherwise restart from a step sized by ‖y'‖ (often 1 ns
    // after a commutation) and spend tens of steps growing it back.
    double h_last = 0.0;
    IDAGetLastStep(mem, &h_last);
    const double h0 = std::min(result_.summary.max_step_used, h_last) * options_.events.restart_step_fraction;
    Check(IDAReInit(mem, t, y_.get(), yp_.get()), "IDAReInit");
    t_restart_ = t;
    restart_y_.assign(N_VGetArrayPointer(y_.get()), N_VGetArrayPointer(y_.get()) + n_);
    restart_yp_.assign(N_VGetArrayPointer(yp_.get()), N_VGetArrayPointer(yp_.get()) + n_);
    restart_h0_ = h0;
    restart_retried_ = false;
    if (h0 > 0) Check(IDASetInitStep(mem, h0), "IDASetInitStep");
    ArmStopTime(t);
    SetRootDirections();
    return true;
  }

  // Replaces the differential unknowns' y' at the restart state (t, y) by
  // the difference quotient of a backward-Euler step of h from it, a step
  // that is not kept (EngineOptions::Events::restart_derivative_from_step).
  // The algebraic y' stay as the consistent solve left them (zero).
  void DerivativeFromStep(double t, double h) {
    const double* y = N_VGetArrayPointer(y_.get());
    double* yp = N_VGetArrayPointer(yp_.get());
    derivative_step_.assign(y, y + n_);
    std::string error;
    // A singular matrix here would have failed the relaxation step already;
    // if it does, the consistent y' stay.
    if (!mna_.BackwardEulerStep(t, h, derivative_step_.data(), &error)) return;
    for (int k : mna_.differential_indices()) yp[k] = (derivative_step_[k] - y[k]) / h;
  }

  // IDA failing its very first step after an event (the error or the
  // Newton test failing down to its smallest step) has been seen where a
  // nearly idle valve leaves a node held only by the blocking valves' Roff
  // (a capacitor-filtered bridge at no load): a parasitic mode of L/Roff ~
  // 1 ps the restart step is many decades longer than. Started again from
  // the same state with a first step ten thousand times shorter, IDA gets
  // through; the cost is a few extra steps, once. Returns true if the
  // restart was retried (once per event).
  bool RetryRestart() {
    void* mem = ida_.get();
    long steps = 0;
    IDAGetNumSteps(mem, &steps);
    if (steps > 0 || restart_retried_ || restart_y_.empty()) return false;
    restart_retried_ = true;
    ++result_.summary.restart_retries;
    std::copy(restart_y_.begin(), restart_y_.end(), N_VGetArrayPointer(y_.get()));
    std::copy(restart_yp_.begin(), restart_yp_.end(), N_VGetArrayPointer(yp_.get()));
    Accumulate();
    Check(IDAReInit(mem, t_restart_, y_.get(), yp_.get()), "IDAReInit");
    const double h0 = (restart_h0_ > 0 ? restart_h0_ : result_.summary.max_step_used) * 1e-4;
    Check(IDASetInitStep(mem, h0), "IDASetInitStep");
    last_ida_message_.clear();
    ArmStopTime(t_restart_);
    SetRootDirections();
    return true;
  }

  // How far valve k is past its rule at (t, y), in units of its settling
  // tolerance ε: on needs i ≥ Ih − ε, armed-off needs v ≤ Vf + ε; 0 or less
  // when it keeps the rule, and for valves no rule applies to (failed, or
  // blocking without a gate).
  double Breach(std::size_t k, double t, const double* y) const {
    const Valve& v = *valves_[k].valve;
    const bool on = states_[v.switch_slot()];
    if (forced_[k] || (!on && !Armed(static_cast<int>(k), t))) return 0.0;
    return on ? (v.params().i_h - v.Current(y)) / eps_i_ - 1.0 : (v.Voltage(y) - v.params().v_f) / eps_v_ - 1.0;
  }

  double WorstViolation(double t, const double* y) const {
    double worst = 0.0;
    for (std::size_t k = 0; k < valves_.size(); ++k) worst = std::max(worst, Breach(k, t, y));
    return worst;
  }

  // Flips `flagged` valves, then settles the configuration (see header).
  bool Settle(double t, const std::vector<int>& flagged) {
    double* y = N_VGetArrayPointer(y_.get());
    double* yp = N_VGetArrayPointer(yp_.get());
    // A valve whose current has just crossed zero sits at zero voltage; any
    // forward voltage the solve then shows is rounding (or Roff leakage of
    // the others), not a reason to fire it again at the same instant.
    std::vector<char> just_off(valves_.size(), 0);
    for (int k : flagged) {
      Flip(t, k);
      just_off[k] = !states_[valves_[k].valve->switch_slot()];
    }
    std::set<std::vector<std::uint8_t>> seen;
    std::vector<int> flipped;
    for (int iteration = 0;; ++iteration) {
      mna_.SetSwitchStates(states_);
      std::string error;
      if (!mna_.SolveConsistent(t, y, yp, &error)) {
        Fail(error + ValveStateText());
        return false;
      }
      int worst = -1;
      double worst_violation = 0.0;
      for (std::size_t k = 0; k < valves_.size(); ++k) {
        const bool on = states_[valves_[k].valve->switch_slot()];
        if (!on && just_off[k]) continue;
        // Compared across valves per unit of the circuit's scale, so that
        // currents and voltages rank together.
        const double violation = Breach(k, t, y) * (on ? eps_i_ / i_ref_ : eps_v_ / v_ref_);
        if (violation > worst_violation) {
          worst_violation = violation;
          worst = static_cast<int>(k);
        }
      }
      if (worst < 0) return true;
      if (iteration >= options_.events.max_settle_iterations || !seen.insert(states_).second) {
        Fail(fmt::format("no consistent valve configuration at t = {:.9g} s: valves {} keep "
                         "switching each other",
                         t, ValveNames(flipped)));
        return false;
      }
      Flip(t, worst);
      flipped.push_back(worst);
    }
  }

  void Flip(double t, int k) {
    const Valve& v = *valves_[k].valve;
    auto& state = states_[v.switch_slot()];
    state = !state;
    SwitchEvent::Cause cause = SwitchEvent::Cause::kTurnOff;
    if (state) {
      cause = SwitchEvent::Cause::kNatural;
      if (v.type() == Valve::Type::kThyristor)
        cause = GateActive(v, t) ? SwitchEvent::Cause::kGate : SwitchEvent::Cause::kRecoveryFailure;
      awaiting_forward_[k] = 0;
    } else {
      t_off_[k] = t;
      recover_until_[k] = t + v.params().t_q;
      awaiting_forward_[k] = v.type() == Valve::Type::kThyristor;
    }
    if (trace_) {
      const double* y = N_VGetArrayPointer(y_.get());
      std::fprintf(stderr, "lccsim trace: t = %.12g s  %s -> %s  (i = %.6g A, v = %.6g V)\n", t,
                   v.name().c_str(), state ? "on" : "off", v.Current(y), v.Voltage(y));
    }
    result_.events.push_back({t, valves_[k].device, state != 0, cause});
    ++result_.summary.switchings;
  }

  // -- gates ------------------------------------------------------------------

  // Valve 1's natural commutation instant within [0, T) for each firing
  // element: from the open-circuit (phasor) voltages at its bridge's AC
  // terminals, where v_a − v_c rises through zero, so that transformer phase
  // shifts are included; without a bridge, 30° after the sync supply's
  // phase-a EMF rises through zero.
  void ComputeFiringReferences() {
    const auto& firings = circuit_->firings();
    result_.firing_reference.assign(firings.size(), 0.0);
    if (firings.empty() || period_ <= 0) return;
    const double w = 2 * std::numbers::pi / period_;
    for (std::size_t f = 0; f < firings.size(); ++f) {
      if (firings[f].measured_sync()) continue;  // timed by its PLL instead
      double angle = 0.0;  // ω·t1
      if (firings[f].group >= 0 && StartPhasor()) {
        const auto& group = circuit_->valve_groups()[firings[f].group];
        const int a = circuit_->devices()[group.devices[0]]->nodes()[0];  // valve 1's anode
        const int b = circuit_->devices()[group.devices[2]]->nodes()[0];  // valve 3's anode
        const int c = circuit_->devices()[group.devices[4]]->nodes()[0];  // valve 5's anode
        // Its line voltage a−c is V₁·(1 − h), h = e^(j120°): an unbalanced
        // supply still gives equidistant pulses on its positive sequence.
        const std::complex<double> h = std::polar(1.0, 2 * std::numbers::pi / 3);
        angle = -std::numbers::pi / 2 - std::arg(PositiveSequence(a, b, c) * (1.0 - h));
      } else {
        const auto& e = static_cast<const SourceBranch&>(*circuit_->devices()[firings[f].supply_phase_device]).waveform();
        const double phase = e.sines.empty() ? 0.0 : e.sines.front().phase;
        angle = std::numbers::pi / 6 - phase;
      }
      angle = std::fmod(angle, 2 * std::numbers::pi);
      if (angle < 0) angle += 2 * std::numbers::pi;
      result_.firing_reference[f] = angle / w;
    }
  }

  // The fundamental phasor of every unknown with all valves blocking, solved
  // once at start-up for the firing references and the PLLs' start.
  const Eigen::VectorXcd* StartPhasor() {
    if (!start_phasor_solved_) {
      start_phasor_solved_ = true;
      start_phasor_ok_ = SolveHarmonicPhasor(mna_, 1.0 / period_, 1, &start_phasor_);
    }
    return start_phasor_ok_ ? &start_phasor_ : nullptr;
  }

  // Positive-sequence phase-a phasor of three nodes' start phasors,
  // V₁ = (V_a + h·V_b + h²·V_c)/3 with h = e^(j120°).
  std::complex<double> PositiveSequence(int a, int b, int c) {
    const Eigen::VectorXcd* phasor = StartPhasor();
    auto v = [&](int node) { return node > 0 && phasor ? (*phasor)[NodeUnknown(node)] : std::complex<double>(0.0); };
    const std::complex<double> h = std::polar(1.0, 2 * std::numbers::pi / 3);
    return (v(a) + h * v(b) + h * h * v(c)) / 3.0;
  }

  // The electrical angle of a firing element's timing frame at t: zero at
  // the natural commutation instant of valve 1. Ideal: from the reference
  // instant; measured: the PLL's angle (extrapolated from its last update)
  // plus 60°, valve 1's natural instant being at θ = −60° of phase a.
  double FiringAngle(int f, double t) const {
    if (circuit_->firings()[f].measured_sync()) {
      const Pll& p = pll_[f];
      return p.theta + p.omega * (t - p.t) + std::numbers::pi / 3;
    }
    return 2 * std::numbers::pi / period_ * (t - result_.firing_reference[f]);
  }
  double FiringSpeed(int f) const {
    return circuit_->firings()[f].measured_sync() ? pll_[f].omega : 2 * std::numbers::pi / period_;
  }

  // Angle since the start of pulse g (in [0, 2π)).
  double PulseAngle(const GateRef& g, double t) const {
    const double start = (g.pulse - 1) * std::numbers::pi / 3 + alpha_now_[g.firing];
    double x = std::fmod(FiringAngle(g.firing, t) - start, 2 * std::numbers::pi);
    if (x < 0) x += 2 * std::numbers::pi;
    return x;
  }

  bool GateActive(const Valve& v, double t) const {
    if (v.type() != Valve::Type::kThyristor || v.gate().firing < 0 || period_ <= 0) return false;
    const Firing& f = circuit_->firings()[v.gate().firing];
    const double x = PulseAngle(v.gate(), t);
    // The pulse includes its own start instant, whatever rounding did to t.
    constexpr double kSlack = 1e-9 * 2 * std::numbers::pi;
    return x < f.width || x > 2 * std::numbers::pi - kSlack;
  }

  // May valve k turn on now? Diodes always; thyristors while their gate
  // pulse is on or while they have not recovered.
  bool Armed(int k, double t) const {
    const Valve& v = *valves_[k].valve;
    if (v.type() != Valve::Type::kThyristor) return true;
    return GateActive(k, t) || t < recover_until_[k];
  }

  // The gate of valve k, unless a misfire has taken this pulse away.
  bool GateActive(int k, double t) const {
    if (t >= suppressed_from_[k] && t < suppressed_until_[k]) return false;
    return GateActive(*valves_[k].valve, t);
  }

  // At a gate edge: the pulses that start now and that a misfire takes away.
  void RegisterMisfires(double t) {
    for (std::size_t k = 0; k < valves_.size(); ++k) {
      if (misfire_left_[k] <= 0 || t < misfire_from_[k]) continue;
      const Valve& v = *valves_[k].valve;
      if (v.type() != Valve::Type::kThyristor || v.gate().firing < 0) continue;
      const double x = PulseAngle(v.gate(), t);
      if (x > 1e-6 && x < 2 * std::numbers::pi - 1e-6) continue;  // not starting now
      const double width = circuit_->firings()[v.gate().firing].width;
      suppressed_from_[k] = t - 1e-9 * period_;
      suppressed_until_[k] = t + width / FiringSpeed(v.gate().firing);
      --misfire_left_[k];
      result_.actions.emplace_back(t, fmt::format("{}: gate pulse lost (misfire)", v.name()));
    }
  }

  int ValveIndex(int device) const {
    for (std::size_t k = 0; k < valves_.size(); ++k)
      if (valves_[k].device == device) return static_cast<int>(k);
    return -1;
  }

  // Applies every action due at t (engine/actions.h), then settles.
  bool ApplyActions(double t) {
    while (next_action_ < actions_.size() && actions_[next_action_].t <= t) {
      const EngineAction& a = actions_[next_action_++];
      result_.actions.emplace_back(t, a.text);
      switch (a.kind) {
        case EngineAction::Kind::kSwitch: {
          const Device& d = *circuit_->devices()[a.device];
          if (static_cast<bool>(states_[d.switch_slot()]) != a.closed) {
            states_[d.switch_slot()] = a.closed;
            result_.events.push_back({t, a.device, a.closed, SwitchEvent::Cause::kAction});
            ++result_.summary.switchings;
          }
          break;
        }
        case EngineAction::Kind::kValveOpen:
        case EngineAction::Kind::kValveShort: {
          const int k = ValveIndex(a.device);
          if (k < 0) break;
          const bool on = a.kind == EngineAction::Kind::kValveShort;
          forced_[k] = on ? 2 : 1;
          auto& state = states_[valves_[k].valve->switch_slot()];
          if (static_cast<bool>(state) != on) {
            state = on;
            result_.events.push_back({t, a.device, on, SwitchEvent::Cause::kAction});
            ++result_.summary.switchings;
          }
          break;
        }
        case EngineAction::Kind::kMisfire:
          for (std::size_t k = 0; k < valves_.size(); ++k) {
            const GateRef& g = valves_[k].valve->gate();
            if (g.firing == a.firing && g.pulse == a.pulse) {
              misfire_left_[k] += a.pulses;
              misfire_from_[k] = t;
            }
          }
          break;
        case EngineAction::Kind::kRebind: {
          std::string error;
          if (!mna_.Rebind(*a.circuit, &error)) {
            Fail(fmt::format("{} ({} at t = {:.9g} s)", error, a.text, t));
            return false;
          }
          const Circuit* old = circuit_;
          circuit_ = a.circuit;
          study_ = a.study;
          for (auto& v : valves_) v.valve = static_cast<const Valve*>(circuit_->devices()[v.device].get());
          for (std::size_t f = 0; f < circuit_->firings().size(); ++f) {
            const Firing& now = circuit_->firings()[f];
            if (now.regulate_probe < 0 && now.alpha != old->firings()[f].alpha) alpha_now_[f] = now.alpha;
          }
          result_.final_alpha = alpha_now_;
          sink_.OnProbesChange(study_->probes);
          SelectOutputs();
          break;
        }
      }
    }
    next_gate_edge_ = NextGateEdge(t);
    return HandleEvent(t, {}, /*force=*/true);
  }

  // Sampled PI regulators (see Firing in models/circuit.h).
  // Returns true if some delay angle changed.
  bool Regulate(double t) {
    bool changed = false;
    const auto& firings = circuit_->firings();
    const double* y = N_VGetArrayPointer(y_.get());
    const double* yp = N_VGetArrayPointer(yp_.get());
    for (std::size_t f = 0; f < firings.size(); ++f) {
      const Firing& fr = firings[f];
      if (fr.regulate_probe < 0) continue;
      const double dt = t - last_regulation_[f];
      // One sample a pulse. A delay that grew at this pulse's start moves
      // that start a little later, and IDA stops there again: that is the
      // same pulse, not a new sample (whose mean over a few microseconds
      // would be the instantaneous ripple, and alpha would swing from one
      // edge to the other every pulse).
      if (period_ > 0 && dt < period_ / 12.0) continue;
      ++result_.summary.regulator_samples;
      last_regulation_[f] = t;
      // The measurement is the probe's mean since the last sample (a
      // synchronously sampled average, as drive controllers measure), not
      // its instantaneous value, which carries the six-pulse ripple.
      const double measured = dt > 0 ? regulated_integral_[f] / dt
                                     : EvaluateProbe(study_->probes[fr.regulate_probe], y, yp);
      regulated_integral_[f] = 0.0;
      const double error = fr.target - measured;
      const double unlimited = fr.alpha - fr.kp * error - fr.ki * (integral_[f] + error * dt);
      // Anti-windup: the integral moves only while the output is not limited
      // in the direction the error pushes it.
      if (unlimited > fr.alpha_min && unlimited < fr.alpha_max) integral_[f] += error * dt;
      const double alpha = std::clamp(fr.alpha - fr.kp * error - fr.ki * integral_[f], fr.alpha_min, fr.alpha_max);
      changed |= alpha != alpha_now_[f];
      alpha_now_[f] = alpha;
    }
    result_.final_alpha = alpha_now_;
    return changed;
  }

  // γ control: one step of alpha per measured extinction interval.
  void ControlExtinction(const Valve& v, double interval, double t) {
    const int f = v.gate().firing;
    if (f < 0 || period_ <= 0) return;
    const Firing& fr = circuit_->firings()[f];
    if (fr.gamma <= 0) return;
    const double gamma = 2 * std::numbers::pi / period_ * interval;
    constexpr double kMaxStep = 2.0 * std::numbers::pi / 180.0;
    const double step = std::clamp(0.5 * (gamma - fr.gamma), -kMaxStep, kMaxStep);
    alpha_now_[f] = std::clamp(alpha_now_[f] + step, fr.alpha_min, fr.alpha_max);
    result_.final_alpha = alpha_now_;
    next_gate_edge_ = NextGateEdge(t);
    ArmStopTime(t);
  }

  // Adds ∫probe dt over the step just taken for every regulated probe:
  // Simpson's rule with the midpoint from IDA's interpolating polynomial
  // when the step is IDA's last one (the usual case), else the trapezoid
  // rule. The trapezoid's error on the converter ripple, h³·x''/12 a step,
  // is of the order of the integrator's tolerance times the ripple; the
  // regulator's gain carries it into alpha and it showed as cycle-to-cycle
  // noise of the delay angle (about 4e-5 rad) at the level the steady-state
  // test looks for. Simpson's error is h⁵ smaller in the same way.
  void AccumulateRegulated(double t_new) {
    const auto& firings = circuit_->firings();
    if (regulated_integral_.empty()) return;
    const double* y = N_VGetArrayPointer(y_.get());
    const double* yp = N_VGetArrayPointer(yp_.get());
    const double h = t_new - last_step_time_;
    bool simpson = false;
    if (h > 0 && ida_) {
      double t_ida = 0.0, h_last = 0.0;
      IDAGetCurrentTime(ida_.get(), &t_ida);
      IDAGetLastStep(ida_.get(), &h_last);
      const double mid = last_step_time_ + 0.5 * h;
      simpson = last_step_time_ >= t_restart_ && last_step_time_ >= t_ida - h_last * (1 + 1e-12) && t_new <= t_ida &&
                IDAGetDky(ida_.get(), mid, 0, work_.get()) == IDA_SUCCESS &&
                (!wants_regulated_derivative_ || IDAGetDky(ida_.get(), mid, 1, work_p_.get()) == IDA_SUCCESS);
    }
    for (std::size_t f = 0; f < firings.size(); ++f) {
      if (firings[f].regulate_probe < 0) continue;
      const Probe& probe = study_->probes[firings[f].regulate_probe];
      const double value = EvaluateProbe(probe, y, yp);
      if (simpson) {
        const double middle = EvaluateProbe(probe, N_VGetArrayPointer(work_.get()), N_VGetArrayPointer(work_p_.get()));
        regulated_integral_[f] += h / 6.0 * (last_regulated_value_[f] + 4.0 * middle + value);
      } else if (h > 0) {
        regulated_integral_[f] += 0.5 * (value + last_regulated_value_[f]) * h;
      }
      last_regulated_value_[f] = value;
    }
    last_step_time_ = t_new;
  }

  // IDA stops at the end of the run and at every gate pulse start; the
  // next one is re-armed from wherever the run now is (an event may have
  // carried it past a pulse start, which Settle() has then covered).
  void ArmStopTime(double t) {
    // The relaxation step after an event may have moved IDA a little past t.
    t = std::max(t, t_restart_);
    if (next_gate_edge_ <= t && !pulse_due_now_) next_gate_edge_ = NextGateEdge(t);
    double stop = std::min(t_end_, next_gate_edge_);
    if (next_action_ < actions_.size() && actions_[next_action_].t > t) stop = std::min(stop, actions_[next_action_].t);
    // Shooting starts from a cycle boundary exactly.
    if (shooting_armed_ && next_boundary_ > t) stop = std::min(stop, next_boundary_);
    // After a root return that changed nothing (a blocking thyristor's
    // voltage turning positive) IDA is not restarted, and its own time is
    // the end of the step that held the root, ahead of t. A PLL update can
    // then bring the next gate edge inside that step: it is taken where IDA
    // is (late by less than a step), since IDA refuses a stop time behind it.
    double t_ida = t;
    IDAGetCurrentTime(ida_.get(), &t_ida);
    stop = std::max(stop, t_ida);
    Check(IDASetStopTime(ida_.get(), stop), "IDASetStopTime");
  }

  // The first gate pulse start after t.
  double NextGateEdge(double t) const {
    double next = std::numeric_limits<double>::infinity();
    if (period_ <= 0) return next;
    for (const auto& ref : valves_) {
      const Valve& v = *ref.valve;
      if (v.type() != Valve::Type::kThyristor || v.gate().firing < 0) continue;
      double to_go = 2 * std::numbers::pi - PulseAngle(v.gate(), t);
      if (to_go < 1e-9) to_go += 2 * std::numbers::pi;
      next = std::min(next, t + to_go / FiringSpeed(v.gate().firing));
    }
    return next;
  }

  // -- phase-locked loops ---------------------------------------------------

  // The state of one SRF-PLL: angle θ of the measured positive-sequence
  // phase-a voltage (cos reference), its speed ω, the integral part of ω.
  struct Pll {
    double t = 0.0, theta = 0.0, omega = 0.0, integral = 0.0;
    double unwrapped = 0.0;  // θ without the modulo, for the mean frequency
  };

  // Clarke components (v_α, v_β) of the measured voltages in y.
  std::pair<double, double> Clarke(const Firing& f, const double* y) const {
    auto v = [&](int node) { return node > 0 ? y[NodeUnknown(node)] : 0.0; };
    const double a = v(f.pll_nodes[0]), b = v(f.pll_nodes[1]), c = v(f.pll_nodes[2]);
    return {(2.0 / 3.0) * (a - 0.5 * b - 0.5 * c), (1.0 / std::sqrt(3.0)) * (b - c)};
  }

  // Each loop starts locked to the positive sequence of the open-circuit
  // voltages at its nodes (from the phasor solution), as a controller is
  // synchronised before it releases pulses; the first instantaneous sample
  // can be far off while the valves take up the load.
  void StartPlls() {
    const auto& firings = circuit_->firings();
    pll_.assign(firings.size(), {});
    for (std::size_t f = 0; f < firings.size(); ++f) {
      const Firing& fr = firings[f];
      if (!fr.measured_sync()) continue;
      // y(t) ∋ Re(V·e^(jωt)): the cos-reference angle of phase a at t = 0.
      const double theta = std::arg(PositiveSequence(fr.pll_nodes[0], fr.pll_nodes[1], fr.pll_nodes[2]));
      pll_[f] = {0.0, theta, 2 * std::numbers::pi * fr.pll_frequency, 0.0, theta};
    }
  }

  // Advances every PLL to t from the solution there: the normalised q-axis
  // voltage ε = v_q/|v_dq| ≈ sin(θ_measured − θ) drives a PI,
  //   ω = ω0 + kp·ε + ki·∫ε dt,  θ' = ω,  kp = 2ζω_n, ki = ω_n² (ζ = 1/√2),
  // updated once per integration step (steps are far shorter than 1/ω_n).
  void UpdatePlls(double t, const double* y) {
    const auto& firings = circuit_->firings();
    bool any = false;
    for (std::size_t f = 0; f < firings.size(); ++f) {
      const Firing& fr = firings[f];
      if (!fr.measured_sync()) continue;
      Pll& p = pll_[f];
      const double h = t - p.t;
      if (h <= 0) continue;
      const double theta = p.theta + p.omega * h;  // predicted
      const auto [alpha, beta] = Clarke(fr, y);
      const double vd = alpha * std::cos(theta) + beta * std::sin(theta);
      const double vq = -alpha * std::sin(theta) + beta * std::cos(theta);
      const double norm = std::hypot(vd, vq);
      const double eps = norm > 0 ? vq / norm : 0.0;
      const double wn = fr.pll_bandwidth;
      const double kp = std::sqrt(2.0) * wn, ki = wn * wn;
      p.integral += ki * eps * h;
      p.omega = 2 * std::numbers::pi * fr.pll_frequency + kp * eps + p.integral;
      p.theta = std::fmod(p.theta + p.omega * h, 2 * std::numbers::pi);
      p.unwrapped += p.omega * h;
      p.t = t;
      any = true;
      // The update moves the predicted pulse starts. One that it brings to
      // t (within NextGateEdge's guard) or behind it, into the step just
      // taken that ended short of the old prediction, is due now: the next
      // start would be a whole pulse on, and the valve's forward voltage,
      // positive already, would have no sign change left to fire on. (A
      // start already taken, inferred back from the new angle within a
      // thousandth of a period, is not.)
      for (const auto& ref : valves_) {
        const GateRef& g = ref.valve->gate();
        if (ref.valve->type() != Valve::Type::kThyristor || g.firing != static_cast<int>(f)) continue;
        const double x = PulseAngle(g, t);
        const double start = t - x / p.omega;
        const bool at_t = x > 2 * std::numbers::pi - 1e-9;
        const bool in_step = start >= t - h && start > last_gate_edge_ + 1e-3 * period_;
        if (at_t || in_step) pulse_due_now_ = true;
      }
    }
    if (pulse_due_now_) {
      next_gate_edge_ = t;  // taken by the main loop right away
    } else if (any) {
      next_gate_edge_ = NextGateEdge(t);
      ArmStopTime(t);
    }
  }

  // "B1[1], B1[3]": the distinct names of the valves with these indices.
  std::string ValveNames(const std::vector<int>& indices) const {
    std::set<std::string> names;
    for (int k : indices) names.insert(valves_[k].valve->name());
    std::string list;
    for (const auto& name : names) list += (list.empty() ? "" : ", ") + name;
    return list;
  }

  // The switchings of the last two largest steps before t: what was
  // happening when a run failed.
  std::string RecentSwitchingText(double t) const {
    const double since = t - 2 * result_.summary.max_step_used;
    std::string text;
    int shown = 0;
    for (auto it = result_.events.rbegin(); it != result_.events.rend() && it->t >= since && shown < 8; ++it, ++shown)
      text = fmt::format("{} {} at {:.9g} s{}{}", circuit_->devices()[it->device]->name(), it->on ? "on" : "off",
                         it->t, text.empty() ? "" : ", ", text);
    return text.empty() ? "; no valve switched in the last two steps" : "; switching just before: " + text;
  }

  std::string ValveStateText() const {
    std::string on;
    for (const auto& v : valves_)
      if (states_[v.valve->switch_slot()]) on += (on.empty() ? "" : ", ") + v.valve->name();
    return on.empty() ? "" : "; conducting valves: " + on;
  }

  void SetRootDirections() {
    std::vector<int> dir(2 * valves_.size());
    for (std::size_t k = 0; k < valves_.size(); ++k)
      dir[2 * k] = dir[2 * k + 1] = states_[valves_[k].valve->switch_slot()] ? -1 : 1;
    Check(IDASetRootDirection(ida_.get(), dir.data()), "IDASetRootDirection");
  }

  // -- outputs and cycles -------------------------------------------------------

  // What the sink reads decides what each sample computes.
  void SelectOutputs() {
    const auto read = sink_.unknowns_read();
    reads_nothing_ = read && read->empty();
    if (read) mna_.SetOutputUnknowns(*read);
  }

  void EmitSamples(double t, double dt) {
    if (trial_start_) return;  // a trial period of shooting keeps no samples
    void* mem = ida_.get();
    const double slack = 1e-9 * dt;  // so that a sample at exactly t_end is not lost to rounding
    // IDA's interpolant of order q between steps of size h misses a
    // sinusoid of the fundamental by about (ω·h)^(q+1)/(q+1)!. That is
    // negligible for the states IDA controls, but the algebraic unknowns
    // follow the sources too; where the estimate exceeds the relative
    // tolerance (low order after a restart, or a circuit with few states),
    // they are recomputed exactly from the states (MnaSystem::RecomputeAlgebraic).
    bool recompute_algebraic = true;
    if (period_ > 0) {
      double h = 0.0;
      int q = 1;
      IDAGetLastStep(mem, &h);
      IDAGetLastOrder(mem, &q);
      const double wh = 2.0 * std::numbers::pi / period_ * h;
      recompute_algebraic = std::pow(wh, q + 1) / std::tgamma(q + 2.0) > study_->simulate->reltol;
    }
    while (true) {
      const double ts = next_sample_ * dt;
      if (ts > t + slack || ts > t_end_ + slack) break;
      const double tq = std::min(ts, t);
      const double* yp = nullptr;
      if (!reads_nothing_) {
        Check(IDAGetDky(mem, tq, 0, work_.get()), "IDAGetDky");
        if (recompute_algebraic) mna_.RecomputeAlgebraic(tq, N_VGetArrayPointer(work_.get()));
        if (wants_derivatives_) {
          Check(IDAGetDky(mem, tq, 1, work_p_.get()), "IDAGetDky");
          yp = N_VGetArrayPointer(work_p_.get());
        }
      }
      sink_.OnSample(ts, N_VGetArrayPointer(work_.get()), yp);
      ++next_sample_;
      ++result_.summary.samples;
    }
  }

  // Samples up to t from a state rather than from IDA's interpolant.
  void EmitStateSamples(double t, const double* y, const double* yp) {
    if (trial_start_) return;
    const double dt = result_.summary.sample_used;
    while (next_sample_ * dt <= t) {
      sink_.OnSample(next_sample_ * dt, y, wants_derivatives_ ? yp : nullptr);
      ++next_sample_;
      ++result_.summary.samples;
    }
  }

  std::vector<double> DifferentialState(const double* y) const {
    std::vector<double> x;
    for (int k : mna_.differential_indices()) x.push_back(y[k]);
    return x;
  }

  void TrackCycles(double t) {
    if (!study_->steady || period_ <= 0 || result_.summary.steady_reached || trial_start_) return;
    const double* y = N_VGetArrayPointer(y_.get());
    const auto& diff = mna_.differential_indices();
    for (std::size_t i = 0; i < diff.size(); ++i)
      cycle_peak_[i] = std::max(cycle_peak_[i], std::abs(y[diff[i]]));
    while (next_boundary_ <= t && !result_.summary.steady_reached) {
      // A boundary inside the relaxation step after an event is read at the
      // restart instant, IDA's interpolant not reaching back before it.
      Check(IDAGetDky(ida_.get(), std::max(next_boundary_, t_restart_), 0, work_.get()), "IDAGetDky");
      std::vector<double> x = DifferentialState(N_VGetArrayPointer(work_.get()));
      double sum = 0.0;
      for (std::size_t i = 0; i < x.size(); ++i) {
        const double w = study_->steady->tol * cycle_peak_[i] + AbsoluteTolerance(diff[i]);
        const double e = (x[i] - previous_state_[i]) / w;
        sum += e * e;
      }
      // The regulators' delay angles are states too: a loop still settling
      // is not a steady state.
      for (std::size_t f = 0; f < alpha_now_.size(); ++f) {
        const double e = (alpha_now_[f] - previous_alpha_[f]) / (study_->steady->tol * std::numbers::pi);
        sum += e * e;
      }
      previous_alpha_ = alpha_now_;
      // So are the phase-locked loops: their speed must have settled.
      // A loop is settled when its mean frequency over the cycle is the
      // supply's within kPllSteadyTolerance: its instantaneous speed
      // carries the ripple of any unbalance and of the commutation notches.
      constexpr double kPllSteadyTolerance = 1e-4;
      std::size_t loops = 0;
      previous_pll_angle_.resize(pll_.size(), 0.0);
      for (std::size_t f = 0; f < pll_.size(); ++f) {
        if (pll_[f].omega == 0.0) continue;
        const Pll& p = pll_[f];
        const double angle = p.unwrapped + p.omega * (next_boundary_ - p.t);
        const double mean_speed = (angle - previous_pll_angle_[f]) / period_;
        const double w0 = 2 * std::numbers::pi / period_;
        const double e = (mean_speed - w0) / (kPllSteadyTolerance * w0);
        previous_pll_angle_[f] = angle;
        sum += e * e;
        ++loops;
      }
      const std::size_t count = x.size() + alpha_now_.size() + loops;
      const double wrms = count == 0 ? 0.0 : std::sqrt(sum / static_cast<double>(count));
      agreeing_cycles_ = wrms <= 1.0 ? agreeing_cycles_ + 1 : 0;
      // A case's actions are part of the run: steady counts only once the
      // last of them has been applied (the cycles after a load step).
      if (next_action_ < actions_.size() || (!actions_.empty() && next_boundary_ <= actions_.back().t + period_))
        agreeing_cycles_ = 0;
      // Shooting (never in a case with actions), if IDA stopped on this
      // boundary (it is asked to) and the run is not about to be steady.
      // Not at the run's end: nothing would be left to simulate from the
      // state found (and IDA refuses to step from t_end to t_end).
      if (shooting_armed_ && agreeing_cycles_ == 0 && t == next_boundary_ && t >= shoot_not_before_ &&
          t < t_end_ - 1e-9 * result_.summary.sample_used) {
        shoot_now_ = true;
        last_cycle_peak_ = cycle_peak_;
      }
      if (agreeing_cycles_ >= 2) {
        auto& s = result_.summary;
        s.steady_reached = true;
        s.steady_time = next_boundary_;
        double until = next_boundary_ + study_->steady->cycles * period_;
        if (study_->window) until = std::max(until, study_->window->to);  // a chosen window is recorded whole
        t_end_ = std::min(study_->simulate->stop, until);
        if (t_end_ <= t) t_end_ = t;
        // A gate pulse due now is handled (and the stop time re-armed) by
        // the main loop right after this.
        else if (next_gate_edge_ > t) ArmStopTime(t);
      }
      previous_state_ = x;
      for (std::size_t i = 0; i < x.size(); ++i) cycle_peak_[i] = std::abs(x[i]);
      next_boundary_ += period_;
    }
  }

  // The states' absolute tolerances from the currents and voltages that
  // actually flow, once a period has shown them
  // (EngineOptions::Tolerances::scale_from_states). The circuit-wide scale
  // set at the start (largest voltage over smallest resistance) is safe
  // but can be thousands of times those currents; then the error test
  // hardly sees them, and figures such as the overlap angle or the DC
  // ripple come out off by more than the tolerance asked for, differently
  // in each cycle.
  void TightenTolerances(double t) {
    if (!options_.tolerances.scale_from_states || period_ <= 0 || trial_start_) return;
    const double* y = N_VGetArrayPointer(y_.get());
    const auto& diff = mna_.differential_indices();
    for (int k : diff) {
      double& peak = IsNodeVoltage(k) ? peak_state_voltage_ : peak_state_current_;
      peak = std::max(peak, std::abs(y[k]));
    }
    if (t < next_tolerance_boundary_) return;
    next_tolerance_boundary_ = (std::floor(t / period_) + 1.0) * period_;
    // One scale per kind, not one per state: a state's own size would hold
    // a magnetising current or a near-idle branch to microamperes, which
    // the perturbed trial periods of shooting cannot always integrate.
    const double unit = study_->simulate->reltol * options_.tolerances.abstol_fraction;
    for (int k : diff) {
      const double scaled = unit * (IsNodeVoltage(k) ? peak_state_voltage_ : peak_state_current_);
      if (scaled > 0.0) tolerance_[k] = std::min(atol_[k], scaled);
    }
    peak_state_voltage_ = peak_state_current_ = 0.0;
  }

  // Unknowns below the node count are node voltages, the rest currents:
  // the two kinds of state whose scales the tolerances and shooting use.
  bool IsNodeVoltage(int k) const { return k < circuit_->num_nodes() - 1; }

  // Unknown k's absolute tolerance in force. The steady-state test and the
  // shooting weights take it as their floor: the circuit-wide one (tens of
  // amperes on a 33 kV supply with a 1 mΩ reactor) would call a current
  // still moving by amperes a cycle steady.
  double AbsoluteTolerance(int k) const { return tolerance_[k]; }

  // -- shooting for the steady state (engine/shooting.h) --------------------

  // The firing elements whose delay angle is a state: a current regulator's
  // (with its integral and the probe's running integral), or one holding
  // an extinction angle.
  bool Regulated(std::size_t f) const { return circuit_->firings()[f].regulate_probe >= 0; }
  bool Controlled(std::size_t f) const { return Regulated(f) || circuit_->firings()[f].gamma > 0; }

  CycleState CaptureCycleState(double t) const {
    CycleState c;
    c.x = DifferentialState(N_VGetArrayPointer(y_.get()));
    c.switches = states_;
    for (double r : recover_until_) c.recover_left.push_back(r > t ? r - t : -1.0);
    c.alpha = alpha_now_;
    c.integral = integral_;
    c.atol = tolerance_;
    const std::size_t firings = circuit_->firings().size();
    c.regulated_integral.assign(firings, 0.0);
    c.last_value.assign(firings, 0.0);
    c.since_sample.assign(firings, 0.0);
    for (std::size_t f = 0; f < firings; ++f)
      if (Regulated(f)) {
        c.regulated_integral[f] = regulated_integral_[f];
        c.last_value[f] = last_regulated_value_[f];
        c.since_sample[f] = t - last_regulation_[f];
      }
    return c;
  }

  // Everything but the unknowns (which the caller sets) from `c`, at t.
  // `sample_from_alpha` (trial periods): the regulators' last sample is put
  // at the last pulse start under c's delay angle, not c.since_sample
  // before t. The time since the last sample follows the delay angle; kept
  // as captured, it would go stale when a Newton step moves alpha, and the
  // trial would no longer be the circuit's period map. The main run,
  // continuing from a trial's end, takes the time that trial recorded.
  void LoadCycleState(const CycleState& c, double t, bool sample_from_alpha) {
    states_ = c.switches;
    for (std::size_t k = 0; k < recover_until_.size(); ++k)
      recover_until_[k] = c.recover_left[k] >= 0 ? t + c.recover_left[k] : -1.0;
    alpha_now_ = c.alpha;
    integral_ = c.integral;
    for (std::size_t f = 0; f < alpha_now_.size(); ++f)
      if (Regulated(f)) {
        regulated_integral_[f] = c.regulated_integral[f];
        last_regulated_value_[f] = c.last_value[f];
        double since = c.since_sample[f];
        if (sample_from_alpha) {
          since = std::fmod(FiringAngle(static_cast<int>(f), t) - alpha_now_[f], std::numbers::pi / 3);
          if (since < 0) since += std::numbers::pi / 3;
          since /= FiringSpeed(static_cast<int>(f));
        }
        last_regulation_[f] = t - since;
      }
    last_step_time_ = t;
    result_.final_alpha = alpha_now_;
  }

  // The Newton unknowns of a cycle state: the differential unknowns, then
  // per controlled firing its delay angle and, for a regulator, its
  // integral (if ki acts on it) and the probe's running integral.
  Eigen::VectorXd Pack(const CycleState& c) const {
    std::vector<double> z = c.x;
    for (std::size_t f = 0; f < c.alpha.size(); ++f) {
      if (!Controlled(f)) continue;
      z.push_back(c.alpha[f]);
      if (!Regulated(f)) continue;
      if (circuit_->firings()[f].ki != 0) z.push_back(c.integral[f]);
      z.push_back(c.regulated_integral[f]);
    }
    return Eigen::Map<const Eigen::VectorXd>(z.data(), static_cast<Eigen::Index>(z.size()));
  }
  CycleState Unpack(const Eigen::VectorXd& z, CycleState c) const {
    Eigen::Index k = 0;
    for (double& x : c.x) x = z[k++];
    for (std::size_t f = 0; f < c.alpha.size(); ++f) {
      if (!Controlled(f)) continue;
      c.alpha[f] = z[k++];
      if (!Regulated(f)) continue;
      if (circuit_->firings()[f].ki != 0) c.integral[f] = z[k++];
      c.regulated_integral[f] = z[k++];
    }
    return c;
  }

  // Each Newton unknown's tolerance (as the steady-state test weighs it)
  // and its scale (for the finite-difference steps).
  void ShootingWeights(const CycleState& c, Eigen::VectorXd* weights, Eigen::VectorXd* scales) const {
    const double tol = study_->steady->tol;
    std::vector<double> w, sc;
    const auto& diff = mna_.differential_indices();
    double peak_voltage = 0.0, peak_current = 0.0;
    for (std::size_t i = 0; i < diff.size(); ++i) {
      double& peak = IsNodeVoltage(diff[i]) ? peak_voltage : peak_current;
      peak = std::max(peak, last_cycle_peak_[i]);
    }
    for (std::size_t i = 0; i < diff.size(); ++i) {
      w.push_back(tol * last_cycle_peak_[i] + AbsoluteTolerance(diff[i]));
      // The finite-difference scale: the largest state of its kind over the
      // last period, one scale per kind as for the tolerances
      // (TightenTolerances). It was the circuit-wide tolerance over `tol`,
      // 10⁷ A on the electrolyser demo (33 kV over a 0.2 mΩ valve): the
      // perturbed periods started with kiloamperes of reverse current in
      // conducting valves, a storm of flips, and one failed, and the
      // "derivatives" were secants across valve configurations. Measured
      // with this scale: the electrolyser's first Newton step took the
      // weighted residual from 7 150 to 0.84 (to 414 before), 5 trial
      // periods instead of 7; the DC drive 9 instead of 8 (its map is far
      // from linear where shooting starts: the same first step either
      // way, then Broyden's, about 15× each).
      const double kind = IsNodeVoltage(diff[i]) ? peak_voltage : peak_current;
      sc.push_back(kind > 0.0 ? kind : AbsoluteTolerance(diff[i]) / tol);
    }
    for (std::size_t f = 0; f < c.alpha.size(); ++f) {
      if (!Controlled(f)) continue;
      w.push_back(tol * std::numbers::pi);  // as the steady-state test weighs alpha
      sc.push_back(std::numbers::pi);
      if (!Regulated(f)) continue;
      const Firing& fr = circuit_->firings()[f];
      const double pulse = period_ / 6.0;
      if (fr.ki != 0) {
        // The integral moves alpha by ki·∫e dt.
        w.push_back(tol * std::numbers::pi / std::abs(fr.ki));
        sc.push_back(std::numbers::pi / std::abs(fr.ki));
      }
      // The probe's running integral r moves the next sample's alpha by
      // (kp/Δt + ki)·r, Δt a pulse.
      const double level = std::max(std::abs(fr.target), i_ref_ * 1e-6) * pulse;
      const double gain = std::abs(fr.kp) / pulse + std::abs(fr.ki);
      w.push_back(gain > 0 ? tol * std::numbers::pi / gain : level);
      sc.push_back(level);
    }
    *weights = Eigen::Map<Eigen::VectorXd>(w.data(), static_cast<Eigen::Index>(w.size()));
    *scales = Eigen::Map<Eigen::VectorXd>(sc.data(), static_cast<Eigen::Index>(sc.size()));
  }

  // One period of the circuit from `start`, in a run of its own whose
  // samples are discarded; false if it fails.
  bool TrialPeriod(const CycleState& start, CycleState* end) {
    DiscardingSink discard;
    // A trial spends the run's budget: the limits bound the whole case,
    // trials included (each trial had the full limits of its own, and a
    // fuzzed case at 10¹² V ran 36 trials and 60 million steps).
    EngineOptions trial_options = options_;
    auto& limits = trial_options.limits;
    if (limits.max_steps > 0) {
      limits.max_steps -= TotalSteps();
      if (limits.max_steps <= 0) return false;  // the main loop then stops at the limit, with its message
    }
    if (limits.max_wall_seconds > 0) {
      limits.max_wall_seconds -= ElapsedSeconds();
      if (limits.max_wall_seconds <= 0) return false;
    }
    Run trial(*circuit_, *study_, trial_options, discard, {}, &start);
    const RunResult r = trial.Execute();
    result_.summary.shooting_steps += r.summary.steps;
    if (r.summary.status != RunSummary::Status::kCompleted || !trial.trial_end_) return false;
    *end = *trial.trial_end_;
    return true;
  }

  // At the cycle boundary t: solves for the periodic steady state by
  // shooting and, if it converges, continues the run from it. The run
  // carries on as it was if shooting does not converge.
  bool Shoot(double t) {
    auto& s = result_.summary;
    const CycleState here = CaptureCycleState(t);
    Eigen::VectorXd weights, scales;
    ShootingWeights(here, &weights, &scales);
    // Every trial's end state, by evaluation (a failed one leaves its slot
    // empty): the solver may return the best period rather than the last.
    std::vector<std::optional<CycleState>> ends;
    const PeriodMap period = [&](const Eigen::VectorXd& z, Eigen::VectorXd* end) {
      CycleState e;
      const bool ok = TrialPeriod(Unpack(z, here), &e);
      ends.push_back(ok ? std::optional<CycleState>(e) : std::nullopt);
      if (ok) *end = Pack(e);
      return ok;
    };
    const ShootingResult r = SolvePeriodicState(period, Pack(here), weights, scales);
    s.shooting_periods += r.periods;
    s.shooting_iterations += r.iterations;
    ++s.shooting_attempts;
    if (!r.converged) {
      s.shooting_message = fmt::format("did not converge at {:.6g} s ({}); simulated on", t, r.message);
      if (s.shooting_attempts >= 2) shooting_armed_ = false;
      shoot_not_before_ = t + 2 * period_ * (1 - 1e-9);  // the next try two cycles on
      return true;
    }
    shooting_armed_ = false;
    s.shooting_converged = true;
    s.shooting_time = t;
    s.shooting_message.clear();
    // Continue from the end of the trial period the solver returned: a
    // state one simulated cycle produced, which came back to within the
    // tolerance (switch states and regulator timing included).
    const CycleState steady = *ends.at(static_cast<std::size_t>(r.end_evaluation));
    double* y = N_VGetArrayPointer(y_.get());
    const auto& diff = mna_.differential_indices();
    for (std::size_t i = 0; i < diff.size(); ++i) y[diff[i]] = steady.x[i];
    LoadCycleState(steady, t, false);
    next_gate_edge_ = NextGateEdge(t);  // the delay angles changed
    if (!HandleEvent(t, {}, true)) return false;
    // The trial's cycle was one agreeing cycle: the next boundary that
    // agrees with this state makes the run steady.
    previous_state_ = steady.x;
    previous_alpha_ = alpha_now_;
    for (std::size_t i = 0; i < steady.x.size(); ++i) cycle_peak_[i] = std::abs(steady.x[i]);
    agreeing_cycles_ = 1;
    return true;
  }

  void FinishWindow() {
    auto& s = result_.summary;
    const double end = s.t_reached > 0 ? s.t_reached : 0.0;
    if (study_->window) {  // chosen by the user; cut short if the run ended early
      s.window_begin = std::min(study_->window->from, end);
      s.window_end = std::min(study_->window->to, end);
      return;
    }
    s.window_end = end;
    if (period_ > 0) {
      const int cycles = study_->steady ? study_->steady->cycles : 1;
      const double whole = std::floor(end / period_ + 1e-9);
      const double n = std::min<double>(cycles, whole);
      s.window_begin = n >= 1 ? end - n * period_ : 0.0;
    } else {
      s.window_begin = 0.0;
    }
  }

  // -- bookkeeping ----------------------------------------------------------------

  // Wall-clock seconds since this run started (the wall limit's measure).
  double ElapsedSeconds() const {
    return std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
  }

  // Integration steps so far, shooting's trial periods included (the step
  // limit bounds them all).
  long TotalSteps() const {
    long n = 0;
    if (ida_) IDAGetNumSteps(ida_.get(), &n);
    return result_.summary.steps + result_.summary.shooting_steps + n;
  }

  // Adds IDA's counters to the summary; IDAReInit resets them.
  void Accumulate() {
    if (!ida_) return;
    void* mem = ida_.get();
    long v = 0;
    auto& s = result_.summary;
    IDAGetNumSteps(mem, &v); s.steps += v;
    IDAGetNumResEvals(mem, &v); s.residual_evaluations += v;
    IDAGetNumErrTestFails(mem, &v); s.error_test_failures += v;
    IDAGetNumNonlinSolvConvFails(mem, &v); s.nonlinear_failures += v;
    IDAGetNumGEvals(mem, &v); s.root_evaluations += v;
  }

  void Fail(std::string message) {
    result_.summary.status = RunSummary::Status::kFailed;
    if (result_.summary.message.empty()) result_.summary.message = std::move(message);
  }

  // -- SUNDIALS callbacks ---------------------------------------------------------

  static int ResidualFn(realtype t, N_Vector y, N_Vector yp, N_Vector r, void* data) {
    auto* run = static_cast<Run*>(data);
    run->mna_.Residual(t, N_VGetArrayPointer(y), N_VGetArrayPointer(yp), N_VGetArrayPointer(r));
    return 0;
  }

  static int JacobianFn(realtype, realtype cj, N_Vector, N_Vector, N_Vector, SUNMatrix j, void* data,
                        N_Vector, N_Vector, N_Vector) {
    auto* run = static_cast<Run*>(data);
    const auto& p = run->mna_.pattern();
    // SUNMatZero erases the pattern, so it is written every time.
    sunindextype* cols = SM_INDEXPTRS_S(j);
    sunindextype* rows = SM_INDEXVALS_S(j);
    for (int c = 0; c <= run->n_; ++c) cols[c] = p.outerIndexPtr()[c];
    for (int k = 0; k < p.nonZeros(); ++k) rows[k] = p.innerIndexPtr()[k];
    run->mna_.JacobianValues(cj, SM_DATA_S(j));
    ++run->jac_evals_;
    return 0;
  }

  // Two root functions per valve. The first ends the state at its exact
  // threshold (on: i = 0; off: v = Vf), so an inductor in series is left
  // with no residual current to drive through Roff. The second, offset by
  // the hysteresis ε, is a backstop for a valve that starts its state
  // marginally on the wrong side of the first (within the settling
  // tolerance), where the first would see no sign change.
  // IDA's error weights from the tolerances in force, as IDA would set
  // them: 1 / (reltol·|y_k| + atol_k). Through this function, unlike
  // IDASVtolerances, a change of tolerance needs no restart.
  static int ErrorWeights(N_Vector yv, N_Vector ewt, void* data) {
    auto* run = static_cast<Run*>(data);
    const double* y = N_VGetArrayPointer(yv);
    double* w = N_VGetArrayPointer(ewt);
    const double reltol = run->study_->simulate->reltol;
    for (int k = 0; k < run->n_; ++k) {
      const double tol = reltol * std::abs(y[k]) + run->tolerance_[k];
      if (!(tol > 0.0)) return -1;
      w[k] = 1.0 / tol;
    }
    return 0;
  }

  static int RootFn(realtype, N_Vector yv, N_Vector, realtype* g, void* data) {
    auto* run = static_cast<Run*>(data);
    const double* y = N_VGetArrayPointer(yv);
    for (std::size_t k = 0; k < run->valves_.size(); ++k) {
      const Valve& v = *run->valves_[k].valve;
      if (run->forced_[k]) {  // a failed valve never switches
        g[2 * k] = g[2 * k + 1] = 1.0;
      } else if (run->states_[v.switch_slot()]) {
        const double i = v.Current(y) - v.params().i_h;
        g[2 * k] = i;
        g[2 * k + 1] = i + run->eps_i_;
      } else {
        const double u = v.Voltage(y) - v.params().v_f;
        g[2 * k] = u;
        g[2 * k + 1] = u - run->eps_v_;
      }
    }
    return 0;
  }

  static void ErrorFn(int code, const char*, const char* function, char* message, void* data) {
    auto* run = static_cast<Run*>(data);
    if (code < 0) run->last_ida_message_ = fmt::format("{}: {}", function, message);
  }

  struct ValveRef {
    int device;
    const Valve* valve;
  };

  const Circuit* circuit_;  // the present one: case actions may change values
  const Study* study_;
  const EngineOptions& options_;
  std::vector<EngineAction> actions_;  // in time order
  std::size_t next_action_ = 0;
  std::vector<std::uint8_t> forced_;   // per valve: 0 free, 1 failed open, 2 failed short
  std::vector<int> misfire_left_;      // per valve: gate pulses still to lose
  std::vector<double> misfire_from_, suppressed_from_, suppressed_until_;
  SampleSink& sink_;
  MnaSystem mna_;
  const int n_;
  RunResult result_;

  std::unique_ptr<SUNContext, ContextDeleter> ctx_;
  Vector y_, yp_, work_, work_p_;
  Matrix jacobian_;
  Solver solver_;
  IdaMemory ida_;
  EigenSolverStats solver_stats_;
  long jac_evals_ = 0;
  std::string last_ida_message_;

  std::vector<ValveRef> valves_;
  std::vector<std::uint8_t> states_;
  std::vector<double> atol_;  // the circuit-wide absolute tolerances set at the start
  double peak_state_voltage_ = 0.0, peak_state_current_ = 0.0;  // largest |state| of each kind this period
  std::vector<double> tolerance_;  // the absolute tolerances in force (IDA's error weights)
  double next_tolerance_boundary_ = 0.0;
  std::vector<double> derivative_step_;  // scratch of DerivativeFromStep
  double v_ref_ = 1.0, i_ref_ = 1.0, eps_v_ = 0.0, eps_i_ = 0.0;

  double period_ = 0.0;
  double t_end_ = 0.0;
  double t_restart_ = 0.0;  // where IDA was last (re)initialised
  // The state IDA was last restarted from, and its first step, for RetryRestart().
  std::vector<double> restart_y_, restart_yp_;
  double restart_h0_ = 0.0;
  bool restart_retried_ = false;
  Eigen::VectorXcd start_phasor_;  // see StartPhasor()
  bool start_phasor_solved_ = false, start_phasor_ok_ = false;
  double next_gate_edge_ = std::numeric_limits<double>::infinity();
  std::vector<double> recover_until_;    // per valve: end of its recovery (tq)
  std::vector<double> alpha_now_;        // per firing: the delay angle in force (rad)
  std::vector<Pll> pll_;                 // per firing: its PLL (measured synchronisation)
  std::vector<double> integral_;         // per firing: ∫e dt of its regulator (A·s)
  std::vector<double> last_regulation_;  // per firing: time of its last sample
  std::vector<double> regulated_integral_;    // per firing: ∫probe dt since its last sample
  std::vector<double> last_regulated_value_;  // per firing: the probe at the last step
  double last_step_time_ = 0.0;
  bool wants_regulated_derivative_ = false;  // a regulated probe reads y'
  std::vector<double> t_off_;            // per valve: last turn-off
  std::vector<char> awaiting_forward_;   // per valve: extinction interval still open
  long next_sample_ = 0;
  double next_boundary_ = 0.0;
  std::vector<double> previous_state_, cycle_peak_;
  std::vector<double> previous_alpha_;  // delay angles at the last cycle boundary
  std::vector<double> previous_pll_angle_;  // unwrapped loop angles at the last cycle boundary
  int agreeing_cycles_ = 0;
  // Shooting: trial runs start from trial_start_ and leave their end state
  // in trial_end_; the main run shoots at a boundary when shooting_armed_.
  const CycleState* trial_start_ = nullptr;
  std::optional<CycleState> trial_end_;
  bool shooting_armed_ = false, shoot_now_ = false;
  bool pulse_due_now_ = false;  // a PLL update brought a pulse start to where IDA is (UpdatePlls)
  double last_gate_edge_ = -1.0;  // when the main loop last took a pulse start
  double shoot_not_before_ = 0.0;
  std::vector<double> last_cycle_peak_;  // each state's peak over the cycle before the shot

  const bool wants_derivatives_ = sink_.wants_derivatives();
  bool reads_nothing_ = false;  // the sink reads no unknown: samples need no interpolation (SelectOutputs)
  // LCCSIM_TRACE=1 in the environment prints every valve switching.
  const bool trace_ = std::getenv("LCCSIM_TRACE") != nullptr;
  double last_event_time_ = -1.0;
  double chatter_start_ = 0.0;
  int rapid_events_ = 0;
  std::chrono::steady_clock::time_point start_;
};

}  // namespace

bool EngineOptions::IsValid(std::string* error) const {
  auto bad = [&](const char* field, double value, const char* rule) {
    *error = fmt::format("{} = {:g}: {}", field, value, rule);
    return false;
  };
  if (!(tolerances.abstol_fraction > 0 && tolerances.abstol_fraction <= 1))
    return bad("tolerances.abstol_fraction", tolerances.abstol_fraction, "must be in (0, 1]");
  if (!(default_max_step_degrees > 0 && default_max_step_degrees <= 30))
    return bad("default_max_step_degrees", default_max_step_degrees, "must be in (0, 30]");
  if (!(tolerances.hysteresis >= 1))
    return bad("tolerances.hysteresis", tolerances.hysteresis, "must be at least 1");
  if (events.max_settle_iterations < 1)
    return bad("events.max_settle_iterations", events.max_settle_iterations, "must be at least 1");
  if (events.chatter_events < 2) return bad("events.chatter_events", events.chatter_events, "must be at least 2");
  if (!(events.chatter_window > 0)) return bad("events.chatter_window", events.chatter_window, "must be positive");
  if (limits.max_steps < 0) return bad("limits.max_steps", static_cast<double>(limits.max_steps), "must not be negative");
  if (limits.max_wall_seconds < 0) return bad("limits.max_wall_seconds", limits.max_wall_seconds, "must not be negative");
  return true;
}

std::string RunSummary::BriefReport() const {
  const char* status_word = status == Status::kCompleted ? "completed" : status == Status::kFailed ? "FAILED" : "not run";
  std::string out = fmt::format("{}: t = {:.6g} s, {} steps, {} events, {} switchings, {:.3f} s wall", status_word,
                                t_reached, steps, events, switchings, wall_seconds);
  if (steady_requested)
    out += steady_reached ? fmt::format(", steady at {:.6g} s", steady_time) : ", steady state NOT reached";
  if (shooting_converged) out += fmt::format(" (by shooting: {} trial periods)", shooting_periods);
  if (!message.empty()) out += "\n  " + message;
  return out;
}

std::string RunSummary::FullReport(bool with_wall) const {
  std::string out;
  out += fmt::format("  status                    {}\n",
                     status == Status::kCompleted ? "completed" : status == Status::kFailed ? "failed" : "not run");
  if (!message.empty()) out += fmt::format("  reason                    {}\n", message);
  out += fmt::format("  time reached / stop       {:.9g} s / {:.9g} s\n", t_reached, stop_given);
  out += fmt::format("  relative tolerance        {:g}\n", reltol_used);
  out += fmt::format("  output interval           {:.6g} s\n", sample_used);
  out += fmt::format("  largest step              {:.6g} s\n", max_step_used);
  if (period > 0) out += fmt::format("  fundamental period        {:.9g} s\n", period);
  if (steady_requested) {
    out += steady_reached ? fmt::format("  steady state              reached at {:.9g} s\n", steady_time)
                          : std::string("  steady state              NOT reached; the last cycles are analysed\n");
  }
  if (shooting_attempts > 0 || !shooting_message.empty()) {
    if (shooting_converged)
      out += fmt::format("  shooting                  converged from {:.9g} s: {} trial periods, {} Newton steps, "
                         "{} steps\n",
                         shooting_time, shooting_periods, shooting_iterations, shooting_steps);
    else if (shooting_attempts > 0)
      out += fmt::format("  shooting                  {} ({} trial periods, {} steps)\n", shooting_message,
                         shooting_periods, shooting_steps);
    else
      out += fmt::format("  shooting                  {}\n", shooting_message);
  }
  out += fmt::format("  analysis window           {:.9g} s .. {:.9g} s\n", window_begin, window_end);
  out += fmt::format("  integration steps         {}\n", steps);
  out += fmt::format("  events (root returns)     {}\n", events);
  if (restart_retries > 0) out += fmt::format("  restarts retried          {} (with a shorter first step)\n", restart_retries);
  out += fmt::format("  valve switchings          {}\n", switchings);
  out += fmt::format("  residual evaluations      {}\n", residual_evaluations);
  out += fmt::format("  Jacobian evaluations      {}\n", jacobian_evaluations);
  out += supernodal_lu ? fmt::format("  LU factorisations         {} (supernodal; symbolic analyses: {})\n",
                                     linear_setups, symbolic_analyses)
                       : fmt::format("  LU factorisations         {} (left-looking; {} on a kept pivot plan)\n",
                                     linear_setups, reused_pivot_plans);
  out += fmt::format("  error-test failures       {}\n", error_test_failures);
  out += fmt::format("  nonlinear failures        {}\n", nonlinear_failures);
  out += fmt::format("  root-function evaluations {}\n", root_evaluations);
  out += fmt::format("  output samples            {}\n", samples);
  if (regulator_samples > 0) out += fmt::format("  regulator samples         {}\n", regulator_samples);
  if (with_wall) out += fmt::format("  wall time                 {:.4f} s\n", wall_seconds);
  return out;
}

double RunFrequency(const Study& study) {
  return study.steady && study.steady->frequency > 0 ? study.steady->frequency : study.fundamental;
}

double OutputInterval(const Study& study) {
  const double f = RunFrequency(study);
  const double period = f > 0 ? 1.0 / f : 0.0;
  const SimulateSpec& sim = *study.simulate;
  double sample = sim.sample > 0 ? sim.sample : period > 0 ? period / 1024.0 : sim.stop / 10000.0;
  if (period > 0 && sample < period) sample = period / std::max(1.0, std::round(period / sample));
  return sample;
}

RunResult Simulate(const Circuit& circuit, const Study& study, const EngineOptions& options,
                   SampleSink& sink, const std::vector<EngineAction>& actions) {
  if (!study.simulate) {
    RunResult r;
    r.summary.status = RunSummary::Status::kFailed;
    r.summary.message = "no simulate statement";
    return r;
  }
  Run run(circuit, study, options, sink, actions);
  return run.Execute();
}

}  // namespace lcc
