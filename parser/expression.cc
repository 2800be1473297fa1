#include "parser/expression.h"

#include <fmt/format.h>

#include <cmath>
#include <map>

namespace lcc {
namespace {

using Code = ProgramOp::Code;

struct FunctionInfo {
  Function id;
  int min_args;
  int max_args;
};

const std::map<std::string, FunctionInfo>& Functions() {
  static const std::map<std::string, FunctionInfo> kTable{
      {"sqrt", {Function::kSqrt, 1, 1}},  {"sin", {Function::kSin, 1, 1}},
      {"cos", {Function::kCos, 1, 1}},    {"tan", {Function::kTan, 1, 1}},
      {"atan", {Function::kAtan, 1, 1}},  {"atan2", {Function::kAtan2, 2, 2}},
      {"exp", {Function::kExp, 1, 1}},    {"log", {Function::kLog, 1, 1}},
      {"abs", {Function::kAbs, 1, 1}},    {"min", {Function::kMin, 2, 64}},
      {"max", {Function::kMax, 2, 64}},
  };
  return kTable;
}

class Compiler {
 public:
  Compiler(const std::shared_ptr<const SourceFile>& file, const PathResolver& resolve,
           Diagnostics& diags)
      : file_(file), resolve_(resolve), diags_(diags) {}

  // Appends the code of `e` to `out`; returns its dimension or nothing.
  std::optional<Dim> Chain(const ast::Expr& e, Program& out) {
    if (e.rest.empty()) return Operand(e.first, out);
    if (e.rest.front().op == '^') return PowerChain(e, 0, out);
    auto left = Operand(e.first, out);
    if (!left) return std::nullopt;
    Dim dim = *left;
    for (const auto& op : e.rest) {
      auto right = Operand(op.operand, out);
      if (!right) return std::nullopt;
      const std::size_t at = OffsetOfOperand(op.operand);
      switch (op.op) {
        case '+':
        case '-':
          if (!(dim == *right)) {
            Error(at, fmt::format("cannot {} {} and {}", op.op == '+' ? "add" : "subtract",
                                  DimName(dim), DimName(*right)));
            return std::nullopt;
          }
          Emit(out, op.op == '+' ? Code::kAdd : Code::kSub, at);
          break;
        case '*':
          dim = dim * *right;
          Emit(out, Code::kMul, at);
          break;
        case '/':
          dim = dim / *right;
          Emit(out, Code::kDiv, at);
          break;
        default:
          Error(at, fmt::format("unexpected operator '{}'", op.op));
          return std::nullopt;
      }
    }
    return dim;
  }

 private:
  // a ^ b ^ c is a ^ (b ^ c).
  std::optional<Dim> PowerChain(const ast::Expr& e, std::size_t k, Program& out) {
    const ast::Operand& base = k == 0 ? e.first : e.rest[k - 1].operand;
    if (k == e.rest.size()) return Operand(base, out);
    auto base_dim = Operand(base, out);
    if (!base_dim) return std::nullopt;
    Program exponent;
    auto exp_dim = PowerChain(e, k + 1, exponent);
    if (!exp_dim) return std::nullopt;
    const std::size_t at = OffsetOfOperand(e.rest[k].operand);
    if (!exp_dim->dimensionless()) {
      Error(at, "an exponent must be a plain number, found " + DimName(*exp_dim));
      return std::nullopt;
    }
    Dim result = *base_dim;
    if (!base_dim->dimensionless()) {
      std::optional<double> n;
      if (exponent.constant()) n = EvaluateProgram(exponent, nullptr, file_, nullptr);
      if (!n || *n != std::round(*n) || std::abs(*n) > 64) {
        Error(at, "a quantity with a unit can only be raised to a whole constant power",
              "use sqrt() for square roots");
        return std::nullopt;
      }
      result = base_dim->Pow(static_cast<int>(*n));
    }
    out.ops.insert(out.ops.end(), exponent.ops.begin(), exponent.ops.end());
    Emit(out, Code::kPow, at);
    return result;
  }

  std::optional<Dim> Operand(const ast::Operand& operand, Program& out) {
    struct Visitor {
      Compiler& c;
      Program& out;
      std::optional<Dim> operator()(const ast::Number& n) { return c.NumberOp(n, out); }
      std::optional<Dim> operator()(const ast::Path& p) { return c.PathOp(p, out); }
      std::optional<Dim> operator()(const ast::Call& call) { return c.CallOp(call, out); }
      std::optional<Dim> operator()(const ast::Unary& u) {
        auto d = c.Operand(u.operand, out);
        if (d && u.op == '-') c.Emit(out, Code::kNeg, u.offset);
        return d;
      }
      std::optional<Dim> operator()(const ast::Expr& e) { return c.Chain(e, out); }
    };
    Visitor v{*this, out};
    return boost::apply_visitor(v, operand);
  }

