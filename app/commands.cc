#include "app/commands.h"

#include <fmt/format.h>

#include <atomic>
#include <chrono>
#include <filesystem>
#include <fstream>
#include <map>
#include <mutex>
#include <optional>
#include <sstream>
#include <thread>

#include "app/case_runner.h"
#include "app/output_guard.h"
#include "results/analysis_json.h"
#include "results/atomic_file.h"
#include "results/report.h"
#include "results/writers.h"

namespace lcc {
namespace {

namespace fs = std::filesystem;

// Loads the netlist as written; prints its diagnostics; nullptr on error.
std::unique_ptr<Design> Load(const std::string& netlist, std::ostream& err, TopologyReport* topology) {
  Diagnostics diags;
  auto design = LoadDesign(netlist, nullptr, diags, topology);
  err << diags.Format();
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

namespace {

std::string ShardSuffix(const RunCommandOptions& o) {
  return o.shard_count > 1 ? fmt::format("-shard-{}-of-{}", o.shard_index, o.shard_count) : std::string();
}

void WriteSummaries(const std::string& out_dir, const std::string& suffix, const std::set<std::string>& formats,
                    const std::vector<CaseAnalysis>& cases) {
  if (formats.count("csv")) WriteSummaryCsv((fs::path(out_dir) / ("summary" + suffix + ".csv")).string(), cases);
  if (formats.count("json")) WriteSummaryJson((fs::path(out_dir) / ("summary" + suffix + ".json")).string(), cases);
}

}  // namespace

int RunCommand(const RunCommandOptions& options, std::ostream& out, std::ostream& err) {
  TopologyReport topology;
  auto design = Load(options.netlist, err, &topology);
  if (!design) return kExitInputError;
  if (!design->study.simulate) {
    err << fmt::format("{}:1:1: error: no simulate statement\n    hint: add for example: simulate stop = 200 ms\n",
                       options.netlist);
    return kExitInputError;
  }
  std::string why;
  if (!options.engine.IsValid(&why)) {
    err << "lccsim: error: engine option " << why << "\n";
    return kExitInputError;
  }
  if (options.shard_count < 1 || options.shard_index < 0 || options.shard_index >= options.shard_count) {
    err << fmt::format("lccsim: error: shard {}/{} does not exist (I/N with 0 <= I < N)\n", options.shard_index,
                       options.shard_count);
    return kExitInputError;
  }
  if (const std::string refused = PrepareOutputFolder(options.out_dir, options.overwrite); !refused.empty()) {
    err << "lccsim: error: " << refused << "\n";
    return kExitInputError;
  }
  std::error_code ec;

  // A run killed outright (SIGKILL, power loss) leaves temporary files
  // behind, never a truncated final file; a resumed run clears them.
  if (options.resume) {
    std::vector<fs::path> stale;
    for (const auto& entry : fs::recursive_directory_iterator(options.out_dir, ec))
      if (entry.path().filename().string().find(".partial-") != std::string::npos) stale.push_back(entry.path());
    for (const auto& p : stale) fs::remove(p, ec);
  }

  std::vector<CaseInstance> cases;
  for (auto& c : ExpandCases(design->batch))
    if (c.index % options.shard_count == options.shard_index) cases.push_back(std::move(c));
  CaseRunOptions run_options{options.netlist, options.out_dir, options.engine, options.formats,
                             static_cast<std::size_t>(options.waveform_memory_bytes)};

  // Cases already complete (--resume) are read back, not run.
  std::vector<std::optional<CaseRunResult>> results(cases.size());
  std::vector<std::size_t> to_run;
  for (std::size_t k = 0; k < cases.size(); ++k) {
    CaseAnalysis done;
    if (options.resume && LoadFinishedCase(options.out_dir, cases[k], &done)) {
      results[k] = CaseRunResult{std::move(done), false, 0.0};
    } else {
      to_run.push_back(k);
    }
  }

  // Before anything runs: would the waveforms fill a disk?
  const WaveformEstimate size = EstimateWaveformBytes(design->study, options.formats, to_run.size());
  if (size.bytes > options.max_output_bytes) {
    err << fmt::format(
        "lccsim: error: this batch would write about {} of waveforms ({} case(s) x {} samples x {} probe(s)), more "
        "than --max-output {}.\n    To go on: raise --max-output, write fewer waveform formats (--formats json,svg), "
        "sample less often (simulate ... sample = ...), record fewer probes, or split the batch (--shard I/N).\n",
        FormatBytes(static_cast<double>(size.bytes)), size.cases, size.samples, size.columns,
        FormatBytes(static_cast<double>(options.max_output_bytes)));
    return kExitInputError;
  }

  const int jobs = std::max(1, options.jobs > 0 ? options.jobs
                                                : static_cast<int>(std::thread::hardware_concurrency()));
  std::atomic<std::size_t> next{0};
  std::atomic<std::size_t> finished{0};
  std::mutex progress_mutex;
  const auto start = std::chrono::steady_clock::now();
  auto cancelled = [&] { return options.engine.limits.cancel && options.engine.limits.cancel->load(); };
  auto worker = [&] {
    while (!cancelled()) {
      const std::size_t n = next.fetch_add(1);
      if (n >= to_run.size()) return;
      const std::size_t k = to_run[n];
      CaseRunResult r = RunCase(run_options, cases[k]);
      const bool interrupted = r.interrupted;
      if (!interrupted) results[k] = std::move(r);
      const std::size_t done = ++finished;
      if (options.progress) {
        std::lock_guard<std::mutex> lock(progress_mutex);
        const double elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
        const double remaining = elapsed / done * (to_run.size() - done);
        err << fmt::format("\rcases {}/{}  elapsed {:.1f} s  remaining about {:.1f} s   ", done, to_run.size(), elapsed,
                           remaining)
            << std::flush;
      }
    }
  };
  std::vector<std::thread> pool;
  for (int j = 1; j < std::min<int>(jobs, static_cast<int>(to_run.size())); ++j) pool.emplace_back(worker);
  worker();
  for (auto& t : pool) t.join();
  if (options.progress && !to_run.empty()) err << "\n";

  std::vector<CaseAnalysis> analyses;
  std::string timing = "case,wall [s],simulation [s]\n";
  int failed = 0;
  bool interrupted = false;
  for (std::size_t k = 0; k < cases.size(); ++k) {
    if (!results[k]) {
      interrupted = true;
      continue;
    }
    const CaseAnalysis& a = results[k]->analysis;
    if (a.run.status != "completed") ++failed;
    timing += fmt::format("{},{:.6f},{:.6f}\n", a.folder, results[k]->wall_seconds, a.run.wall_s);
    analyses.push_back(a);
  }
  // Each case's outcome first: if the summaries cannot be written (a full
  // disk), what happened to every case is still said.
  for (const auto& a : analyses)
    out << fmt::format("{}: {}{}\n", a.folder, a.run.status, a.run.message.empty() ? "" : " (" + a.run.message + ")");
  try {
    WriteSummaries(options.out_dir, ShardSuffix(options), options.formats, analyses);
    WriteFileAtomically((fs::path(options.out_dir) / ("timing" + ShardSuffix(options) + ".csv")).string(), timing);
  } catch (const std::exception& e) {
    err << "lccsim: error: the summaries were not written: " << e.what() << "\n";
    return kExitSimulationFailed;
  }
  out << fmt::format("results: {} ({} case{}{})\n", options.out_dir, analyses.size(), analyses.size() == 1 ? "" : "s",
                     failed ? fmt::format(", {} failed", failed) : "");
  if (interrupted) {
    err << fmt::format("lccsim: interrupted: {} of {} cases finished; run again with --resume to complete\n",
                       analyses.size(), cases.size());
    return kExitInterrupted;
  }
  return failed ? kExitSimulationFailed : kExitOk;
}

int CasesCommand(const std::string& netlist, std::ostream& out, std::ostream& err) {
  TopologyReport topology;
  auto design = Load(netlist, err, &topology);
  if (!design) return kExitInputError;
  const auto cases = ExpandCases(design->batch);
  out << fmt::format("{:>5}  {:<40}  {}\n", "index", "folder", "case");
  for (const auto& c : cases) out << fmt::format("{:>5}  {:<40}  {}\n", c.index, c.folder, c.name);
  out << fmt::format("{} case{}\n", cases.size(), cases.size() == 1 ? "" : "s");
  return kExitOk;
}

int MergeCommand(const std::vector<std::string>& dirs, const std::string& out_dir, std::ostream& out,
                 std::ostream& err, bool overwrite) {
  std::map<int, CaseAnalysis> cases;
  for (const auto& dir : dirs) {
    std::error_code ec;
    for (const auto& entry : fs::directory_iterator(dir, ec)) {
      const fs::path file = entry.path() / "analysis.json";
      if (!entry.is_directory() || !fs::exists(file)) continue;
      std::ifstream in(file);
      std::stringstream text;
      text << in.rdbuf();
      try {
        CaseAnalysis a = CaseAnalysisFromJson(nlohmann::json::parse(text.str()));
        cases[a.case_index] = std::move(a);
      } catch (const std::exception& e) {
        err << fmt::format("lccsim: error: {}: {}\n", file.string(), e.what());
        return kExitInputError;
      }
    }
    if (ec) {
      err << fmt::format("lccsim: error: cannot read '{}': {}\n", dir, ec.message());
      return kExitInputError;
    }
  }
  std::vector<CaseAnalysis> list;
  list.reserve(cases.size());
  for (auto& [index, a] : cases) list.push_back(std::move(a));
  if (const std::string refused = PrepareOutputFolder(out_dir, overwrite); !refused.empty()) {
    err << "lccsim: error: " << refused << "\n";
    return kExitInputError;
  }
  try {
    WriteSummaries(out_dir, "", AllFormats(), list);
  } catch (const std::exception& e) {
    err << "lccsim: error: " << e.what() << "\n";
    return kExitSimulationFailed;
  }
  out << fmt::format("merged {} cases into {}\n", list.size(), out_dir);
  return kExitOk;
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
