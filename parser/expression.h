// Expressions with dimensional analysis.
//
// CompileExpression() checks an expression's units and turns it into a small
// postfix Program; names are resolved by the caller (a parameter becomes a
// constant, a probe's `Ld.i` becomes a signal slot). EvaluateProgram() runs a
// program on signal values. Every unit error, unknown function and
// (for constant programs) division by zero or domain error is reported at the
// column of the offending operator or value.
//
// Dimension rules: + and - need equal dimensions; * and / combine them;
// x^y needs a plain-number y, and an integer constant y when x has a
// dimension; sqrt halves even exponents; sin cos tan exp log atan need plain
// numbers (angles are plain numbers in radians); atan2, min, max need equal
// dimensions; abs keeps its argument's.
#pragma once

#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "parser/ast.h"
#include "parser/diagnostics.h"
#include "parser/units.h"

namespace lcc {

enum class Function { kSqrt, kSin, kCos, kTan, kAtan, kAtan2, kExp, kLog, kAbs, kMin, kMax };

struct ProgramOp {
  enum class Code { kConst, kSignal, kNeg, kAdd, kSub, kMul, kDiv, kPow, kCall };
  Code code = Code::kConst;
  double value = 0.0;        // kConst
  int index = 0;             // kSignal: slot; kCall: number of arguments
  Function function = Function::kAbs;
  std::size_t offset = 0;    // where in the source, for run-time errors
};

struct Program {
  std::vector<ProgramOp> ops;
  Dim dim;
  bool constant() const;     // no signal slots
};

// What a name in an expression stands for.
struct Resolved {
  enum class Kind { kConstant, kSignal } kind = Kind::kConstant;
  Quantity quantity;  // kConstant
  int slot = 0;       // kSignal
  Dim dim;            // kSignal
};

// Resolves a path; on failure reports the error itself and returns nothing.
using PathResolver = std::function<std::optional<Resolved>(const ast::Path&)>;

std::optional<Program> CompileExpression(const ast::Expr& expr,
                                         const std::shared_ptr<const SourceFile>& file,
                                         const PathResolver& resolve, Diagnostics& diags);

// Runs a program. With `diags` given, a division by zero, a domain error or a
// non-finite result is reported at its source column and nothing is
// returned; without, the IEEE result is returned as is (for probes).
std::optional<double> EvaluateProgram(const Program& program, const double* signals,
                                      const std::shared_ptr<const SourceFile>& file,
                                      Diagnostics* diags);

}  // namespace lcc