  std::optional<Dim> NumberOp(const ast::Number& n, Program& out) {
    UnitInfo unit;
    if (!n.unit.empty()) {
      auto found = LookUpUnit(n.unit);
      if (!found) {
        Error(n.unit_offset, "unknown unit '" + n.unit + "'", KnownUnitsHint());
        return std::nullopt;
      }
      unit = *found;
    }
    ProgramOp op;
    op.code = Code::kConst;
    op.value = n.value * unit.scale;
    op.offset = n.offset;
    out.ops.push_back(op);
    return unit.dim;
  }

  std::optional<Dim> PathOp(const ast::Path& p, Program& out) {
    if (p.parts.size() == 1 && p.parts[0].index < 0) {
      const std::string& name = p.parts[0].name;
      if (name == "pi") {
        ProgramOp op;
        op.value = M_PI;
        op.offset = p.offset;
        out.ops.push_back(op);
        return dims::kNone;
      }
      if (name == "inf" || name == "nan" || name == "infinity" || name == "NaN" || name == "Inf") {
        Error(p.offset, "'" + name + "' is not a number: every value must be finite");
        return std::nullopt;
      }
    }
    auto r = resolve_(p);
    if (!r) return std::nullopt;
    ProgramOp op;
    op.offset = p.offset;
    if (r->kind == Resolved::Kind::kConstant) {
      op.code = Code::kConst;
      op.value = r->quantity.value;
      out.ops.push_back(op);
      return r->quantity.dim;
    }
    op.code = Code::kSignal;
    op.index = r->slot;
    out.ops.push_back(op);
    return r->dim;
  }

  std::optional<Dim> CallOp(const ast::Call& call, Program& out) {
    auto it = Functions().find(call.function.name);
    if (it == Functions().end()) {
      Error(call.function.offset, "unknown function '" + call.function.name + "'",
            "functions are sqrt sin cos tan atan atan2 exp log abs min max");
      return std::nullopt;
    }
    const FunctionInfo& f = it->second;
    const int n = static_cast<int>(call.args.size());
    if (n < f.min_args || n > f.max_args) {
      Error(call.function.offset,
            fmt::format("{}() takes {} argument{}, found {}", call.function.name, f.min_args,
                        f.min_args == 1 ? "" : "s", n));
      return std::nullopt;
    }
    std::vector<Dim> arg_dims;
    for (const auto& a : call.args) {
      auto d = Chain(a, out);
      if (!d) return std::nullopt;
      arg_dims.push_back(*d);
    }
    const std::size_t at = call.function.offset;
    Dim result = dims::kNone;
    auto need_plain = [&]() -> bool {
      if (arg_dims[0].dimensionless()) return true;
      Error(at, fmt::format("{}() needs a plain number (or angle), found {}", call.function.name,
                            DimName(arg_dims[0])));
      return false;
    };
    auto need_same = [&]() -> bool {
      for (const auto& d : arg_dims) {
        if (!(d == arg_dims[0])) {
          Error(at, fmt::format("{}() needs arguments of one kind, found {} and {}",
                                call.function.name, DimName(arg_dims[0]), DimName(d)));
          return false;
        }
      }
      return true;
    };
    switch (f.id) {
      case Function::kSqrt: {
        const Dim& d = arg_dims[0];
        if (d.kg % 2 || d.m % 2 || d.s % 2 || d.A % 2) {
          Error(at, "sqrt() of " + DimName(d) + " has no unit");
          return std::nullopt;
        }
        result = Dim{d.kg / 2, d.m / 2, d.s / 2, d.A / 2};
        break;
      }
      case Function::kSin: case Function::kCos: case Function::kTan: case Function::kAtan:
      case Function::kExp: case Function::kLog:
        if (!need_plain()) return std::nullopt;
        break;
      case Function::kAtan2:
        if (!need_same()) return std::nullopt;
        break;
      case Function::kAbs:
        result = arg_dims[0];
        break;
      case Function::kMin: case Function::kMax:
        if (!need_same()) return std::nullopt;
        result = arg_dims[0];
        break;
    }
    ProgramOp op;
    op.code = Code::kCall;
    op.function = f.id;
    op.index = n;
    op.offset = at;
    out.ops.push_back(op);
    return result;
  }

  static std::size_t OffsetOfOperand(const ast::Operand& operand) {
    struct V {
      std::size_t operator()(const ast::Number& n) const { return n.offset; }
      std::size_t operator()(const ast::Path& p) const { return p.offset; }
      std::size_t operator()(const ast::Call& c) const { return c.function.offset; }
      std::size_t operator()(const ast::Unary& u) const { return u.offset; }
      std::size_t operator()(const ast::Expr& e) const { return e.offset; }
    };
    return boost::apply_visitor(V{}, operand);
  }

