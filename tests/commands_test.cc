// The command-line commands: outputs, exit codes and what is (not) written.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "app/commands.h"
#include "tests/test_utilities/files.h"

namespace lcc {
namespace {

namespace fs = std::filesystem;

fs::path WriteNetlist(const std::string& name, const std::string& text) {
  const fs::path dir = fs::temp_directory_path() / "lccsim-commands-test";
  fs::create_directories(dir);
  const fs::path file = dir / name;
  std::ofstream(file) << text;
  return file;
}

std::string Read(const fs::path& p) { return testing::ReadWhole(p); }

const char* kRectifier = R"(
supply G (a, b, c) Vll = 400 V f = 50 Hz Ssc = 2 MVA xr = 8
bridge B ac = (a, b, c) dc = (p, n)
inductor Ld (p, q) L = 10 mH
resistor Rl (q, n) R = 5 ohm
simulate stop = 300 ms
steady cycles = 2
probe Vd = p - n
probe Id = Ld.i
)";

TEST_CASE("RunWritesWaveformsAndAReportUnderBase", "[app]") {
  const fs::path file = WriteNetlist("rect.lcc", kRectifier);
  const fs::path out = fs::temp_directory_path() / "lccsim-commands-out";
  fs::remove_all(out);
  std::ostringstream o, e;
  REQUIRE(RunCommand({file.string(), out.string()}, o, e) == kExitOk);
  INFO(e.str());
  const std::string csv = Read(out / "base" / "waveforms.csv");
  REQUIRE(csv.rfind("time [s],Vd [V],Id [A]\n", 0) == 0);
  const std::string report = Read(out / "base" / "report.txt");
  REQUIRE(report.find("CAUTION") != std::string::npos);
  REQUIRE(report.find("licensed engineer") != std::string::npos);
  REQUIRE(report.find("steady state              reached") != std::string::npos);
  REQUIRE(report.find("integration steps") != std::string::npos);
  REQUIRE(report.find("Bridge B (diodes)") != std::string::npos);
  REQUIRE(report.find("closed form") != std::string::npos);
  // No temporary files are left behind.
  for (const auto& entry : fs::directory_iterator(out / "base"))
    REQUIRE(entry.path().filename().string().find("partial") == std::string::npos);
}

TEST_CASE("CheckListsNodesElementsAndUnknowns", "[app]") {
  const fs::path file = WriteNetlist("rect2.lcc", kRectifier);
  std::ostringstream o, e;
  REQUIRE(CheckCommand(file.string(), o, e) == kExitOk);
  const std::string text = o.str();
  // Nodes a b c p n q; 3 supply branches, 6 valves, Ld, Rl and the reference;
  // unknowns: 6 node voltages + 3 + 6 + 1 branch currents.
  REQUIRE(text.find("6 nodes, 12 elements, 16 unknowns") != std::string::npos);
  REQUIRE(text.find("B[4]") != std::string::npos);
  REQUIRE(text.find("i(Ld)") != std::string::npos);
  REQUIRE(text.find("note: node 'a'") != std::string::npos);  // the automatic reference
}

TEST_CASE("AFailedSimulationKeepsItsPartialWaveformsAndExitsWithOne", "[app]") {
  // A step limit the run cannot meet makes it fail part-way.
  const fs::path file = WriteNetlist("fails.lcc", R"(
voltage_source E (s, gnd) peak = 10 V f = 50 Hz
resistor R (s, gnd) R = 1 ohm
simulate stop = 1 s max_step = 1 us
probe v = s
)");
  const fs::path out = fs::temp_directory_path() / "lccsim-commands-fail";
  fs::remove_all(out);
  std::ostringstream o, e;
  RunCommandOptions options{file.string(), out.string()};
  options.engine.limits.max_steps = 5000;  // 1 s at 1 µs needs a million
  REQUIRE(RunCommand(options, o, e) == kExitSimulationFailed);
  REQUIRE(Read(out / "base" / "report.txt").find("THE SIMULATION FAILED: step limit") != std::string::npos);
  REQUIRE(fs::file_size(out / "base" / "waveforms.csv") > 100);
}

TEST_CASE("AFileWithoutSimulateIsAnInputErrorForRun", "[app]") {
  const fs::path file = WriteNetlist("nosim.lcc", "voltage_source E (s, gnd) dc = 1 V\nresistor R (s, gnd) R = 1 ohm\n");
  std::ostringstream o, e;
  REQUIRE(RunCommand({file.string(), "/tmp/lccsim-never-written"}, o, e) == kExitInputError);
  REQUIRE(e.str().find("no simulate statement") != std::string::npos);
  REQUIRE_FALSE(fs::exists("/tmp/lccsim-never-written"));
}

}  // namespace
}  // namespace lcc
