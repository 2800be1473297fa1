// What to simulate and what to record: the `simulate`, `steady` and `probe`
// statements after elaboration, all values in SI units.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "models/device.h"
#include "parser/expression.h"

namespace lcc {

struct SimulateSpec {
  double stop = 0.0;          // s, hard end of the run
  double sample = 0.0;        // s, output interval (0: period/1024, or stop/10000)
  double reltol = 1e-6;       // relative tolerance of the integrator
  double max_step = 0.0;      // s (0: two electrical degrees, or stop/1000)
  bool periodic_start = true; // start from the network's AC steady state (engine/phasor.h)
  SourceLoc loc;
};

struct SteadySpec {
  int cycles = 2;             // whole cycles recorded once steady
  double tol = 1e-5;          // relative change of the state per cycle
  double settle_max = 0.0;    // s (0: until stop)
  double frequency = 0.0;     // Hz (0: the circuit's fundamental)
  // Find the steady state by shooting-Newton (engine/shooting.h) from the
  // first cycle boundary, instead of simulating until it settles.
  bool shooting = false;
  SourceLoc loc;
};

// An analysis window chosen by the user (transient cases).
struct WindowSpec {
  double from = 0.0;  // s
  double to = 0.0;    // s
  SourceLoc loc;
};

// An IEEE Std 519-2014 check at the terminals of a supply.
struct PccSpec {
  std::string supply;    // the supply's name
  int supply_index = -1; // into Circuit::supplies()
  double il = 0.0;       // A, maximum demand load current (0: this case's fundamental)
  int pulses = 6;        // converter pulse number (§5.5 allowance above 6)
  SourceLoc loc;
};

// A probe: a program over signal slots, each slot a linear form of (y, y').
struct Probe {
  std::string name;
  Program program;
  std::vector<LinearForm> slots;
  Dim dim;
  SourceLoc loc;
  std::string unit() const { return UnitLabel(dim); }
};

struct Study {
  std::optional<SimulateSpec> simulate;
  std::optional<SteadySpec> steady;
  std::optional<WindowSpec> window;
  std::vector<PccSpec> pccs;
  std::vector<Probe> probes;
  double fundamental = 0.0;   // Hz: the frequency of the first periodic source, 0 if none
};

// Evaluates a probe at one instant.
double EvaluateProbe(const Probe& probe, const double* y, const double* yp);

}  // namespace lcc
