// Benchmark: how many cycles of simulated time each demo circuit (every
// circuits/*.lcc with a `steady` statement) takes to its periodic steady
// state, simulated cycle after cycle and by shooting-Newton (steady method
// = shooting), with the wall time of each demo's whole batch (every case,
// simulation, analysis and JSON output) and the trial periods shooting
// spent. Target: steady within 5 cycles for every demo. A case with timed
// actions is simulated through either way (its transient is its result):
// its cycles are counted from its last action.
//
// Usage: bench_steady [circuits-folder]   (default: circuits, from the repo root)
#include <fmt/format.h>
#include <unistd.h>

#include <array>
#include <chrono>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <nlohmann/json.hpp>
#include <regex>
#include <sstream>
#include <string>

#include "app/commands.h"
#include "bench/bench_run.h"

namespace {

namespace fs = std::filesystem;

std::string ReadWhole(const fs::path& p) {
  std::ifstream in(p);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

// The netlist with its steady statement's method set to `method`.
std::string WithMethod(const std::string& text, const std::string& method) {
  static const std::regex kMethod(R"(\s+method\s*=\s*\w+)");
  static const std::regex kSteady(R"((^|\n)(steady[^\n#]*))");
  const std::string plain = std::regex_replace(text, kMethod, "");
  return method == "simulate" ? plain : std::regex_replace(plain, kSteady, "$1$2 method = " + method);
}

}  // namespace

int main(int argc, char** argv) {
  const fs::path folder = argc > 1 ? argv[1] : "circuits";
  const fs::path work = fs::temp_directory_path() / fmt::format("lccsim-bench-steady-{}", getpid());
  fs::create_directories(work);
  fmt::print("{:<28} {:<16} {:>9} {:>9} {:>10} {:>10} {:>14}\n", "demo", "case", "cycles", "cycles", "wall [ms]",
             "wall [ms]", "trial periods");
  fmt::print("{:<28} {:<16} {:>9} {:>9} {:>10} {:>10} {:>14}\n", "", "", "simulate", "shooting", "simulate",
             "shooting", "");
  int failures = 0;
  double worst_cycles = 0.0;
  std::string worst_case;
  for (const auto& entry : fs::directory_iterator(folder)) {
    if (entry.path().extension() != ".lcc") continue;
    const std::string text = ReadWhole(entry.path());
    if (!std::regex_search(text, std::regex(R"((^|\n)steady)"))) continue;
    const std::string demo = entry.path().stem().string();
    struct Outcome {
      double cycles = -1;
      long trials = 0;
      bool has_actions = false;
    };
    std::map<std::string, std::array<Outcome, 2>> cases;
    double wall_ms[2] = {0, 0};
    for (int m = 0; m < 2; ++m) {
      const std::string method = m == 0 ? "simulate" : "shooting";
      const fs::path netlist = work / (demo + "-" + method + ".lcc");
      std::ofstream(netlist) << WithMethod(text, method);
      lcc::RunCommandOptions o;
      o.netlist = netlist.string();
      o.out_dir = (work / (demo + "-" + method)).string();
      o.formats = {"json"};
      o.jobs = 1;
      std::ostringstream out, err;
      const auto start = std::chrono::steady_clock::now();
      const int code = lcc::RunCommand(o, out, err);
      wall_ms[m] = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - start).count();
      if (code != 0) {
        fmt::print(stderr, "{} ({}) failed:\n{}", demo, method, err.str());
        ++failures;
        continue;
      }
      for (const auto& c : fs::directory_iterator(o.out_dir)) {
        const fs::path json = c.path() / "analysis.json";
        if (!fs::exists(json)) continue;
        const auto a = nlohmann::json::parse(ReadWhole(json));
        const auto& run = a.at("run");
        Outcome& oc = cases[c.path().filename().string()][m];
        const double period = run.at("period_s").get<double>();
        const double from = a.contains("fault") ? std::max(0.0, a.at("fault").value("fault_time_s", -1.0)) : 0.0;
        if (run.at("steady_reached").get<bool>() && period > 0)
          oc.cycles = std::round((run.at("steady_time_s").get<double>() - from) / period);
        const std::string stats = run.at("statistics").get<std::string>();
        std::smatch match;
        if (std::regex_search(stats, match, std::regex(R"(: (\d+) trial periods)"))) oc.trials = std::stol(match[1]);
        oc.has_actions = stats.find("timed actions") != std::string::npos;
      }
    }
    bool first = true;
    for (const auto& [name, o] : cases) {
      fmt::print("{:<28} {:<16} {:>9} {:>9} {:>10} {:>10} {:>14}\n", first ? demo : "", name,
                 o[0].cycles >= 0 ? fmt::format("{:g}", o[0].cycles) : "not",
                 o[1].cycles >= 0 ? fmt::format("{:g}", o[1].cycles) : "not",
                 first ? fmt::format("{:.1f}", wall_ms[0]) : "", first ? fmt::format("{:.1f}", wall_ms[1]) : "",
                 o[1].trials);
      first = false;
      // The target's measure: the periods simulated to the steady state by
      // the better of the two methods, shooting's trial periods included
      // (they are simulated time too). A case with timed actions is about
      // its transient, so it is left out.
      if (o[0].has_actions || o[1].has_actions) continue;
      double best = o[0].cycles;
      if (o[1].cycles >= 0 && (best < 0 || o[1].cycles + o[1].trials < best)) best = o[1].cycles + o[1].trials;
      if (best < 0) best = 1e9;
      if (best > worst_cycles) {
        worst_cycles = best;
        worst_case = demo + "/" + name;
      }
    }
  }
  fs::remove_all(work);
  lcc::bench::PrintTarget("periodic steady state (1e-5) within 5 cycles, every demo",
                          worst_cycles >= 1e9 ? "a case never became steady"
                                              : fmt::format("worst {:g} periods ({}), trial periods included",
                                                            worst_cycles, worst_case),
                          failures == 0 && worst_cycles <= 5);
  return failures ? 1 : 0;
}
