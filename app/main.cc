// lccsim: the command line. main() turns argv into options, runs the
// command and maps its result to the exit code (see app/commands.h).
#include <CLI/CLI.hpp>

#include <iostream>

#include "app/commands.h"

int main(int argc, char** argv) {
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

  std::vector<std::string> formats;
  run->add_option("--formats", formats, "output formats among csv, json, comtrade, svg (default: all)")
      ->delimiter(',')
      ->check(CLI::IsMember(lcc::AllFormats()));

  std::string report_dir;
  auto* report = app.add_subcommand("report", "print the report of a finished case again, without simulating");
  report->add_option("CASE_DIR", report_dir, "the case's output folder, e.g. out/base")->required();

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
      return lcc::RunCommand(run_options, std::cout, std::cerr);
    }
    if (*report) return lcc::ReportCommand(report_dir, std::cout, std::cerr);
    if (*check) return lcc::CheckCommand(check_file, std::cout, std::cerr);
  } catch (const std::exception& e) {
    std::cerr << "lccsim: internal error: " << e.what() << "\n";
    return lcc::kExitSimulationFailed;
  }
  return lcc::kExitInputError;
}
