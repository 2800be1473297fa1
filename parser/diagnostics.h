// Diagnostics: the errors, warnings and notes found in a netlist.
//
// Every message is rendered as
//     file:line:column: error: what is wrong
//         the offending line
//         ^ (a caret under the column)
//     hint: what to try (when there is one)
// The collector keeps going after an error so a whole file is reported at
// once; it stops collecting after `max_errors` errors to keep output sane.
#pragma once

#include <string>
#include <vector>

#include "parser/source.h"

namespace lcc {

enum class Severity { kError, kWarning, kNote };

struct Diagnostic {
  Severity severity = Severity::kError;
  SourceLoc loc;
  std::string message;
  std::string hint;
};

class Diagnostics {
 public:
  explicit Diagnostics(int max_errors = 50) : max_errors_(max_errors) {}

  void Error(const SourceLoc& loc, std::string message, std::string hint = {});
  void Warning(const SourceLoc& loc, std::string message, std::string hint = {});
  void Note(const SourceLoc& loc, std::string message, std::string hint = {});

  bool has_errors() const { return error_count_ > 0; }
  int error_count() const { return error_count_; }
  // True once max_errors errors were recorded; later errors are dropped.
  bool saturated() const { return error_count_ >= max_errors_; }
  const std::vector<Diagnostic>& all() const { return items_; }

  // All diagnostics, rendered, in the order they were found.
  std::string Format() const;
  static std::string Format(const Diagnostic& d);

 private:
  void Add(Severity s, const SourceLoc& loc, std::string message, std::string hint);

  int max_errors_;
  int error_count_ = 0;
  std::vector<Diagnostic> items_;
};

}  // namespace lcc
