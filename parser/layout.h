// Layout: splits netlist text into statements (language principles 1 and 2).
//
// A statement is one line, continued onto the next line while a '(' or '['
// is open, or when the next line is indented deeper than the statement's
// first line. '{' ... '}' holds a block of statements, one a line. '#' starts
// a comment. The result is a copy of the text of the same length in which
// comments and continuation line breaks are blanked out, so byte offsets in
// it are offsets in the file, plus the span of every top-level statement.
//
// Layout also refuses what must never reach the grammar: binary data,
// unbalanced or too deeply nested brackets (the recursion guard that keeps
// 10 000 nested parentheses from overflowing the stack) and unterminated
// strings.
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <vector>

#include "parser/diagnostics.h"

namespace lcc {

// Deepest bracket nesting accepted anywhere in a file.
constexpr int kMaxBracketNesting = 64;
// Longest statement accepted (a guard against runaway input, not a style rule).
constexpr std::size_t kMaxStatementBytes = std::size_t{64} * 1024;

struct StatementSpan {
  std::size_t begin = 0;  // first non-blank byte
  std::size_t end = 0;    // one past the last byte (excludes the line break)
};

struct Layout {
  std::string clean;                     // same length as the source text
  std::vector<StatementSpan> statements;  // top level, in file order
};

// Never throws on bad input: problems go to `diags`, and the statements that
// could be delimited are still returned.
Layout LayOut(const std::shared_ptr<const SourceFile>& file, Diagnostics& diags);

}  // namespace lcc
