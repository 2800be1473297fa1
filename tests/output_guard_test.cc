// The checks made before a batch writes anything (app/output_guard.h): an
// output folder lccsim did not make is not written into unless the user
// says so, and a batch whose waveforms would exceed --max-output is refused
// before any case runs, saying how to go on.
#include <catch2/catch.hpp>

#include <fstream>
#include <sstream>

#include "app/commands.h"
#include "app/output_guard.h"
#include "parser/elaborate.h"
#include "tests/test_utilities/files.h"

namespace lcc {
namespace {

namespace fs = std::filesystem;

const char* kSmallNetlist = R"(
supply G (a, b, c) Vll = 400 V f = 50 Hz Ssc = 5 MVA xr = 8
bridge B ac = (a, b, c) dc = (p, n)
resistor Rl (p, n) R = 2 ohm
simulate stop = 60 ms sample = 100 us
probe Vd = p - n
probe Ia = G.a.i
sweep Rl.R in (2 ohm, 3 ohm, 4 ohm)
)";

TEST_CASE("AFolderLccsimDidNotMakeIsNotWrittenIntoUnlessAllowed", "[output]") {
  const fs::path dir = testing::FreshFolder("lccsim-guard-folder");
  // A new folder is made, with the marker; writing there again is allowed.
  REQUIRE(PrepareOutputFolder((dir / "new").string(), false).empty());
  REQUIRE(fs::exists(dir / "new" / kOutputMarker));
  std::ofstream(dir / "new" / "summary.csv") << "x\n";
  REQUIRE(PrepareOutputFolder((dir / "new").string(), false).empty());
  // An empty folder is fine.
  fs::create_directories(dir / "empty");
  REQUIRE(PrepareOutputFolder((dir / "empty").string(), false).empty());
  // Someone else's files: refused, with the way out; untouched.
  fs::create_directories(dir / "theirs");
  std::ofstream(dir / "theirs" / "thesis.tex") << "keep me\n";
  const std::string why = PrepareOutputFolder((dir / "theirs").string(), false);
  REQUIRE(why.find("not written by lccsim") != std::string::npos);
  REQUIRE(why.find("--overwrite") != std::string::npos);
  REQUIRE_FALSE(fs::exists(dir / "theirs" / kOutputMarker));
  REQUIRE(PrepareOutputFolder((dir / "theirs").string(), true).empty());
  REQUIRE(testing::ReadWhole(dir / "theirs" / "thesis.tex") == "keep me\n");
  // A place nobody may write (not even root: /proc takes no new entries).
  const std::string denied = PrepareOutputFolder("/proc/lccsim-guard-test/out", false);
  INFO(denied);
  REQUIRE(denied.find("cannot create '/proc/lccsim-guard-test/out'") != std::string::npos);
  // A file where the folder should be.
  std::ofstream(dir / "plain") << "x";
  REQUIRE(PrepareOutputFolder((dir / "plain").string(), true).find("not a folder") != std::string::npos);
}

TEST_CASE("RunRefusesAForeignFolderAndWritesNothingThere", "[output]") {
  const fs::path dir = testing::FreshFolder("lccsim-guard-run");
  std::ofstream(dir / "s.lcc") << kSmallNetlist;
  RunCommandOptions o;
  o.netlist = (dir / "s.lcc").string();
  o.out_dir = dir.string();  // holds the netlist: not lccsim's folder
  o.formats = {"json"};
  std::ostringstream out, err;
  REQUIRE(RunCommand(o, out, err) == kExitInputError);
  REQUIRE(err.str().find("--overwrite") != std::string::npos);
  REQUIRE_FALSE(fs::exists(dir / "summary.json"));
  o.overwrite = true;
  REQUIRE(RunCommand(o, out, err) == kExitOk);
  REQUIRE(fs::exists(dir / "summary.json"));
}

TEST_CASE("TheWaveformEstimateIsSamplesTimesColumnsTimesCases", "[output]") {
  Diagnostics diags;
  auto design = ElaborateText("s.lcc", kSmallNetlist, diags);
  REQUIRE(design);
  // 60 ms at 100 us: 600 intervals, 601 samples; 2 probes and the time
  // column; 16 bytes a value in CSV, 12 in COMTRADE (the documented estimate).
  const auto e = EstimateWaveformBytes(design->study, {"csv", "comtrade", "json"}, 3);
  REQUIRE(e.samples == 601);
  REQUIRE(e.columns == 2);
  REQUIRE(e.bytes == static_cast<std::uint64_t>((16 + 12) * 601 * 3 * 3));
  REQUIRE(EstimateWaveformBytes(design->study, {"json", "svg"}, 3).bytes == 0);
}

TEST_CASE("ABatchOverTheOutputLimitStopsBeforeRunningAndSaysHowToGoOn", "[output]") {
  const fs::path dir = testing::FreshFolder("lccsim-guard-size");
  std::ofstream(dir / "s.lcc") << kSmallNetlist;
  RunCommandOptions o;
  o.netlist = (dir / "s.lcc").string();
  o.out_dir = (dir / "out").string();
  o.max_output_bytes = 100'000;  // the batch needs about 151 kB of CSV and COMTRADE
  std::ostringstream out, err;
  REQUIRE(RunCommand(o, out, err) == kExitInputError);
  INFO(err.str());
  REQUIRE(err.str().find("--max-output") != std::string::npos);
  REQUIRE(err.str().find("3 case(s) x 601 samples x 2 probe(s)") != std::string::npos);
  for (const auto& entry : fs::directory_iterator(dir / "out")) REQUIRE_FALSE(entry.is_directory());  // no case ran
  // Without the waveform formats it fits.
  o.formats = {"json"};
  REQUIRE(RunCommand(o, out, err) == kExitOk);
}

TEST_CASE("ByteSizesReadWithDecimalUnits", "[output]") {
  std::uint64_t b = 0;
  REQUIRE(ParseByteSize("2 GB", &b));
  REQUIRE(b == 2'000'000'000ull);
  REQUIRE(ParseByteSize("500MB", &b));
  REQUIRE(b == 500'000'000ull);
  REQUIRE(ParseByteSize("1e9", &b));
  REQUIRE(b == 1'000'000'000ull);
  REQUIRE_FALSE(ParseByteSize("lots", &b));
  REQUIRE_FALSE(ParseByteSize("5 parsecs", &b));
  REQUIRE_FALSE(ParseByteSize("-1 GB", &b));
}

}  // namespace
}  // namespace lcc
