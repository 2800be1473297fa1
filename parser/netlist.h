// The statement grammar (Boost.Spirit X3) and its one entry point.
//
// ParseStatement() parses one statement span found by LayOut() into an AST.
// It never throws: a syntax error becomes a diagnostic with the column where
// the statement stopped making sense, and the caller moves on to the next
// statement, so one bad line does not hide the errors of the others.
#pragma once

#include <memory>
#include <optional>

#include "parser/ast.h"
#include "parser/diagnostics.h"
#include "parser/layout.h"

namespace lcc {

std::optional<ast::Statement> ParseStatement(const std::shared_ptr<const SourceFile>& file,
                                             const std::string& clean_text,
                                             const StatementSpan& span, Diagnostics& diags);

// A line of a case body (see ast::Action); `span` covers the line only.
std::optional<ast::Action> ParseAction(const std::shared_ptr<const SourceFile>& file, const std::string& clean_text,
                                       const StatementSpan& span, Diagnostics& diags);

// What follows the keyword `sweep`: the range form or the list form.
struct SweepSyntax {
  std::optional<ast::RangeSweep> range;
  std::optional<ast::ListSweep> list;
};
std::optional<SweepSyntax> ParseSweep(const std::shared_ptr<const SourceFile>& file, const std::string& clean_text,
                                      const StatementSpan& span, Diagnostics& diags);

}  // namespace lcc
