#include "app/commands.h"

#include <fmt/format.h>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "engine/simulator.h"
#include "engine/topology.h"
#include "parser/elaborate.h"
#include "results/analysis.h"
#include "results/analysis_json.h"
#include "results/atomic_file.h"
#include "results/case_recorder.h"
#include "results/channels.h"
#include "results/comtrade.h"
#include "results/events.h"
#include "results/report.h"
#include "results/svg_plot.h"
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

  const Study& study = design->study;
  const AnalysisChannels channels = BuildAnalysisChannels(design->circuit);
  const double fundamental = study.steady && study.steady->frequency > 0 ? study.steady->frequency : study.fundamental;
  const double sample = study.simulate->sample > 0 ? study.simulate->sample
                        : fundamental > 0          ? 1.0 / fundamental / 1024.0
                                                   : study.simulate->stop / 10000.0;
  CaseRecorder recorder(study.probes, channels, AnalysisKeepSeconds(study, fundamental), sample,
                        study.window ? study.window->from : 0.0, study.window ? study.window->to : 0.0);
  RunResult run = Simulate(design->circuit, study, engine, recorder);
  const CaseAnalysis analysis =
      Analyse({case_name, options.netlist, topology.notes, &design->circuit, &study, &recorder, &run});

  const auto& formats = options.formats;
  const double period = run.summary.period;
  try {
    const std::string base = (case_dir / "waveforms").string();
    if (formats.count("csv")) WriteWaveformsCsv(base + ".csv", recorder.probes());
    if (formats.count("comtrade"))
      WriteComtrade(base, {"lccsim", case_name, period > 0 ? 1.0 / period : 0.0, run.summary.sample_used},
                    recorder.probes());
    if (formats.count("svg")) {
      PlotOptions plot;
      plot.title = fmt::format("{}: case {}", options.netlist, case_name);
      plot.begin = run.summary.window_begin;
      plot.end = run.summary.window_end;
      if (!(plot.end > plot.begin)) plot.begin = 0.0, plot.end = std::max(run.summary.t_reached, 0.0);
      WriteFileAtomically(base + ".svg", RenderWaveformsSvg(recorder.probes(), plot));
    }
    WriteEventsCsv((case_dir / "events.csv").string(),
                   EventLog(design->circuit, run, period > 0 ? 1.0 / period : 0.0));
    WriteFileAtomically((case_dir / "analysis.json").string(), ToJson(analysis).dump(1) + "\n");
    WriteFileAtomically((case_dir / "report.txt").string(), FormatReport(analysis));
    if (formats.count("csv")) WriteSummaryCsv((fs::path(options.out_dir) / "summary.csv").string(), {analysis});
    if (formats.count("json")) WriteSummaryJson((fs::path(options.out_dir) / "summary.json").string(), {analysis});
  } catch (const std::exception& e) {
    err << "lccsim: error: " << e.what() << "\n";
    return kExitSimulationFailed;
  }
  out << fmt::format("{}: {}\n", case_name, run.summary.BriefReport());
  out << fmt::format("results: {}\n", case_dir.string());
  return run.summary.status == RunSummary::Status::kCompleted ? kExitOk : kExitSimulationFailed;
}

int ReportCommand(const std::string& case_dir, std::ostream& out, std::ostream& err) {
  const fs::path file = fs::path(case_dir) / "analysis.json";
  std::ifstream in(file);
  if (!in) {
    err << fmt::format("lccsim: error: cannot read '{}': is '{}' the folder of a finished case?\n", file.string(),
                       case_dir);
    return kExitInputError;
  }
  try {
    std::stringstream text;
    text << in.rdbuf();
    out << FormatReport(CaseAnalysisFromJson(nlohmann::json::parse(text.str())));
  } catch (const std::exception& e) {
    err << fmt::format("lccsim: error: {}: {}\n", file.string(), e.what());
    return kExitInputError;
  }
  return kExitOk;
}

const std::set<std::string>& AllFormats() {
  static const std::set<std::string> kAll{"csv", "json", "comtrade", "svg"};
  return kAll;
}

}  // namespace lcc
