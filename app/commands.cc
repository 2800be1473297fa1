#include "app/commands.h"

#include <fmt/format.h>

#include <filesystem>

#include "engine/simulator.h"
#include "engine/topology.h"
#include "parser/elaborate.h"
#include "results/atomic_file.h"
#include "results/events.h"
#include "results/recorder.h"
#include "results/writers.h"

namespace lcc {
namespace {

namespace fs = std::filesystem;

// Parses, elaborates and checks; prints diagnostics; nullptr on error.
std::unique_ptr<Design> Load(const std::string& netlist, std::ostream& err, TopologyReport* topology) {
  Diagnostics diags;
  auto design = ElaborateFile(netlist, diags);
  if (design) *topology = CheckTopology(design->circuit, diags);
  err << diags.Format();
  if (diags.has_errors()) return nullptr;
  return design;
}

}  // namespace

int CheckCommand(const std::string& netlist, std::ostream& out, std::ostream& err) {
  TopologyReport topology;
  auto design = Load(netlist, err, &topology);
  if (!design) return kExitInputError;
  const Circuit& c = design->circuit;
  out << fmt::format("{}: {} nodes, {} elements, {} unknowns\n", netlist, c.num_nodes() - 1, c.devices().size(),
                     c.num_unknowns());
  out << "nodes:\n";
  for (int k = 1; k < c.num_nodes(); ++k) out << "  " << c.node_name(k) << "\n";
  out << "elements:\n";
  for (const auto& d : c.devices()) {
    std::string nodes;
    for (int n : d->nodes()) nodes += (nodes.empty() ? "" : ", ") + c.node_name(n);
    out << fmt::format("  {:<22} {:<15} ({})  {}\n", d->name(), d->kind_name(), nodes, d->loc().Where());
  }
  out << "unknowns:\n";
  for (int k = 0; k < c.num_unknowns(); ++k) out << fmt::format("  {:>4}  {}\n", k, c.UnknownName(k));
  for (const auto& note : topology.notes) out << "note: " << note << "\n";
  if (!design->study.simulate) out << "note: no simulate statement; `run` needs one\n";
  return kExitOk;
}

int RunCommand(const RunCommandOptions& options, std::ostream& out, std::ostream& err) {
  TopologyReport topology;
  auto design = Load(options.netlist, err, &topology);
  if (!design) return kExitInputError;
  if (!design->study.simulate) {
    err << fmt::format("{}:1:1: error: no simulate statement\n    hint: add for example: simulate stop = 200 ms\n",
                       options.netlist);
    return kExitInputError;
  }
  const EngineOptions& engine = options.engine;
  std::string why;
  if (!engine.IsValid(&why)) {
    err << "lccsim: error: engine option " << why << "\n";
    return kExitInputError;
  }

  const std::string case_name = "base";
  const fs::path case_dir = fs::path(options.out_dir) / case_name;
  std::error_code ec;
  fs::create_directories(case_dir, ec);
  if (ec) {
    err << fmt::format("lccsim: error: cannot create '{}': {}\n", case_dir.string(), ec.message());
    return kExitInputError;
  }

  ProbeRecorder recorder(design->study.probes);
  RunResult run = Simulate(design->circuit, design->study, engine, recorder);

  CaseOutput output{case_name, options.netlist, &design->circuit, &recorder, &run, topology.notes};
  try {
    WriteWaveformsCsv((case_dir / "waveforms.csv").string(), recorder);
    WriteEventsCsv((case_dir / "events.csv").string(),
                   EventLog(design->circuit, run, run.summary.period > 0 ? 1.0 / run.summary.period : 0.0));
    WriteFileAtomically((case_dir / "report.txt").string(), FormatReport(output));
  } catch (const std::exception& e) {
    err << "lccsim: error: " << e.what() << "\n";
    return kExitSimulationFailed;
  }
  out << fmt::format("{}: {}\n", case_name, run.summary.BriefReport());
  out << fmt::format("results: {}\n", case_dir.string());
  return run.summary.status == RunSummary::Status::kCompleted ? kExitOk : kExitSimulationFailed;
}

}  // namespace lcc
