// The event-driven engine: integrates the circuit's DAE with SUNDIALS IDA
// and locates every valve switching with IDA's root finding.
//
// One run, in pseudocode (x⁻/x⁺: just before/after an event):
//
//   s ← initial switch states; y(0) from the initial inductor currents and
//   capacitor voltages; Settle(0)                    (consistent y, y', s)
//   loop
//     take one IDA step to t_n (never past t_end)
//     write every output sample in (t_last, t_n] from IDA's interpolant
//       (recomputing the algebraic unknowns the sink reads, where needed)
//     at each cycle boundary passed: compare the state with one cycle
//       earlier; after two agreeing cycles the run is steady and t_end
//       becomes that boundary + `cycles` periods; hold each kind of state
//       to reltol × its largest over the cycle from now on
//     if a root was found at t_e (= t_n):
//       flip the valves whose root function crossed zero
//       Settle(t_e): solve y⁺ with the differential states held
//         (inductor currents and capacitor voltages are continuous), check
//         every valve against its state's rule (on needs i ≥ −ε_i, off
//         needs v ≤ Vf + ε_v), flip the worst offender, repeat until all
//         agree; a configuration seen before is a loop: an error naming
//         the valves involved
//       relax: one backward-Euler step of h_r (a thousandth of the
//         largest step) from t_e, then Settle again
//       re-initialise IDA at t_e + h_r with y⁺ and, for the states, y' from
//         the difference quotient of one more step of h_r (not kept)
//   until t_n = t_end
//
// Simultaneous roots are applied together, then settled one valve at a
// time. A failing step or an unsettled configuration ends the run with
// status kFailed; the samples written until then are kept.
#pragma once

#include <atomic>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "engine/actions.h"
#include "engine/lu_solver.h"
#include "models/circuit.h"
#include "models/study.h"

namespace lcc {

struct EngineOptions {
  struct Tolerances {
    // Absolute tolerance of each unknown = reltol × abstol_fraction × scale,
    // scale being the largest source voltage for voltages and, for currents,
    // the larger of the largest current source and that voltage over the
    // smallest resistance: the relative tolerance applied per unit of the
    // circuit's own size. (A thousand times tighter, the incoming phase's
    // current near zero forced 50 ns steps at every commutation.)
    double abstol_fraction = 1.0;
    // From the end of the first period on (periodic circuits), the
    // scale of the states (inductor currents, capacitor voltages) is the
    // largest of their kind over the last period, where that is tighter
    // than the circuit-wide one above.
    bool scale_from_states = true;
    // Settling tolerance and backstop offset of the valve root functions:
    // ε = hysteresis × the absolute tolerance of the valve's current
    // (turn-off) or voltage (turn-on).
    double hysteresis = 10.0;
  } tolerances;

  struct Events {
    int max_settle_iterations = 200;  // valve flips allowed while settling one event
    // Chattering guard: this many events in a row, each less than
    // chatter_window × period after the one before, end the run.
    int chatter_events = 500;
    double chatter_window = 1e-7;
    // First step after an event, as a fraction of the last step before it
    // (never above the largest step). IDA's error test shortens it if needed.
    // Measured (callgrind instructions for 0.2 s): 1/16 → 1/2 saves 30 % on
    // the twelve-pulse benchmark and costs 3 % on the six-pulse one.
    double restart_step_fraction = 0.5;
    // After each event, one backward-Euler step of this fraction of the
    // largest step settles parasitic fast modes (L/Roff) before IDA
    // restarts; 0 turns it off.
    double relax_step_fraction = 1e-3;
    // IDA restarts with the differential unknowns' y' taken from one more
    // such step, (y(t + h) − y(t))/h, not kept, instead of from the
    // consistent solve at t. That solve gives the exact derivative of the
    // state reached, parasitic modes included: one step of h ≫ τ leaves a
    // mode of time constant τ at τ/h of its start δ but its derivative at
    // δ/h, and IDA's predictor extrapolates that derivative. On the
    // six-pulse benchmark each turn-off restarted with 1 160 A/s of
    // parasitic di/dt (the current is constant), failed the error test
    // three times and climbed back from a 1 µs step; the difference quotient
    // carries δ·τ/h² (10 A/s there) and the restart takes half the largest
    // step at once. Measured: 9 % fewer steps on the six-pulse benchmark,
    // 6 % on the regulated thyristor one; the same on the twelve-pulse one,
    // whose looser current tolerance let its restarts through already.
    bool restart_derivative_from_step = true;
  } events;

  LuOptions lu;  // left-looking sparse LU up to lu.supernodal_above unknowns

  // Largest step when `simulate` gives no max_step, in electrical degrees of
  // the fundamental. IDA only sees sign changes at step ends, so a valve
  // that would switch twice within one step could be missed; 2° keeps that
  // far below any physical conduction interval and cost 11 % more steps
  // than 3° on the six-pulse benchmark.
  double default_max_step_degrees = 2.0;

  struct Limits {
    // No case may hang: a run that reaches either limit ends, failed, with
    // the limit and the time reached in its message, its samples kept.
    // The step limit is about ten thousand times what a second of a
    // twelve-pulse converter takes; the wall-clock limit an hour.
    // Both bound the whole run, shooting's trial periods included.
    long max_steps = 20'000'000;      // integration steps per run
    double max_wall_seconds = 3600.0; // s per run (0: no limit)
    // Set from outside (Ctrl-C): the run stops at its next step, failed
    // with the message "interrupted".
    const std::atomic<bool>* cancel = nullptr;
  } limits;

