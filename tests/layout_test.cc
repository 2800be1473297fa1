// Layout: statements, continuation lines and blocks (language principles 1-2).
#include <catch2/catch.hpp>

#include "parser/layout.h"

namespace lcc {
namespace {

std::vector<std::string> Statements(const std::string& text, std::string* errors = nullptr) {
  auto file = std::make_shared<SourceFile>("t.lcc", text);
  Diagnostics diags;
  Layout layout = LayOut(file, diags);
  REQUIRE(layout.clean.size() == text.size());
  std::vector<std::string> out;
  for (const auto& s : layout.statements) out.push_back(layout.clean.substr(s.begin, s.end - s.begin));
  if (errors) *errors = diags.Format();
  else REQUIRE_FALSE(diags.has_errors());
  return out;
}

TEST_CASE("OneStatementPerLineWithCommentsRemoved", "[layout]") {
  auto s = Statements("resistor R1 (a, b) R = 1 ohm  # load\n\n# comment only\nparam x = 2\n");
  REQUIRE(s.size() == 2);
  REQUIRE(s[0] == "resistor R1 (a, b) R = 1 ohm");
  REQUIRE(s[1] == "param x = 2");
}

TEST_CASE("AnOpenBracketContinuesTheStatement", "[layout]") {
  auto s = Statements("supply G (a,\n          b, c) Vll = 1 V\nparam y = 1\n");
  REQUIRE(s.size() == 2);
  REQUIRE(s[0].find("b, c) Vll") != std::string::npos);
}

TEST_CASE("ADeeperIndentedLineContinuesTheStatement", "[layout]") {
  auto s = Statements("transformer T hv = (A, B, C)\n    S = 1 MVA\nparam y = 1\n  # an indented comment\nparam z = 2\n");
  REQUIRE(s.size() == 3);
  REQUIRE(s[0].find("S = 1 MVA") != std::string::npos);
}

TEST_CASE("ABlockHoldsOneStatementPerLine", "[layout]") {
  auto s = Statements("case sag {\n    at 300 ms set G.Vll = 1 V\n    at 400 ms set G.Vll = 2 V\n}\nparam y = 1\n");
  REQUIRE(s.size() == 2);  // the whole block is one top-level statement
  REQUIRE(s[0].find('\n') != std::string::npos);  // inner statements stay separate lines
}

TEST_CASE("NestingBeyondTheLimitIsRefusedNotRecursed", "[layout]") {
  std::string errors;
  Statements("param x = " + std::string(1000, '(') + "1" + std::string(1000, ')') + "\n", &errors);
  REQUIRE(errors.find("nested deeper than 64") != std::string::npos);
}

TEST_CASE("ColumnsCountCharactersNotBytes", "[layout]") {
  SourceFile f("t", "resistor R (a, b) R = 5 \xCE\xA9 X\n");
  // 'X' follows "Ω " : the Ω is two bytes but one column.
  REQUIRE(f.ColumnOf(f.text().find('X')) == 27);
}

TEST_CASE("ADiagnosticFarAlongALongLineShowsItsNeighbourhoodAndCaret", "[layout]") {
  // 200 000 dashes, then 'X': the report names column 200 011 and shows
  // the line cut to the 100 bytes around it, the caret under the 'X'. (The
  // caret was placed in time quadratic in the column; a line this long
  // now takes microseconds.)
  const std::string text = "param x = " + std::string(200'000, '-') + "X\n";
  auto file = std::make_shared<SourceFile>("t.lcc", text);
  Diagnostics diags;
  diags.Error(SourceLoc{file, text.find('X')}, "here");
  const std::string out = diags.Format();
  REQUIRE(out.find("t.lcc:1:200011: error: here") != std::string::npos);
  const auto shown = out.find("    ...");
  REQUIRE(shown != std::string::npos);
  const auto line_end = out.find('\n', shown);
  const auto caret_line = out.substr(line_end + 1, out.find('\n', line_end + 1) - line_end - 1);
  const auto caret = caret_line.find('^');
  REQUIRE(caret != std::string::npos);
  REQUIRE(out[shown + caret] == 'X');
}

}  // namespace
}  // namespace lcc
