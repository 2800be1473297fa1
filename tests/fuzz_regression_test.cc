// Every input the fuzzer (tests/fuzz/elaborate_fuzz.cc) ever found to crash,
// hang or exhaust memory is kept in tests/fuzz/regressions/ and run here,
// through the same path as the fuzz target, in the ordinary test suite (and
// under the sanitizers where the suite runs so). Each must come back with a
// design or with diagnostics, within a second.
#include <catch2/catch.hpp>

#include <chrono>
#include <filesystem>

#include "engine/topology.h"
#include "parser/elaborate.h"
#include "tests/test_utilities/files.h"

namespace lcc {
namespace {

TEST_CASE("FuzzerFindsStayFixed", "[fuzz][errors]") {
  const std::filesystem::path dir = std::filesystem::path(LCC_SOURCE_DIR) / "tests" / "fuzz" / "regressions";
  int count = 0;
  for (const auto& entry : std::filesystem::directory_iterator(dir)) {
    INFO(entry.path().string());
    const auto start = std::chrono::steady_clock::now();
    Diagnostics diags;
    auto design = ElaborateText("fuzz.lcc", testing::ReadWhole(entry.path()), diags);
    if (design) {
      CheckTopology(design->circuit, diags);
      (void)ExpandCases(design->batch);
    }
    (void)diags.Format();  // as the fuzz target does: rendering was where one find spent its time
    REQUIRE((design != nullptr || diags.has_errors()));
    REQUIRE(std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count() < 1.0);
    ++count;
  }
  REQUIRE(count >= 1);
}

}  // namespace
}  // namespace lcc
