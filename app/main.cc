// lccsim: the command line. main() turns argv into options, runs the
// command and maps its result to the exit code (see app/commands.h).
#include <CLI/CLI.hpp>

#include <unistd.h>

#include <atomic>
#include <csignal>
#include <cstdio>
#include <iostream>

#include "app/commands.h"
#include "app/output_guard.h"

namespace {

// Ctrl-C: running cases stop at their next step, no new case starts, and
// the finished ones keep their results.
std::atomic<bool> g_interrupted{false};
extern "C" void OnInterrupt(int) { g_interrupted.store(true); }

}  // namespace

static int Main(int argc, char** argv) {
  CLI::App app{"lccsim: simulates line-commutated converter circuits described in a netlist"};
  app.require_subcommand(1);

  lcc::RunCommandOptions run_options;
  auto* run = app.add_subcommand("run", "simulate a netlist and write its results");
  run->add_option("FILE", run_options.netlist, "the netlist")->required();
  run->add_option("--out", run_options.out_dir, "output folder (results go to OUT/CASE/)")->capture_default_str();
  run->add_option("--max-steps", run_options.engine.limits.max_steps,
                  "give up after this many integration steps per case")
      ->capture_default_str();
  run->add_option("--max-wall", run_options.engine.limits.max_wall_seconds,
                  "give up after this many seconds of wall-clock time per case (0: no limit)")
      ->capture_default_str();

  run->add_option("--jobs,-j", run_options.jobs, "cases run at once (default: one per core)");
  run->add_flag("--resume", run_options.resume, "skip the cases whose results are complete; run the rest");
  std::string shard;
  run->add_option("--shard", shard, "run part I of N of the cases (I/N, 0 <= I < N), e.g. for array jobs");
  std::vector<std::string> formats;
  run->add_option("--formats", formats, "output formats among csv, json, comtrade, svg (default: all)")
      ->delimiter(',')
      ->check(CLI::IsMember(lcc::AllFormats()));
  run->add_flag("--overwrite", run_options.overwrite,
                "write into OUT even if it is a non-empty folder lccsim did not make");
  std::string max_output = "2 GB";
  run->add_option("--max-output", max_output,
                  "refuse a batch whose waveforms would exceed this size, estimated before it runs (e.g. 500 MB)")
      ->capture_default_str();
  std::string waveform_memory = "4 MB";
  run->add_option("--waveform-memory", waveform_memory,
                  "probe samples each case holds in memory before they go to a spool file in OUT (0: all in memory)")
      ->capture_default_str();

  std::string report_dir;
  auto* report = app.add_subcommand("report", "print the report of a finished case again, without simulating");
  report->add_option("CASE_DIR", report_dir, "the case's output folder, e.g. out/base")->required();

  std::string cases_file;
  auto* cases = app.add_subcommand("cases", "list the cases of a netlist with their output folders");
  cases->add_option("FILE", cases_file, "the netlist")->required();

  std::vector<std::string> merge_dirs;
  std::string merge_out;
  auto* merge = app.add_subcommand("merge", "join the finished cases of shard runs into one summary");
  merge->add_option("DIR", merge_dirs, "output folders of the shards")->required();
  merge->add_option("--out", merge_out, "where summary.csv and summary.json go (default: the first DIR)");
  bool merge_overwrite = false;
  merge->add_flag("--overwrite", merge_overwrite, "write into --out even if it is a non-empty folder lccsim did not make");

  std::string check_file;
  auto* check = app.add_subcommand("check", "parse, elaborate and check a netlist; list nodes, elements, unknowns");
  check->add_option("FILE", check_file, "the netlist")->required();

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? 0 : lcc::kExitInputError;
  }
  try {
    if (*run) {
      if (!formats.empty()) run_options.formats = {formats.begin(), formats.end()};
      if (!shard.empty()) {
        const auto slash = shard.find('/');
        try {
          if (slash == std::string::npos) throw std::invalid_argument(shard);
          run_options.shard_index = std::stoi(shard.substr(0, slash));
          run_options.shard_count = std::stoi(shard.substr(slash + 1));
        } catch (const std::exception&) {
          std::cerr << "lccsim: error: --shard takes I/N, e.g. --shard 0/4\n";
          return lcc::kExitInputError;
        }
      }
      if (!lcc::ParseByteSize(max_output, &run_options.max_output_bytes)) {
        std::cerr << "lccsim: error: --max-output takes a size such as 2 GB, 500 MB or 1e9\n";
        return lcc::kExitInputError;
      }
      if (!lcc::ParseByteSize(waveform_memory, &run_options.waveform_memory_bytes)) {
        std::cerr << "lccsim: error: --waveform-memory takes a size such as 4 MB, 500 kB or 0\n";
        return lcc::kExitInputError;
      }
      run_options.progress = isatty(STDERR_FILENO);
      run_options.engine.limits.cancel = &g_interrupted;
      std::signal(SIGINT, OnInterrupt);
      std::signal(SIGTERM, OnInterrupt);
      return lcc::RunCommand(run_options, std::cout, std::cerr);
    }
    if (*cases) return lcc::CasesCommand(cases_file, std::cout, std::cerr);
    if (*merge) return lcc::MergeCommand(merge_dirs, merge_out.empty() ? merge_dirs.front() : merge_out, std::cout,
                                         std::cerr, merge_overwrite);
    if (*report) return lcc::ReportCommand(report_dir, std::cout, std::cerr);
    if (*check) return lcc::CheckCommand(check_file, std::cout, std::cerr);
  } catch (const std::exception& e) {
    std::cerr << "lccsim: internal error: " << e.what() << "\n";
    return lcc::kExitSimulationFailed;
  }
  return lcc::kExitInputError;
}

int main(int argc, char** argv) {
  try {
    return Main(argc, argv);
  } catch (...) {
    // Main() reports what it knows; this is the last guard, so that nothing
    // ends the process without a message and an exit code.
    std::fputs("lccsim: internal error\n", stderr);
    return lcc::kExitSimulationFailed;
  }
}
