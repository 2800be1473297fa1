// Batch studies: cases, sweeps and actions, parallel runs, shards, resume.
//
// Physics checks:
// - DC short at the terminals of a diode bridge: with the DC side shorted
//   every phase is tied through a conducting valve to the short, so the AC
//   side sees a three-phase short circuit behind the supply impedance Zs.
//   Once the DC offsets have decayed (X/R = 8: τ = 25 ms) each line current
//   is a sinusoid of peak Î = √2·Ik, Ik = Vll/(√3·|Zs|) (the initial
//   symmetrical short-circuit current of IEC 60909-0 with c = 1; from
//   memory), and the DC current, the sum of the positive line currents, is
//   the six-pulse rectified set: peak Î, mean (3/π)·Î (hand derivation:
//   ½·Σ|sin| over a period averages 3/π). Checked within 3 % and 1 %.
// - Misfire of thyristor 3 at α: valve 1 keeps conducting for the 120° until
//   valve 5 fires, so the rail stays on phase a instead of b. The volt-
//   seconds lost (hand integration of v_ba = √2·VLL·sin φ over φ = α .. α+120°)
//   are √2·VLL·(cos α − cos(α + 120°))/ω.
#include <catch2/catch.hpp>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <nlohmann/json.hpp>
#include <numbers>
#include <sstream>
#include <thread>

#include "app/commands.h"
#include "tests/test_utilities/files.h"
#include "parser/elaborate.h"
#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

namespace fs = std::filesystem;

std::string Read(const fs::path& p) { return testing::ReadWhole(p); }

fs::path Fresh(const std::string& name) { return testing::FreshFolder(name); }

// ---- language --------------------------------------------------------------

const char* kPlant = R"(
param Vll = 400 V
supply Grid (a, b, c) Vll = Vll f = 50 Hz Ssc = 2 MVA xr = 8
bridge B ac = (a, b, c) dc = (p, n)
inductor Ld (p, q) L = 10 mH
resistor Rl (q, n) R = 5 ohm
switch Sdc (p, n) state = open
simulate stop = 100 ms
)";

TEST_CASE("CasesTimesSweepPointsMakeTheBatch", "[batch]") {
  Diagnostics diags;
  auto design = ElaborateText("b.lcc", std::string(kPlant) + R"(
case nominal
case light { set Rl.R = 10 ohm }
case short_dc { at 60 ms close Sdc }
sweep Grid.Ssc in (1 MVA, 2 MVA)
sweep Vll = 380 V .. 420 V step 20 V
)",
                              diags);
  INFO(diags.Format());
  REQUIRE(design);
  const auto cases = ExpandCases(design->batch);
  REQUIRE(cases.size() == 3 * 2 * 3);
  REQUIRE(cases[0].folder == "nominal__Grid.Ssc=1MVA__Vll=380V");
  REQUIRE(cases[1].folder == "nominal__Grid.Ssc=1MVA__Vll=400V");
  REQUIRE(cases[3].folder == "nominal__Grid.Ssc=2MVA__Vll=380V");
  REQUIRE(cases[6].start.at("Rl.R") == 10.0);
  REQUIRE(cases[12].timed.size() == 1);
  REQUIRE(cases[12].timed[0].t == Approx(0.06));
}

TEST_CASE("ActionsOnUnknownTargetsOrPastTheStopAreRefusedWithTheirPlace", "[batch][errors]") {
  auto check = [](const std::string& line, const std::string& message) {
    const std::string text = std::string(kPlant) + line + "\n";
    const std::string d = testing::DiagnosticsOf(text, "b.lcc");
    INFO(d);
    REQUIRE(d.find(message) != std::string::npos);
    REQUIRE(d.find("b.lcc:9:") != std::string::npos);  // the case's line
  };
  check("case x { at 50 ms close Nowhere }", "no element named 'Nowhere'");
  check("case x { set Rl.Q = 2 ohm }", "resistor has no key 'Q'");
  check("case x { at 150 ms close Sdc }", "falls at or after the stop time");
  check("case x { set Rl.R = 2 H }", "expects resistance");
  check("case x { at 50 ms misfire B[3] }", "misfire needs a firing element");
  check("case x { at 50 ms close B[3] }", "close needs a switch");
  check("case x { at 50 ms explode Sdc }", "unknown action 'explode'");
}

// ---- physics ----------------------------------------------------------------

