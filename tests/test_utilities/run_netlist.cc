#include "tests/test_utilities/run_netlist.h"

#include <catch2/catch.hpp>
#include <stdexcept>

namespace lcc::testing {

int SimulatedCase::ProbeIndex(const std::string& name) const {
  const auto& probes = design->study.probes;
  for (std::size_t k = 0; k < probes.size(); ++k)
    if (probes[k].name == name) return static_cast<int>(k);
  throw std::runtime_error("no probe " + name);
}

const std::vector<double>& SimulatedCase::Column(const std::string& name) const {
  return recorder->columns()[ProbeIndex(name)];
}

WindowStats SimulatedCase::Window(const std::string& name) const {
  return Measure(recorder->time(), Column(name), run.summary.window_begin, run.summary.window_end);
}

double SimulatedCase::SwitchTime(const std::string& name, bool on, int n) const {
  const auto& devices = design->circuit.devices();
  for (const auto& e : run.events) {
    if (devices[e.device]->name() == name && e.on == on && n-- == 0) return e.t;
  }
  throw std::runtime_error("no such switching of " + name);
}

SimulatedCase Simulate(const std::string& text, const EngineOptions& options) {
  SimulatedCase c;
  Diagnostics diags;
  c.design = ElaborateText("test.lcc", text, diags);
  if (c.design) CheckTopology(c.design->circuit, diags);
  c.diagnostics = diags.Format();
  INFO(c.diagnostics);
  REQUIRE_FALSE(diags.has_errors());
  c.recorder = std::make_unique<ProbeRecorder>(c.design->study.probes);
  c.run = lcc::Simulate(c.design->circuit, c.design->study, options, *c.recorder);
  INFO(c.run.summary.FullReport());
  REQUIRE(c.run.summary.status == RunSummary::Status::kCompleted);
  return c;
}

std::string DiagnosticsOf(const std::string& text, const std::string& name) {
  Diagnostics diags;
  auto design = ElaborateText(name, text, diags);
  if (design) CheckTopology(design->circuit, diags);
  return diags.Format();
}

}  // namespace lcc::testing
