// docs/netlist.md and the parser agree: every example in it is accepted, and
// every kind and key the parser knows is documented in its section.
#include <catch2/catch.hpp>

#include <fstream>
#include <sstream>

#include "parser/kinds.h"
#include "tests/test_utilities/run_netlist.h"

namespace lcc {
namespace {

std::string ReadDoc() {
  std::ifstream in(std::string(LCC_SOURCE_DIR) + "/docs/netlist.md");
  REQUIRE(in);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

std::vector<std::string> Examples(const std::string& doc) {
  std::vector<std::string> out;
  const std::string open = "```lcc\n";
  for (std::size_t at = doc.find(open); at != std::string::npos; at = doc.find(open, at)) {
    at += open.size();
    const std::size_t end = doc.find("```", at);
    out.push_back(doc.substr(at, end - at));
    at = end;
  }
  return out;
}

// The text of the section headed "### `name`", up to the next heading.
std::string Section(const std::string& doc, std::string_view name) {
  const std::string head = "### `" + std::string(name) + "`";
  const std::size_t at = doc.find(head);
  if (at == std::string::npos) return {};
  const std::size_t end = doc.find("\n#", at + head.size());
  return doc.substr(at, end - at);
}

TEST_CASE("EveryExampleInTheLanguageReferenceIsAccepted", "[docs]") {
  const auto examples = Examples(ReadDoc());
  REQUIRE(examples.size() >= 6);
  for (std::size_t k = 0; k < examples.size(); ++k) {
    INFO("example " << k + 1 << ":\n" << examples[k]);
    REQUIRE(testing::DiagnosticsOf(examples[k]).empty());
  }
}

TEST_CASE("EveryKindAndKeyIsDocumentedInItsSection", "[docs]") {
  const std::string doc = ReadDoc();
  auto check = [&](const KindSpec& kind) {
    const std::string section = Section(doc, kind.name);
    INFO("kind " << kind.name);
    REQUIRE_FALSE(section.empty());
    for (const auto& key : kind.keys) {
      INFO("key " << key.name);
      REQUIRE(section.find("| `" + std::string(key.name) + "` |") != std::string::npos);
    }
    if (kind.harmonic_keys) REQUIRE(section.find("`h2` ... `h50`") != std::string::npos);
  };
  for (const auto& kind : ElementKinds()) check(kind);
  for (const auto& statement : StudyStatements()) check(statement);
  REQUIRE_FALSE(Section(doc, "probe").empty());
}

}  // namespace
}  // namespace lcc