TEST_CASE("ADcShortOfADiodeBridgeDrawsTheRectifiedThreePhaseShortCircuitCurrent", "[batch][analytic]") {
  const fs::path dir = Fresh("lccsim-dcshort");
  std::ofstream(dir / "s.lcc") << R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz Ssc = 2 MVA xr = 8
bridge B ac = (a, b, c) dc = (p, n) Ron = 1 uohm
inductor Ld (p, q) L = 10 mH
resistor Rl (q, n) R = 5 ohm
switch Sdc (p, n) state = open Ron = 1 uohm
simulate stop = 400 ms
window from = 340 ms to = 400 ms
probe Id = B[1].i + B[3].i + B[5].i
case fault { at 100 ms close Sdc }
)";
  RunCommandOptions o;
  o.netlist = (dir / "s.lcc").string();
  o.out_dir = (dir / "out").string();
  o.formats = {"json"};
  std::ostringstream out, err;
  REQUIRE(RunCommand(o, out, err) == kExitOk);
  const auto j = nlohmann::json::parse(Read(dir / "out" / "summary.json"));
  const auto& probe = j.at("cases").at(0).at("probes").at(0).at("stats");
  const double z = 400.0 * 400.0 / 2e6;
  const double ik = 400.0 / (std::sqrt(3.0) * z);
  const double peak = std::sqrt(2.0) * ik;
  INFO("Id max " << probe.at("max").get<double>() << " A, mean " << probe.at("mean").get<double>() << " A; √2·Ik "
                 << peak << " A");
  REQUIRE(probe.at("max").get<double>() == Approx(peak).epsilon(0.03));
  REQUIRE(probe.at("mean").get<double>() == Approx(3 / std::numbers::pi * peak).epsilon(0.01));
}

TEST_CASE("AMisfireLosesTheHandIntegratedVoltSeconds", "[batch][analytic]") {
  const fs::path dir = Fresh("lccsim-misfire");
  std::ofstream(dir / "m.lcc") << R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 0 H
firing F sync = Grid alpha = 30 deg
bridge B ac = (a, b, c) dc = (p, n) valve = thyristor firing = F Ron = 1 uohm
current_source Iload (n, p) dc = 100 A
simulate stop = 200 ms sample = 5 us
probe Vd = p - n
case misfire { at 100 ms misfire F[3] }
)";
  RunCommandOptions o;
  o.netlist = (dir / "m.lcc").string();
  o.out_dir = (dir / "out").string();
  o.formats = {"csv"};
  std::ostringstream out, err;
  REQUIRE(RunCommand(o, out, err) == kExitOk);
  // ∫vd dt over two periods after the action and two before it.
  std::istringstream csv(Read(dir / "out" / "misfire" / "waveforms.csv"));
  std::string line;
  std::getline(csv, line);
  double before = 0, after = 0, t_prev = -1, v_prev = 0;
  while (std::getline(csv, line)) {
    const double t = std::stod(line.substr(0, line.find(','))), v = std::stod(line.substr(line.find(',') + 1));
    if (t_prev >= 0) {
      const double mid = 0.5 * (t + t_prev), area = 0.5 * (v + v_prev) * (t - t_prev);
      if (mid > 0.06 && mid < 0.1) before += area;
      if (mid > 0.1 && mid < 0.14) after += area;
    }
    t_prev = t;
    v_prev = v;
  }
  const double w = 2 * std::numbers::pi * 50, alpha = std::numbers::pi / 6;
  const double lost = std::sqrt(2.0) * 400.0 * (std::cos(alpha) - std::cos(alpha + 2 * std::numbers::pi / 3)) / w;
  INFO("lost " << before - after << " V·s, hand integration " << lost << " V·s");
  REQUIRE(before - after == Approx(lost).epsilon(0.01));
  REQUIRE(Read(dir / "out" / "misfire" / "report.txt").find("gate pulse lost (misfire)") != std::string::npos);
}

// ---- parallel, shards, resume -------------------------------------------------

// 200 cases: 2 loads × 100 supply strengths, short runs.
std::string BigBatch() {
  return R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz Ssc = 2 MVA xr = 8
bridge B ac = (a, b, c) dc = (p, n)
inductor Ld (p, q) L = 2 mH
resistor Rl (q, n) R = 5 ohm
simulate stop = 40 ms
probe Id = Ld.i
case light { set Rl.R = 10 ohm }
case heavy
sweep Grid.Ssc = 1 MVA .. 10.9 MVA step 0.1 MVA
)";
}