  void Emit(Program& out, Code code, std::size_t at) {
    ProgramOp op;
    op.code = code;
    op.offset = at;
    out.ops.push_back(op);
  }

  void Error(std::size_t offset, std::string message, std::string hint = {}) {
    diags_.Error(SourceLoc{file_, offset}, std::move(message), std::move(hint));
  }

  std::shared_ptr<const SourceFile> file_;
  const PathResolver& resolve_;
  Diagnostics& diags_;
};

}  // namespace

bool Program::constant() const {
  for (const auto& op : ops)
    if (op.code == Code::kSignal) return false;
  return true;
}

std::optional<Program> CompileExpression(const ast::Expr& expr,
                                         const std::shared_ptr<const SourceFile>& file,
                                         const PathResolver& resolve, Diagnostics& diags) {
  Compiler compiler(file, resolve, diags);
  Program program;
  auto dim = compiler.Chain(expr, program);
  if (!dim) return std::nullopt;
  program.dim = *dim;
  return program;
}

std::optional<double> EvaluateProgram(const Program& program, const double* signals,
                                      const std::shared_ptr<const SourceFile>& file,
                                      Diagnostics* diags) {
  // Expressions are short; a fixed stack keeps probe evaluation allocation-free.
  constexpr std::size_t kStack = 256;
  double stack[kStack];
  std::size_t sp = 0;
  auto fail = [&](std::size_t offset, const std::string& message) -> std::optional<double> {
    if (diags) {
      diags->Error(SourceLoc{file, offset}, message);
      return std::nullopt;
    }
    return std::nan("");
  };
  // How many operands each operation takes from the stack. A program from
  // CompileExpression() always has them; one that does not (a defect) is
  // refused rather than read out of bounds.
  auto operands = [](const ProgramOp& op) -> std::size_t {
    switch (op.code) {
      case Code::kConst: case Code::kSignal: return 0;
      case Code::kNeg: return 1;
      case Code::kCall: return static_cast<std::size_t>(std::max(op.index, 1));
      default: return 2;
    }
  };
  for (const auto& op : program.ops) {
    if (sp < operands(op)) return fail(op.offset, "malformed expression program (operand missing)");
    switch (op.code) {
      case Code::kConst:
        if (sp == kStack) return fail(op.offset, "expression too deep");
        stack[sp++] = op.value;
        break;
      case Code::kSignal:
        if (sp == kStack) return fail(op.offset, "expression too deep");
        stack[sp++] = signals[op.index];
        break;
      case Code::kNeg:
        stack[sp - 1] = -stack[sp - 1];
        break;
      case Code::kAdd: case Code::kSub: case Code::kMul: case Code::kDiv: case Code::kPow: {
        double b = stack[--sp];
        double& a = stack[sp - 1];
        if (op.code == Code::kAdd) a += b;
        else if (op.code == Code::kSub) a -= b;
        else if (op.code == Code::kMul) a *= b;
        else if (op.code == Code::kDiv) {
          if (b == 0.0 && diags) return fail(op.offset, "division by zero");
          a /= b;
        } else {
          a = std::pow(a, b);
        }
        break;
      }
      case Code::kCall: {
        const int n = op.index;
        double* args = &stack[sp - n];
        double r = 0.0;
        switch (op.function) {
          case Function::kSqrt:
            if (args[0] < 0 && diags) return fail(op.offset, "sqrt() of a negative value");
            r = std::sqrt(args[0]);
            break;
          case Function::kSin: r = std::sin(args[0]); break;
          case Function::kCos: r = std::cos(args[0]); break;
          case Function::kTan: r = std::tan(args[0]); break;
          case Function::kAtan: r = std::atan(args[0]); break;
          case Function::kAtan2: r = std::atan2(args[0], args[1]); break;
          case Function::kExp: r = std::exp(args[0]); break;
          case Function::kLog:
            if (args[0] <= 0 && diags) return fail(op.offset, "log() of a value that is not positive");
            r = std::log(args[0]);
            break;
          case Function::kAbs: r = std::abs(args[0]); break;
          case Function::kMin: case Function::kMax:
            r = args[0];
            for (int k = 1; k < n; ++k)
              r = op.function == Function::kMin ? std::min(r, args[k]) : std::max(r, args[k]);
            break;
        }
        sp -= n;
        stack[sp++] = r;
        break;
      }
    }
  }
  double result = sp == 1 ? stack[0] : std::nan("");
  if (diags && !std::isfinite(result) && !program.ops.empty())
    return fail(program.ops.front().offset, "the value is not finite");
  return result;
}

}  // namespace lcc
