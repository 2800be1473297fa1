#include "tests/test_utilities/run_netlist.h"

#include <catch2/catch.hpp>
#include <cmath>
#include <stdexcept>

#include "results/case_recorder.h"
#include "results/channels.h"

namespace lcc::testing {

int SimulatedCase::ProbeIndex(const std::string& name) const {
  const auto& probes = design->study.probes;
  for (std::size_t k = 0; k < probes.size(); ++k)
    if (probes[k].name == name) return static_cast<int>(k);
  throw std::runtime_error("no probe " + name);
}

const std::vector<double>& SimulatedCase::Column(const std::string& name) const {
  return columns[ProbeIndex(name)];
}

WindowStats SimulatedCase::Window(const std::string& name) const {
  return Measure(time, Column(name), run.summary.window_begin, run.summary.window_end);
}

double SimulatedCase::SwitchTime(const std::string& name, bool on, int n) const {
  const auto& devices = design->circuit.devices();
  for (const auto& e : run.events) {
    if (devices[e.device]->name() == name && e.on == on && n-- == 0) return e.t;
  }
  throw std::runtime_error("no such switching of " + name);
}

std::complex<double> Harmonic(const SimulatedCase& c, const std::string& probe, double f, int h) {
  const auto& t = c.time;
  const auto& x = c.Column(probe);
  std::complex<double> sum = 0;
  int count = 0;
  const double half = 0.5 * (t[1] - t[0]);
  for (std::size_t k = 0; k < t.size(); ++k) {
    if (t[k] < c.run.summary.window_begin - half || t[k] >= c.run.summary.window_end - half) continue;
    sum += x[k] * std::polar(1.0, -2 * M_PI * f * h * t[k]);
    ++count;
  }
  return count ? sum * 2.0 / static_cast<double>(count) : std::complex<double>(0.0);
}

SimulatedCase Simulate(const std::string& text, const EngineOptions& options, const RecorderOptions& recording) {
  SimulatedCase c;
  Diagnostics diags;
  c.design = ElaborateText("test.lcc", text, diags);
  if (c.design) CheckTopology(c.design->circuit, diags);
  c.diagnostics = diags.Format();
  INFO(c.diagnostics);
  REQUIRE_FALSE(diags.has_errors());
  c.recorder = std::make_unique<ProbeRecorder>(c.design->study.probes, recording);
  c.run = lcc::Simulate(c.design->circuit, c.design->study, options, *c.recorder);
  INFO(c.run.summary.FullReport());
  REQUIRE(c.run.summary.status == RunSummary::Status::kCompleted);
  c.time = c.recorder->Time();
  for (std::size_t k = 0; k < c.design->study.probes.size(); ++k) c.columns.push_back(c.recorder->Column(static_cast<int>(k)));
  return c;
}

CaseAnalysis AnalyseText(const std::string& text, const EngineOptions& options) {
  Diagnostics diags;
  auto design = ElaborateText("test.lcc", text, diags);
  if (design) CheckTopology(design->circuit, diags);
  INFO(diags.Format());
  REQUIRE_FALSE(diags.has_errors());
  const Study& study = design->study;
  const AnalysisChannels channels = BuildAnalysisChannels(design->circuit);
  const auto recorder = RecorderFor(study, channels);
  RunResult run = lcc::Simulate(design->circuit, study, options, *recorder);
  INFO(run.summary.FullReport());
  REQUIRE(run.summary.status == RunSummary::Status::kCompleted);
  return Analyse({"test", "test.lcc", 0, "base", {}, &design->circuit, &study, recorder.get(), &run});
}

const BridgeFigures& BridgeNamed(const CaseAnalysis& a, const std::string& name) {
  for (const auto& b : a.bridges)
    if (b.name == name) return b;
  throw std::runtime_error("no bridge " + name);
}

const AcPointFigures& AcPointNamed(const CaseAnalysis& a, const std::string& name) {
  for (const auto& p : a.ac_points)
    if (p.name == name) return p;
  throw std::runtime_error("no AC point " + name);
}

double HarmonicPercent(const AcPointFigures& p, int h) { return p.current_harmonics.at(h - 1).percent; }
double HarmonicRms(const AcPointFigures& p, int h) { return p.current_harmonics.at(h - 1).rms; }

std::string DiagnosticsOf(const std::string& text, const std::string& name) {
  Diagnostics diags;
  auto design = ElaborateText(name, text, diags);
  if (design) CheckTopology(design->circuit, diags);
  return diags.Format();
}

}  // namespace lcc::testing
