// The malformed-input corpus (tests/malformed/): every file must be refused
// with `file:line:column: error: message`, the offending line and a caret,
// and the command must exit with code 2 and write nothing. Expected
// positions and messages are in tests/malformed/expectations.txt.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "app/commands.h"

namespace lcc {
namespace {

namespace fs = std::filesystem;

struct Expectation {
  std::string file, where, message;
};

std::string Trim(const std::string& s) {
  const auto b = s.find_first_not_of(" \t");
  const auto e = s.find_last_not_of(" \t");
  return b == std::string::npos ? "" : s.substr(b, e - b + 1);
}

std::vector<Expectation> LoadExpectations(const fs::path& dir) {
  std::ifstream in(dir / "expectations.txt");
  std::vector<Expectation> out;
  std::string line;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    const auto a = line.find('|'), b = line.rfind('|');
    out.push_back({Trim(line.substr(0, a)), Trim(line.substr(a + 1, b - a - 1)), Trim(line.substr(b + 1))});
  }
  return out;
}

// Runs `lccsim run` on a file; checks exit code 2, the first error line and
// its caret, and that no output folder appeared.
void CheckRefused(const fs::path& file, const std::string& where_in, const std::string& message) {
  const fs::path out_dir = fs::temp_directory_path() / ("lccsim-malformed-" + file.filename().string());
  fs::remove_all(out_dir);
  std::ostringstream out, err;
  const int code = RunCommand({file.string(), out_dir.string()}, out, err);
  const std::string text = err.str();
  INFO(file.filename().string() << " printed:\n" << text);
  REQUIRE(code == kExitInputError);
  REQUIRE_FALSE(fs::exists(out_dir));
  // The error names its file; for an included file, that file's path.
  const std::string where = std::count(where_in.begin(), where_in.end(), ':') == 2
                                ? (file.parent_path() / where_in).string()
                                : file.string() + ":" + where_in;
  // The first error (warnings about the same mistake may come before it).
  std::istringstream lines(text);
  std::string l1, l2, l3;
  while (std::getline(lines, l1) && l1.find(": error: ") == std::string::npos) {
  }
  REQUIRE(l1.rfind(where + ": error: " + message, 0) == 0);
  // Then the offending line and a caret.
  std::getline(lines, l2);
  std::getline(lines, l3);
  REQUIRE(l3.find('^') != std::string::npos);
}

TEST_CASE("EveryMalformedFileIsRefusedWithItsLineAndMessage", "[malformed]") {
  const fs::path dir = fs::path(LCC_SOURCE_DIR) / "tests" / "malformed";
  const auto expectations = LoadExpectations(dir);
  REQUIRE(expectations.size() >= 30);
  for (const auto& e : expectations) {
    SECTION(e.file) { CheckRefused(dir / e.file, e.where, e.message); }
  }
}

TEST_CASE("AOneMegabyteLineIsRefusedWithoutCrashing", "[malformed]") {
  const fs::path file = fs::temp_directory_path() / "lccsim-long-line.lcc";
  {
    std::ofstream out(file);
    out << "param x = 1";
    for (int k = 0; k < 250000; ++k) out << " + 1";
    out << "\n";
  }
  REQUIRE(fs::file_size(file) > 1000000);
  CheckRefused(file, "1:1", "statement is longer than 65536 bytes");
}

TEST_CASE("AMissingFileIsAnInputError", "[malformed]") {
  std::ostringstream out, err;
  REQUIRE(RunCommand({"/nonexistent/netlist.lcc", "/tmp/lccsim-never"}, out, err) == kExitInputError);
  REQUIRE(err.str().find("cannot read '/nonexistent/netlist.lcc'") != std::string::npos);
}

}  // namespace
}  // namespace lcc