  // Returns false, with the field and the broken rule, if an option is out of range.
  bool IsValid(std::string* error) const;
};

// One valve or switch changing state.
struct SwitchEvent {
  enum class Cause {
    kNatural,          // a diode's own root, or settling after an event
    kGate,             // a thyristor fired by its gate pulse
    kTurnOff,          // the current fell through zero (or Ih)
    kRecoveryFailure,  // forward voltage within tq re-fired it: a commutation failure
    kAction,           // a case action: a switch operated, a valve failed open or short
  };
  double t = 0.0;
  int device = -1;  // index into Circuit::devices()
  bool on = false;
  Cause cause = Cause::kNatural;
};

// A blocking thyristor's voltage turning positive for the first time after
// its turn-off: the end of its extinction interval.
struct ForwardVoltageEvent {
  double t = 0.0;
  int device = -1;
  double t_off = 0.0;  // when it last turned off
};

// Receives the uniformly spaced output samples.
class SampleSink {
 public:
  virtual ~SampleSink() = default;
  // `yp` is null unless wants_derivatives() says the sink needs it.
  virtual void OnSample(double t, const double* y, const double* yp) = 0;
  virtual bool wants_derivatives() const { return true; }
  // The unknowns OnSample reads, as indices into y (and y'); nullopt: all of
  // them. Only these are sure to be exact in the y it is given (the
  // engine recomputes them, MnaSystem::SetOutputUnknowns); the others are
  // unspecified. A sink that reads none costs no interpolation at all.
  virtual std::optional<std::vector<int>> unknowns_read() const { return std::nullopt; }
  // A case action changed parameter values: probes are recompiled for the
  // new circuit (a resistor's current is v/R), same names and order.
  virtual void OnProbesChange(const std::vector<Probe>& /*probes*/) {}
};

struct RunSummary {
  enum class Status { kNotRun, kCompleted, kFailed };
  Status status = Status::kNotRun;
  std::string message;            // why it failed (empty when it completed)

  // Settings in effect.
  double stop_given = -1.0;       // s
  double t_reached = -1.0;        // s, where the run ended
  double reltol_used = -1.0;
  double sample_used = -1.0;      // s
  double max_step_used = -1.0;    // s
  double period = 0.0;            // s, of the fundamental (0: none)

  // Steady state and the analysis window.
  bool steady_requested = false;
  bool steady_reached = false;
  double steady_time = -1.0;      // s, boundary where it was declared
  double window_begin = -1.0;     // s
  double window_end = -1.0;       // s

  // Shooting for the steady state (steady method = shooting): whether it
  // converged and from which boundary, the trial periods it simulated,
  // its Newton steps and the integration steps of its trials (not in
  // `steps`), and why it was not used or did not converge.
  int shooting_attempts = 0;
  bool shooting_converged = false;
  double shooting_time = -1.0;    // s
  long shooting_periods = 0;
  long shooting_iterations = 0;
  long shooting_steps = 0;
  std::string shooting_message;

  // Counters, summed over every re-initialisation of IDA.
  long steps = 0;
  long residual_evaluations = 0;
  long jacobian_evaluations = 0;
  long linear_setups = 0;         // numeric LU factorisations for IDA
  long reused_pivot_plans = 0;    // factorisations that reused a kept pivot sequence
  long symbolic_analyses = 0;
  bool supernodal_lu = false;     // Eigen's supernodal LU (else the left-looking one)
  long error_test_failures = 0;
  long nonlinear_failures = 0;
  long root_evaluations = 0;
  long events = 0;                // root returns handled
  long restart_retries = 0;       // restarts after an event retried with a shorter first step
  long switchings = 0;            // valve state changes
  long regulator_samples = 0;     // current regulators' samples, all firing elements (one a pulse each)
  long samples = 0;
  double wall_seconds = 0.0;

  std::string BriefReport() const;
  // The full statistics; without the wall time when `with_wall` is false
  // (outputs that must be identical from run to run).
  std::string FullReport(bool with_wall = true) const;
};

struct RunResult {
  RunSummary summary;
  std::vector<SwitchEvent> events;
  std::vector<ForwardVoltageEvent> forward_voltage;
  std::vector<double> firing_reference;  // per firing element: valve 1's natural instant in [0, T) (s)
  std::vector<double> final_alpha;       // per firing element: the delay angle at the end (rad)
  // Case actions applied: time and text, in order.
  std::vector<std::pair<double, std::string>> actions;
};

// Simulates `circuit` as `study` says, streaming samples to `sink`.
// Requires study.simulate. Never throws for a numerical failure: the
// summary says what happened.
// The fundamental frequency a run of `study` counts cycles in: steady's f,
// else the first periodic source's (0: nothing is periodic).
double RunFrequency(const Study& study);
// The output interval of a run: `sample`, or period/1024 (stop/10000 when
// nothing is periodic); with a fundamental it is rounded to divide the
// period exactly (20 us at 60 Hz becomes T/833), so that a window of whole
// cycles holds whole sample sets and the harmonic analysis has no leakage.
double OutputInterval(const Study& study);

// `actions` (engine/actions.h) are applied at their instants.
RunResult Simulate(const Circuit& circuit, const Study& study, const EngineOptions& options,
                   SampleSink& sink, const std::vector<EngineAction>& actions = {});

}  // namespace lcc
