// libFuzzer target: any bytes as a netlist, through layout, the grammar,
// elaboration, the topology checks and the expansion of its batch. Nothing
// may crash, hang or leak; errors are diagnostics. Built only with clang
// (cmake -DLCC_FUZZ=ON, see DEVELOPERS.md); its regression corpus is run by
// the ordinary test suite (tests/fuzz_regression_test.cc).
#include <cstddef>
#include <cstdint>
#include <string>

#include "engine/topology.h"
#include "parser/elaborate.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  lcc::Diagnostics diags;
  auto design = lcc::ElaborateText("fuzz.lcc", std::string(reinterpret_cast<const char*>(data), size), diags);
  if (design) {
    lcc::CheckTopology(design->circuit, diags);
    (void)lcc::ExpandCases(design->batch);
  }
  (void)diags.Format();
  return 0;
}
