#include "app/case_runner.h"

#include <fmt/format.h>

#include <chrono>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>

#include "models/valve.h"
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

std::unique_ptr<Design> LoadDesign(const std::string& netlist, const Overrides* overrides, Diagnostics& diags,
                                   TopologyReport* topology) {
  auto design = ElaborateFile(netlist, diags, overrides);
  if (design) *topology = CheckTopology(design->circuit, diags);
  if (diags.has_errors()) return nullptr;
  return design;
}

namespace {

namespace fs = std::filesystem;

// The case's design with `overrides`; nullptr and the rendered messages on error.
std::unique_ptr<Design> Load(const std::string& netlist, const Overrides& overrides, std::string* messages,
                             TopologyReport* topology) {
  Diagnostics diags;
  TopologyReport report;
  auto design = LoadDesign(netlist, &overrides, diags, &report);
  if (topology) *topology = report;
  if (!design) *messages = diags.Format();
  return design;
}

CaseAnalysis FailedCase(const CaseRunOptions& o, const CaseInstance& c, const std::string& why) {
  CaseAnalysis a;
  a.case_name = c.name;
  a.netlist = o.netlist;
  a.case_index = c.index;
  a.folder = c.folder;
  a.run.status = "failed";
  a.run.message = why;
  return a;
}

// The first line of a message block (diagnostics are several lines).
std::string FirstLine(const std::string& s) { return s.substr(0, s.find('\n')); }

// A case that failed before it could run still gets its folder, with the
// report and the analysis (so the summary, resume and merge all see it).
void WriteFailedCase(const CaseRunOptions& o, const CaseAnalysis& a) {
  const fs::path dir = fs::path(o.out_dir) / a.folder;
  fs::create_directories(dir);
  WriteFileAtomically((dir / "report.txt").string(), FormatReport(a));
  WriteFileAtomically((dir / "analysis.json").string(), ToJson(a).dump(1) + "\n");
}

CaseRunResult RunCaseUnwritten(const CaseRunOptions& o, const CaseInstance& c);

}  // namespace

CaseRunResult RunCase(const CaseRunOptions& o, const CaseInstance& c) {
  const auto start = std::chrono::steady_clock::now();
  CaseRunResult result = RunCaseUnwritten(o, c);
  if (!result.interrupted && result.analysis.run.status == "failed" && result.analysis.run.statistics.empty()) {
    try {
      WriteFailedCase(o, result.analysis);
    } catch (const std::exception&) {
      // The summary still records the case and its reason.
    }
  }
  result.wall_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  return result;
}

