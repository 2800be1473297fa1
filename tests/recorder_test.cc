// The probe recorder's spool (results/recorder.h): rows that went to disk
// read back bit for bit as recorded; a spool that cannot be written loses
// no row; and a whole `lccsim run` writes the same files whether its
// waveforms were spooled or held in memory, leaving no spool file behind.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <unistd.h>

#include "app/commands.h"
#include "results/recorder.h"
#include "tests/test_utilities/files.h"
#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

namespace fs = std::filesystem;

const char* kNetlist = R"(
supply G (a, b, c) Vll = 400 V f = 50 Hz Ssc = 2 MVA xr = 8
bridge B ac = (a, b, c) dc = (p, n)
inductor Ld (p, q) L = 10 mH
resistor Rl (q, n) R = 5 ohm
simulate stop = 800 ms
probe Vd = p - n
probe Id = Ld.i
probe Ia = G.a.i
)";

testing::SimulatedCase Record(const RecorderOptions& options) { return testing::Simulate(kNetlist, {}, options); }

void RequireSameRows(const ProbeRecorder& a, const ProbeRecorder& b) {
  REQUIRE(a.rows() == b.rows());
  for (int k = -1; k < static_cast<int>(a.probes().size()); ++k) REQUIRE(a.Column(k) == b.Column(k));
  for (std::size_t k = 0; k < a.ranges().size(); ++k) {
    REQUIRE(a.ranges()[k].min == b.ranges()[k].min);
    REQUIRE(a.ranges()[k].max == b.ranges()[k].max);
  }
}

TEST_CASE("SpooledRowsReadBackExactlyAsRecorded", "[recorder]") {
  const auto memory = Record({});
  // 2 kB blocks of 32-byte rows, about 60 rows each, so the 40 961 rows
  // cross hundreds of blocks; the reader's 1 MB blocks (32 768 rows) take
  // them back in two reads, the second ending inside the spool.
  const auto spooled = Record({2000, fs::temp_directory_path().string()});
  REQUIRE(memory.recorder->spooled_rows() == 0);
  REQUIRE(spooled.recorder->spooled_rows() > 32768);
  REQUIRE(spooled.recorder->spool_error().empty());
  RequireSameRows(*memory.recorder, *spooled.recorder);
  // Time order, one sample interval apart (T/1024 at 50 Hz).
  const auto t = spooled.recorder->Time();
  for (std::size_t k = 1; k < t.size(); ++k) REQUIRE(t[k] - t[k - 1] == Approx(0.02 / 1024).epsilon(1e-9));
}

TEST_CASE("ASpoolThatCannotBeMadeLosesNoRow", "[recorder]") {
  const auto memory = Record({});
  const auto failed = Record({2000, "/nonexistent-lccsim-folder/spool"});
  REQUIRE(failed.recorder->spool_error().find("cannot make a spool file") != std::string::npos);
  REQUIRE(failed.recorder->spooled_rows() == 0);
  RequireSameRows(*memory.recorder, *failed.recorder);
}

// Runs the netlist with `lccsim run` into OUT with the given waveform memory.
fs::path RunInto(const fs::path& dir, const std::string& name, std::uint64_t waveform_memory) {
  const fs::path out = dir / name;
  RunCommandOptions options;
  options.netlist = (dir / "spool.lcc").string();
  options.out_dir = out.string();
  options.jobs = 1;
  options.waveform_memory_bytes = waveform_memory;
  std::ostringstream o, e;
  INFO(e.str());
  REQUIRE(RunCommand(options, o, e) == 0);
  return out / "base";
}

TEST_CASE("ASpooledRunWritesTheSameFilesAsOneHeldInMemory", "[recorder]") {
  const fs::path dir = fs::temp_directory_path() / ("lccsim-recorder-test-" + std::to_string(getpid()));
  fs::remove_all(dir);
  fs::create_directories(dir);
  std::ofstream(dir / "spool.lcc") << kNetlist;
  const fs::path memory = RunInto(dir, "memory", 0);
  const fs::path spooled = RunInto(dir, "spooled", 2000);
  for (const char* file : {"waveforms.csv", "waveforms.cfg", "waveforms.dat", "waveforms.svg", "events.csv"}) {
    INFO(file);
    REQUIRE(testing::ReadWhole(memory / file) == testing::ReadWhole(spooled / file));
  }
  // The probe figures, which are computed from the rows read back.
  const auto a = nlohmann::json::parse(testing::ReadWhole(memory / "analysis.json"));
  const auto b = nlohmann::json::parse(testing::ReadWhole(spooled / "analysis.json"));
  REQUIRE(a.at("probes") == b.at("probes"));
  // The spool had no name, so nothing is left of it.
  for (const auto& entry : fs::recursive_directory_iterator(dir))
    REQUIRE(entry.path().filename().string().find("spool-") == std::string::npos);
  fs::remove_all(dir);
}

}  // namespace
}  // namespace lcc
