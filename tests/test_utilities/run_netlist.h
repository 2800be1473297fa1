// Test helpers: elaborate and simulate netlist text in memory, and read the
// recorded probes over the analysis window.
#pragma once

#include <complex>
#include <memory>
#include <string>

#include "engine/simulator.h"
#include "engine/topology.h"
#include "parser/elaborate.h"
#include "results/analysis.h"
#include "results/measures.h"
#include "results/recorder.h"

namespace lcc::testing {

struct SimulatedCase {
  std::unique_ptr<Design> design;
  std::unique_ptr<ProbeRecorder> recorder;
  RunResult run;
  // The whole run, read out of the recorder once: time, and each probe.
  std::vector<double> time;
  std::vector<std::vector<double>> columns;
  std::string diagnostics;

  // Index of a probe by name (throws if absent).
  int ProbeIndex(const std::string& name) const;
  const std::vector<double>& Column(const std::string& name) const;
  // Statistics of a probe over the run's analysis window.
  WindowStats Window(const std::string& name) const;
  // Time of the n-th (0-based) switching of device `name` to state `on`.
  double SwitchTime(const std::string& name, bool on, int n = 0) const;
};

// Phasor (peak, angle) of harmonic h of frequency f in a probe, by a
// synchronous DFT over the run's analysis window (whole cycles: no leakage).
std::complex<double> Harmonic(const SimulatedCase& c, const std::string& probe, double f, int h = 1);

// Elaborates, checks and simulates; REQUIREs that each stage succeeds.
// `recording`: how the probe recorder keeps its rows (results/recorder.h).
SimulatedCase Simulate(const std::string& text, const EngineOptions& options = {},
                       const RecorderOptions& recording = {});

// Elaborates, simulates and analyses as `lccsim run` does; REQUIREs that
// the run completes.
CaseAnalysis AnalyseText(const std::string& text, const EngineOptions& options = {});

// The figures of one bridge or AC point by name (throws if absent).
const BridgeFigures& BridgeNamed(const CaseAnalysis& a, const std::string& name);
const AcPointFigures& AcPointNamed(const CaseAnalysis& a, const std::string& name);
double HarmonicPercent(const AcPointFigures& p, int h);  // % of I1
double HarmonicRms(const AcPointFigures& p, int h);

// Elaborates and checks only; returns the rendered diagnostics (empty if none).
std::string DiagnosticsOf(const std::string& text, const std::string& name = "test.lcc");

}  // namespace lcc::testing
