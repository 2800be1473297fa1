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
    if (*run) return lcc::RunCommand(run_options, std::cout, std::cerr);
    if (*check) return lcc::CheckCommand(check_file, std::cout, std::cerr);
  } catch (const std::exception& e) {
    std::cerr << "lccsim: internal error: " << e.what() << "\n";
    return lcc::kExitSimulationFailed;
  }
  return lcc::kExitInputError;
}