fs::path WriteBig(const fs::path& dir) {
  std::ofstream(dir / "big.lcc") << BigBatch();
  return dir / "big.lcc";
}

int Run(const fs::path& netlist, const fs::path& out, int jobs, int shard = 0, int shards = 1, bool resume = false) {
  RunCommandOptions o;
  o.netlist = netlist.string();
  o.out_dir = out.string();
  o.jobs = jobs;
  o.shard_index = shard;
  o.shard_count = shards;
  o.resume = resume;
  o.formats = {"csv", "json"};
  std::ostringstream s, e;
  return RunCommand(o, s, e);
}

TEST_CASE("TwoHundredCasesGiveTheSameSummaryWithOneOrTwoJobsAndAsMergedShards", "[batch][parallel]") {
  const fs::path dir = Fresh("lccsim-batch200");
  const fs::path netlist = WriteBig(dir);
  REQUIRE(Run(netlist, dir / "one", 1) == kExitOk);
  REQUIRE(Run(netlist, dir / "two", 2) == kExitOk);
  const std::string csv = Read(dir / "one" / "summary.csv");
  REQUIRE(std::count(csv.begin(), csv.end(), '\n') == 201);
  REQUIRE(csv == Read(dir / "two" / "summary.csv"));
  REQUIRE(Read(dir / "one" / "summary.json") == Read(dir / "two" / "summary.json"));
  for (int s = 0; s < 3; ++s) REQUIRE(Run(netlist, dir / ("shard" + std::to_string(s)), 2, s, 3) == kExitOk);
  std::ostringstream o, e;
  REQUIRE(MergeCommand({(dir / "shard0").string(), (dir / "shard1").string(), (dir / "shard2").string()},
                       (dir / "merged").string(), o, e) == kExitOk);
  REQUIRE(Read(dir / "merged" / "summary.csv") == csv);
  REQUIRE(Read(dir / "merged" / "summary.json") == Read(dir / "one" / "summary.json"));
}

// Starts `lccsim run` on the netlist as a child process and returns once at
// least `cases` cases are finished (waiting up to a minute: a slow or
// sanitised build runs a case in tens of milliseconds).
pid_t StartAndWaitForCases(const fs::path& netlist, const fs::path& out, const char* jobs, int cases) {
  const pid_t pid = fork();
  if (pid == 0) {
    execl(LCC_BINARY, LCC_BINARY, "run", netlist.c_str(), "--out", out.c_str(), "--jobs", jobs, "--formats",
          "csv,json", static_cast<char*>(nullptr));
    _exit(127);
  }
  for (int k = 0; k < 6000; ++k) {
    std::this_thread::sleep_for(std::chrono::milliseconds(10));
    int done = 0;
    std::error_code ec;
    for (const auto& entry : fs::directory_iterator(out, ec)) done += fs::exists(entry.path() / "analysis.json");
    if (done >= cases) break;
  }
  return pid;
}

TEST_CASE("AKilledBatchResumesWithoutRerunningFinishedCases", "[batch][resume]") {
  const fs::path dir = Fresh("lccsim-resume");
  const fs::path netlist = WriteBig(dir);
  REQUIRE(Run(netlist, dir / "full", 2) == kExitOk);
  const fs::path out = dir / "killed";
  const pid_t pid = StartAndWaitForCases(netlist, out, "1", 10);
  kill(pid, SIGKILL);
  int status = 0;
  waitpid(pid, &status, 0);
  REQUIRE(WIFSIGNALED(status));
  // What was finished, with the times its files were written.
  std::map<std::string, fs::file_time_type> finished;
  for (const auto& entry : fs::directory_iterator(out))
    if (fs::exists(entry.path() / "analysis.json"))
      finished[entry.path().filename().string()] = fs::last_write_time(entry.path() / "analysis.json");
  INFO(finished.size() << " cases finished before the kill");
  REQUIRE(finished.size() >= 10);
  REQUIRE(finished.size() < 200);
  REQUIRE_FALSE(fs::exists(out / "summary.csv"));
  REQUIRE(Run(netlist, out, 2, 0, 1, /*resume=*/true) == kExitOk);
  for (const auto& [folder, time] : finished) REQUIRE(fs::last_write_time(out / folder / "analysis.json") == time);
  REQUIRE(Read(out / "summary.csv") == Read(dir / "full" / "summary.csv"));
  for (const auto& entry : fs::recursive_directory_iterator(out))
    REQUIRE(entry.path().filename().string().find(".partial-") == std::string::npos);
}