namespace {

CaseRunResult RunCaseUnwritten(const CaseRunOptions& o, const CaseInstance& c) {
  CaseRunResult result;
  // What the case was doing, for the message if anything below throws (an
  // allocation that fails, a file that cannot be written).
  const char* stage = "preparing it";
  try {
    std::string messages;
    TopologyReport topology;
    auto design = Load(o.netlist, c.start, &messages, &topology);
    if (!design) {
      result.analysis = FailedCase(o, c, "the case's values are not valid: " + FirstLine(messages));
      return result;
    }
    // One design more for each instant of an `at ... set` line, with all
    // values set up to that instant.
    std::vector<std::unique_ptr<Design>> segments;
    std::vector<EngineAction> actions;
    Overrides values = c.start;
    const Circuit& circuit = design->circuit;
    for (const auto& a : c.timed) {
      const std::string text = [&] {
        switch (a.verb) {
          case TimedActionSpec::Verb::kSet: return fmt::format("set {}", a.target);
          case TimedActionSpec::Verb::kClose: return fmt::format("close {}", a.target);
          case TimedActionSpec::Verb::kOpen: return fmt::format("open {}", a.target);
          case TimedActionSpec::Verb::kShort: return fmt::format("short {}", a.target);
          case TimedActionSpec::Verb::kMisfire: return fmt::format("misfire {} ({} pulses)", a.target, a.pulses);
        }
        return std::string();
      }();
      EngineAction e;
      e.t = a.t;
      e.text = text;
      if (a.verb == TimedActionSpec::Verb::kSet) {
        values[a.target] = a.value.value;
        // Later lines at the same instant join the same design.
        if (!actions.empty() && actions.back().kind == EngineAction::Kind::kRebind && actions.back().t == a.t) {
          segments.pop_back();
          actions.pop_back();
        }
        auto next = Load(o.netlist, values, &messages, nullptr);
        if (!next) {
          result.analysis = FailedCase(o, c, fmt::format("{} at {:g} s is not valid: {}", text, a.t, FirstLine(messages)));
          return result;
        }
        e.kind = EngineAction::Kind::kRebind;
        e.circuit = &next->circuit;
        e.study = &next->study;
        segments.push_back(std::move(next));
      } else if (a.verb == TimedActionSpec::Verb::kMisfire) {
        const std::string firing = a.target.substr(0, a.target.find('['));
        e.kind = EngineAction::Kind::kMisfire;
        e.pulse = std::atoi(a.target.c_str() + a.target.find('[') + 1);
        e.pulses = a.pulses;
        for (std::size_t f = 0; f < circuit.firings().size(); ++f)
          if (circuit.firings()[f].name == firing) e.firing = static_cast<int>(f);
      } else {
        for (std::size_t d = 0; d < circuit.devices().size(); ++d)
          if (circuit.devices()[d]->name() == a.target) e.device = static_cast<int>(d);
        if (e.device < 0) {
          result.analysis = FailedCase(o, c, fmt::format("no device {} for '{}'", a.target, text));
          return result;
        }
        const bool is_switch = !circuit.devices()[e.device]->natural();
        if (a.verb == TimedActionSpec::Verb::kShort) e.kind = EngineAction::Kind::kValveShort;
        else if (is_switch) e.kind = EngineAction::Kind::kSwitch, e.closed = a.verb == TimedActionSpec::Verb::kClose;
        else e.kind = EngineAction::Kind::kValveOpen;
      }
      actions.push_back(e);
    }

    const Study& study = design->study;
    const AnalysisChannels channels = BuildAnalysisChannels(circuit);
    stage = "preparing its recorder";
    const auto recorder_ptr = RecorderFor(study, channels, {o.waveform_memory_bytes, o.out_dir});
    CaseRecorder& recorder = *recorder_ptr;
    if (!c.timed.empty()) recorder.SetFaultTime(c.timed.front().t);
    bool ratings = false;
    for (const auto& g : circuit.valve_groups())
      for (int d : g.devices) {
        const ValveParams& p = static_cast<const Valve&>(*circuit.devices()[d]).params();
        ratings |= p.irms_max > 0 || p.ipk_max > 0 || p.i2t_max > 0 || p.vrrm > 0;
      }
    recorder.SetTrackWholeRun(ratings);
    stage = "simulating it";
    RunResult run = Simulate(circuit, study, o.engine, recorder, actions);
    if (run.summary.status == RunSummary::Status::kFailed && o.engine.limits.cancel &&
        o.engine.limits.cancel->load()) {
      result.interrupted = true;
      return result;
    }
    std::vector<std::string> notes = topology.notes;
    if (!recorder.probes().spool_error().empty()) notes.push_back(recorder.probes().spool_error());
    stage = "analysing it";
    CaseAnalysis analysis =
        Analyse({c.name, o.netlist, c.index, c.folder, notes, &circuit, &study, &recorder, &run});

    stage = "writing its results";
    const fs::path dir = fs::path(o.out_dir) / c.folder;
    fs::create_directories(dir);
    const double period = run.summary.period;
    const std::string base = (dir / "waveforms").string();
    if (o.formats.count("csv")) WriteWaveformsCsv(base + ".csv", recorder.probes());
    if (o.formats.count("comtrade"))
      // A failed run's record ends where it failed: its device id says so.
      WriteComtrade(base,
                    {"lccsim", run.summary.status == RunSummary::Status::kFailed ? c.folder + " (partial)" : c.folder,
                     period > 0 ? 1.0 / period : 0.0, run.summary.sample_used},
                    recorder.probes());
    if (o.formats.count("svg")) {
      PlotOptions plot;
      plot.title = fmt::format("{}: case {}", o.netlist, c.name);
      plot.begin = run.summary.window_begin;
      plot.end = run.summary.window_end;
      if (!(plot.end > plot.begin)) plot.begin = 0.0, plot.end = std::max(run.summary.t_reached, 0.0);
      WriteFileAtomically(base + ".svg", RenderWaveformsSvg(recorder.probes(), plot));
    }
    WriteEventsCsv((dir / "events.csv").string(), EventLog(circuit, run, period > 0 ? 1.0 / period : 0.0));
    WriteFileAtomically((dir / "report.txt").string(), FormatReport(analysis));
    // Last: its presence marks the case complete (see LoadFinishedCase).
    WriteFileAtomically((dir / "analysis.json").string(), ToJson(analysis).dump(1) + "\n");
    result.analysis = std::move(analysis);
  } catch (const std::exception& e) {
    result.analysis = FailedCase(o, c, fmt::format("error while {}: {}", stage, e.what()));
  }
  return result;
}

}  // namespace

bool LoadFinishedCase(const std::string& out_dir, const CaseInstance& instance, CaseAnalysis* analysis) {
  std::ifstream in(fs::path(out_dir) / instance.folder / "analysis.json");
  if (!in) return false;
  try {
    std::stringstream text;
    text << in.rdbuf();
    *analysis = CaseAnalysisFromJson(nlohmann::json::parse(text.str()));
    return analysis->case_index == instance.index && analysis->folder == instance.folder;
  } catch (const std::exception&) {
    return false;
  }
}

}  // namespace lcc