TEST_CASE("CtrlCStopsCleanlyKeepingFinishedCases", "[batch][resume]") {
  const fs::path dir = Fresh("lccsim-interrupt");
  const fs::path netlist = WriteBig(dir);
  const fs::path out = dir / "out";
  const pid_t pid = StartAndWaitForCases(netlist, out, "2", 10);
  kill(pid, SIGINT);
  int status = 0;
  waitpid(pid, &status, 0);
  REQUIRE(WIFEXITED(status));
  REQUIRE(WEXITSTATUS(status) == kExitInterrupted);
  // The finished cases are in the summary; the rest are not, and a resumed
  // run completes the batch.
  const std::string partial = Read(out / "summary.csv");
  const long rows = std::count(partial.begin(), partial.end(), '\n') - 1;
  REQUIRE(rows >= 10);
  REQUIRE(rows < 200);
  REQUIRE(Run(netlist, out, 2, 0, 1, /*resume=*/true) == kExitOk);
  const std::string full = Read(out / "summary.csv");
  REQUIRE(std::count(full.begin(), full.end(), '\n') == 201);
}

TEST_CASE("AFailingCaseIsRecordedAndTheOthersComplete", "[batch]") {
  const fs::path dir = Fresh("lccsim-failing");
  std::ofstream(dir / "f.lcc") << std::string(kPlant) + "case good\ncase bad { set Rl.R = -1 ohm }\n";
  RunCommandOptions o;
  o.netlist = (dir / "f.lcc").string();
  o.out_dir = (dir / "out").string();
  std::ostringstream s, e;
  REQUIRE(RunCommand(o, s, e) == kExitSimulationFailed);
  const std::string csv = Read(dir / "out" / "summary.csv");
  REQUIRE(csv.find("good,completed") != std::string::npos);
  REQUIRE(csv.find("bad,failed,") != std::string::npos);
  REQUIRE(csv.find("R must be greater than zero") != std::string::npos);
  REQUIRE(fs::exists(dir / "out" / "good" / "waveforms.csv"));
}

TEST_CASE("ACaseWhoseFolderCannotBeMadeSaysAtWhatStageAndTheOthersComplete", "[batch]") {
  // A plain file where the case's folder should go: the case fails while
  // writing its results, its summary line says so, and the other case
  // still writes everything.
  const fs::path dir = Fresh("lccsim-blocked-folder");
  std::ofstream(dir / "f.lcc") << std::string(kPlant) + "case good\ncase blocked\n";
  fs::create_directories(dir / "out");
  std::ofstream(dir / "out" / "blocked") << "not a folder\n";
  RunCommandOptions o;
  o.netlist = (dir / "f.lcc").string();
  o.out_dir = (dir / "out").string();
  o.overwrite = true;
  std::ostringstream s, e;
  REQUIRE(RunCommand(o, s, e) == kExitSimulationFailed);
  const std::string csv = Read(dir / "out" / "summary.csv");
  INFO(csv);
  REQUIRE(csv.find("good,completed") != std::string::npos);
  REQUIRE(csv.find("blocked,failed,error while writing its results: ") != std::string::npos);
  REQUIRE(fs::exists(dir / "out" / "good" / "waveforms.csv"));
  REQUIRE(fs::exists(dir / "out" / "good" / "analysis.json"));
}

}  // namespace
}  // namespace lcc

namespace lcc {
namespace {

TEST_CASE("ABatchTooLargeToRunIsRefusedAtItsSweep", "[batch][errors]") {
  // Three sweeps of 100 values each: a million cases, refused before any
  // is expanded.
  const std::string d = testing::DiagnosticsOf(std::string(kPlant) + R"(sweep Rl.R = 1 ohm .. 100 ohm step 1 ohm
sweep Ld.L = 1 mH .. 100 mH step 1 mH
sweep Grid.Ssc = 1 MVA .. 100 MVA step 1 MVA
)",
                                               "b.lcc");
  INFO(d);
  REQUIRE(d.find("b.lcc:11:7: error: the batch would have 1e+06 cases, more than 100000") != std::string::npos);
}

}  // namespace
}  // namespace lcc
