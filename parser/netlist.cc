// Spirit X3 grammar of one statement. Tokens (names, paths, numbers with
// units, strings, node tuples) are small hand-written X3 primitive parsers so
// that they can refuse malformed input with a precise message; the
// expression and statement structure is ordinary X3.
#include "parser/netlist.h"
#include "parser/units.h"

#include <boost/fusion/include/adapt_struct.hpp>
#include <boost/spirit/home/x3.hpp>
#include <charconv>
#include <cmath>
#include <fmt/format.h>

BOOST_FUSION_ADAPT_STRUCT(lcc::ast::Unary, op, operand)
BOOST_FUSION_ADAPT_STRUCT(lcc::ast::Operation, op, operand)
BOOST_FUSION_ADAPT_STRUCT(lcc::ast::Expr, first, rest)
BOOST_FUSION_ADAPT_STRUCT(lcc::ast::Call, function, args)
BOOST_FUSION_ADAPT_STRUCT(lcc::ast::Setting, key, value)
BOOST_FUSION_ADAPT_STRUCT(lcc::ast::Statement, keyword, name, ports, settings, text)
BOOST_FUSION_ADAPT_STRUCT(lcc::ast::Action, at, verb, target, value, settings)
BOOST_FUSION_ADAPT_STRUCT(lcc::ast::RangeSweep, target, from, to, step)
BOOST_FUSION_ADAPT_STRUCT(lcc::ast::ListSweep, target, values)

namespace lcc {
namespace grammar {

namespace x3 = boost::spirit::x3;
using Iter = const char*;

// A token-level error with its own wording (for example a malformed number).
struct TokenError {
  Iter where;
  std::string message;
  std::string hint;
};

struct begin_tag;

// Stores the start offset of every Located node a rule produced.
struct annotate_position {
  template <typename T, typename Context>
  void on_success(Iter const& first, Iter const&, T& node, Context const& ctx) const {
    if constexpr (std::is_base_of_v<ast::Located, T>) {
      node.offset = static_cast<std::size_t>(first - x3::get<begin_tag>(ctx));
    }
  }
};

inline std::size_t OffsetOf(Iter it, Iter begin) { return static_cast<std::size_t>(it - begin); }

inline bool IsIdentStart(char c) {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_';
}
inline bool IsIdentChar(char c) { return IsIdentStart(c) || (c >= '0' && c <= '9'); }
inline bool IsDigit(char c) { return c >= '0' && c <= '9'; }
inline bool IsBlank(char c) { return c == ' ' || c == '\t' || c == '\r'; }

// Reads [A-Za-z_][A-Za-z0-9_]* at `it`; returns the end.
inline Iter ScanIdent(Iter it, Iter last) {
  if (it == last || !IsIdentStart(*it)) return it;
  while (it != last && IsIdentChar(*it)) ++it;
  return it;
}

// A name; with `not_key`, only a name that is not followed by '=' (the name
// of an element, as opposed to the key of a setting).
struct ident_parser : x3::parser<ident_parser> {
  using attribute_type = ast::Ident;
  static bool const has_attribute = true;
  bool not_key = false;
  explicit ident_parser(bool refuse_key = false) : not_key(refuse_key) {}
  template <typename Context, typename RContext, typename Attribute>
  bool parse(Iter& first, Iter const& last, Context const& ctx, RContext&, Attribute& attr) const {
    x3::skip_over(first, last, ctx);
    Iter end = ScanIdent(first, last);
    if (end == first) return false;
    if (not_key) {
      Iter after = end;
      while (after != last && IsBlank(*after)) ++after;
      if (after != last && *after == '=') return false;
    }
    ast::Ident id;
    id.offset = OffsetOf(first, x3::get<begin_tag>(ctx));
    id.name.assign(first, end);
    x3::traits::move_to(id, attr);
    first = end;
    return true;
  }
};

// name ('[' digits ']')? ('.' name ('[' digits ']')?)*, with no blanks inside.
struct path_parser : x3::parser<path_parser> {
  using attribute_type = ast::Path;
  static bool const has_attribute = true;
  template <typename Context, typename RContext, typename Attribute>
  bool parse(Iter& first, Iter const& last, Context const& ctx, RContext&, Attribute& attr) const {
    x3::skip_over(first, last, ctx);
    ast::Path path;
    path.offset = OffsetOf(first, x3::get<begin_tag>(ctx));
    Iter it = first;
    for (;;) {
      Iter end = ScanIdent(it, last);
      if (end == it) {
        if (path.parts.empty()) return false;
        throw TokenError{it, "expected a name after '.'", ""};
      }
      ast::PathPart part;
      part.name.assign(it, end);
      it = end;
      if (it != last && *it == '[') {
        Iter digits = it + 1;
        Iter d = digits;
        while (d != last && IsDigit(*d)) ++d;
        if (d == digits || d == last || *d != ']' || d - digits > 6)
          throw TokenError{it, "expected an index such as [1] after '" + part.name + "'", ""};
        part.index = std::stoi(std::string(digits, d));
        it = d + 1;
      }
      path.parts.push_back(std::move(part));
      if (it != last && *it == '.' && it + 1 != last && IsIdentStart(*(it + 1))) {
        ++it;
        continue;
      }
      break;
    }
    first = it;
    x3::traits::move_to(path, attr);
    return true;
  }
};

// A number, optionally followed by a unit word: `400 V`, `2.5mH`, `6 %`.
// Refuses `1.2.3` and `1e` outright rather than leaving a confusing rest.
struct number_parser : x3::parser<number_parser> {
  using attribute_type = ast::Number;
  static bool const has_attribute = true;

  static bool IsUnitByte(char c) {
    // Letters, and the lead/continuation bytes of 'µ' (C2 B5) and 'Ω' (CE A9).
    unsigned char u = static_cast<unsigned char>(c);
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || u == 0xC2 || u == 0xB5 ||
           u == 0xCE || u == 0xA9;
  }

  template <typename Context, typename RContext, typename Attribute>
  bool parse(Iter& first, Iter const& last, Context const& ctx, RContext&, Attribute& attr) const {
    x3::skip_over(first, last, ctx);
    Iter it = first;
    Iter mantissa_begin = it;
    while (it != last && IsDigit(*it)) ++it;
    bool had_digits = it != mantissa_begin;
    if (it != last && *it == '.') {
      Iter frac = it + 1;
      Iter d = frac;
      while (d != last && IsDigit(*d)) ++d;
      if (!had_digits && d == frac) return false;  // a lone '.'
      had_digits = true;
      it = d;
    }
    if (!had_digits) return false;
    auto malformed = [&](Iter end) {
      Iter stop = end;
      while (stop != last && (IsIdentChar(*stop) || *stop == '.')) ++stop;
      throw TokenError{first, "malformed number '" + std::string(first, stop) + "'",
                       "write numbers as 12, 0.5, 1.5e-3 or 2.2e3"};
    };
    if (it != last && (*it == 'e' || *it == 'E')) {
      Iter e = it + 1;
      if (e != last && (*e == '+' || *e == '-')) ++e;
      if (e != last && IsDigit(*e)) {
        while (e != last && IsDigit(*e)) ++e;
        it = e;
      } else if (e == last || !IsIdentChar(*e) || *(it + 1) == '+' || *(it + 1) == '-') {
        malformed(e);
      }
      // else: `2 eV`-like glued word; handled as a unit below.
    }
    if (it != last && (*it == '.' || IsDigit(*it))) malformed(it);

    ast::Number number;
    number.offset = OffsetOf(first, x3::get<begin_tag>(ctx));
    auto result = std::from_chars(first, it, number.value);
    if (result.ec == std::errc::result_out_of_range || !std::isfinite(number.value)) {
      throw TokenError{first, "number '" + std::string(first, it) + "' is out of range", ""};
    }
    if (result.ec != std::errc() || result.ptr != it) malformed(it);

    // Optional unit: a word not followed by '=' (then it is the next key),
    // '(' (a function), '.' or '[' (a path).
    Iter u = it;
    while (u != last && IsBlank(*u)) ++u;
    Iter unit_begin = u;
    if (u != last && *u == '%') {
      ++u;
    } else {
      while (u != last && IsUnitByte(*u)) ++u;
      // A unit word with digits in it (`A2s`, `kA2s`) when it is a known unit.
      if (u != unit_begin && u != last && IsIdentChar(*u)) {
        Iter w = u;
        while (w != last && IsIdentChar(*w)) ++w;
        if (LookUpUnit(std::string_view(unit_begin, static_cast<std::size_t>(w - unit_begin)))) u = w;
      }
    }
    if (u != unit_begin && (u == last || !IsIdentChar(*u))) {
      Iter after = u;
      while (after != last && IsBlank(*after)) ++after;
      const bool is_key = after != last && *after == '=' && (after + 1 == last || *(after + 1) != '=');
      const bool is_other = u != last && (*u == '(' || *u == '.' || *u == '[');
      if (!is_key && !is_other) {
        number.unit.assign(unit_begin, u);
        number.unit_offset = OffsetOf(unit_begin, x3::get<begin_tag>(ctx));
        it = u;
      }
    } else if (u != unit_begin && u != last && IsIdentChar(*u) && unit_begin == it) {
      // Glued word with digits or '_' in it, like `10V2`: not a unit.
      Iter stop = u;
      while (stop != last && IsIdentChar(*stop)) ++stop;
      throw TokenError{unit_begin, "'" + std::string(unit_begin, stop) + "' is not a unit", ""};
    }
    first = it;
    x3::traits::move_to(number, attr);
    return true;
  }
};

struct string_parser : x3::parser<string_parser> {
  using attribute_type = ast::StringLit;
  static bool const has_attribute = true;
  template <typename Context, typename RContext, typename Attribute>
  bool parse(Iter& first, Iter const& last, Context const& ctx, RContext&, Attribute& attr) const {
    x3::skip_over(first, last, ctx);
    if (first == last || *first != '"') return false;
    Iter end = first + 1;
    while (end != last && *end != '"') ++end;
    if (end == last) return false;  // layout already refused unterminated strings
    ast::StringLit s;
    s.offset = OffsetOf(first, x3::get<begin_tag>(ctx));
    s.value.assign(first + 1, end);
    first = end + 1;
    x3::traits::move_to(s, attr);
    return true;
  }
};

// '(' name (',' name)* ')' with at least `min_items` names (0 allows "()").
struct tuple_parser : x3::parser<tuple_parser> {
  using attribute_type = ast::Tuple;
  static bool const has_attribute = true;
  int min_items = 0;
  explicit tuple_parser(int min) : min_items(min) {}

  template <typename Context, typename RContext, typename Attribute>
  bool parse(Iter& first, Iter const& last, Context const& ctx, RContext&, Attribute& attr) const {
    x3::skip_over(first, last, ctx);
    if (first == last || *first != '(') return false;
    Iter begin = x3::get<begin_tag>(ctx);
    ast::Tuple tuple;
    tuple.offset = OffsetOf(first, begin);
    Iter it = first + 1;
    auto skip = [&] { while (it != last && IsBlank(*it)) ++it; };
    skip();
    if (it != last && *it == ')') {
      if (min_items > 0) return false;
      first = it + 1;
      x3::traits::move_to(tuple, attr);
      return true;
    }
    for (;;) {
      skip();
      Iter end = ScanIdent(it, last);
      if (end == it) return false;
      ast::Ident id;
      id.offset = OffsetOf(it, begin);
      id.name.assign(it, end);
      tuple.items.push_back(std::move(id));
      it = end;
      skip();
      if (it != last && *it == ',') {
        ++it;
        continue;
      }
      if (it != last && *it == ')') break;
      return false;
    }
    if (static_cast<int>(tuple.items.size()) < min_items) return false;
    first = it + 1;
    x3::traits::move_to(tuple, attr);
    return true;
  }
};

ident_parser const ident{};
ident_parser const element_name{true};
path_parser const path{};
number_parser const number{};
string_parser const string_lit{};
tuple_parser const ports_tuple{0};
tuple_parser const node_tuple{2};

class expr_class : public annotate_position {};
class term_class : public annotate_position {};
class power_class : public annotate_position {};
class unary_class {};
class unary_op_class : public annotate_position {};
class primary_class {};
class call_class : public annotate_position {};
class value_class {};
class setting_class : public annotate_position {};
class statement_class : public annotate_position {};
class action_class : public annotate_position {};
class range_sweep_class : public annotate_position {};
class list_sweep_class : public annotate_position {};

x3::rule<expr_class, ast::Expr> const expr = "an expression";
x3::rule<term_class, ast::Expr> const term = "an expression";
x3::rule<power_class, ast::Expr> const power = "an expression";
x3::rule<unary_class, ast::Operand> const unary = "a value";
x3::rule<unary_op_class, ast::Unary> const unary_op = "a value";
x3::rule<primary_class, ast::Operand> const primary = "a value";
x3::rule<call_class, ast::Call> const call = "a function call";
x3::rule<value_class, ast::Value> const value = "a value (a number, a name, an expression or a node list)";
x3::rule<setting_class, ast::Setting> const setting = "key = value";
x3::rule<statement_class, ast::Statement> const statement = "a statement";

auto const expr_def = term >> *(x3::char_("+-") > term);
auto const term_def = unary >> *(x3::char_("*/") > unary);
auto const unary_def = unary_op | power;
auto const unary_op_def = x3::char_("+-") > unary;
auto const power_def = primary >> *(x3::char_('^') > unary);
auto const primary_def = number | call | path | (x3::lit('(') > expr > x3::lit(')'));
auto const call_def = ident >> x3::lit('(') >> (expr % ',') > x3::lit(')');
auto const value_def = node_tuple | expr;
auto const setting_def = ident >> x3::lit('=') > value;
auto const statement_def = ident >> -element_name >> -ports_tuple >> *setting >>
                           -string_lit;

// A keyword that is a whole word (`at` is not the start of `attack`).
inline auto Keyword(const char* word) { return x3::lexeme[x3::lit(word) >> !x3::char_("A-Za-z0-9_")]; }

x3::rule<action_class, ast::Action> const action = "a case action";
x3::rule<range_sweep_class, ast::RangeSweep> const range_sweep = "a sweep range";
x3::rule<list_sweep_class, ast::ListSweep> const list_sweep = "a sweep list";
auto const action_def = -(Keyword("at") > expr) >> ident > path >> -(x3::lit('=') > expr) >> *setting;
auto const range_sweep_def = path >> x3::lit('=') >> expr >> x3::lit("..") > expr > Keyword("step") > expr;
auto const list_sweep_def = path >> Keyword("in") > x3::lit('(') > (expr % ',') > x3::lit(')');

BOOST_SPIRIT_DEFINE(expr, term, power, unary, unary_op, primary, call, value, setting, statement, action,
                    range_sweep, list_sweep)

}  // namespace grammar

namespace {

std::string Describe(const char* it, const char* last) {
  if (it == last) return "end of statement";
  const char* end = it;
  if (grammar::IsIdentChar(*it)) {
    while (end != last && grammar::IsIdentChar(*end) && end - it < 40) ++end;
  } else {
    // One UTF-8 character.
    ++end;
    while (end != last && (static_cast<unsigned char>(*end) & 0xC0) == 0x80) ++end;
  }
  return "'" + std::string(it, end) + "'";
}

}  // namespace

namespace {

// Parses [span.begin, span.end) with `rule` into `result`; a syntax error
// becomes a diagnostic. `what` names the form in the message.
template <typename Rule, typename Attr>
bool ParseSpan(const std::shared_ptr<const SourceFile>& file, const std::string& clean_text, const StatementSpan& span,
               Diagnostics& diags, const Rule& rule, Attr& result, const char* what, const char* hint,
               bool report = true) {
  namespace x3 = boost::spirit::x3;
  const char* begin = clean_text.data();
  const char* first = begin + span.begin;
  const char* const last = begin + span.end;
  auto loc = [&](const char* at) { return SourceLoc{file, static_cast<std::size_t>(at - begin)}; };
  auto const skipper = x3::char_(" \t\r\n");
  auto const parser = x3::with<grammar::begin_tag>(begin)[rule];
  try {
    bool ok = x3::phrase_parse(first, last, parser, skipper, result);
    while (first != last && grammar::IsBlank(*first)) ++first;
    if (!ok) {
      if (report) diags.Error(loc(first), std::string("expected ") + what, hint);
      return false;
    }
    if (first != last) {
      if (report) diags.Error(loc(first), "unexpected " + Describe(first, last), hint);
      return false;
    }
  } catch (const x3::expectation_failure<const char*>& e) {
    if (report) diags.Error(loc(e.where()), "expected " + e.which() + ", found " + Describe(e.where(), last));
    return false;
  } catch (const grammar::TokenError& e) {
    if (report) diags.Error(loc(e.where), e.message, e.hint);
    return false;
  }
  return true;
}

}  // namespace

std::optional<ast::Statement> ParseStatement(const std::shared_ptr<const SourceFile>& file,
                                             const std::string& clean_text,
                                             const StatementSpan& span, Diagnostics& diags) {
  ast::Statement result;
  if (!ParseSpan(file, clean_text, span, diags, grammar::statement, result, "a statement",
                 "statements begin with a keyword such as resistor, param or probe"))
    return std::nullopt;
  return result;
}

std::optional<ast::Action> ParseAction(const std::shared_ptr<const SourceFile>& file, const std::string& clean_text,
                                       const StatementSpan& span, Diagnostics& diags) {
  ast::Action result;
  if (!ParseSpan(file, clean_text, span, diags, grammar::action, result, "a case action",
                 "write set ELEMENT.KEY = VALUE, or at TIME close|open|short|misfire|set ..."))
    return std::nullopt;
  return result;
}

std::optional<SweepSyntax> ParseSweep(const std::shared_ptr<const SourceFile>& file, const std::string& clean_text,
                                      const StatementSpan& span, Diagnostics& diags) {
  SweepSyntax out;
  // The range form when there is a '..', the list form otherwise.
  const bool range = clean_text.substr(span.begin, span.end - span.begin).find("..") != std::string::npos;
  const char* hint = "write sweep TARGET = FROM .. TO step STEP, or sweep TARGET in (V1, V2, ...)";
  if (range) {
    ast::RangeSweep r;
    if (!ParseSpan(file, clean_text, span, diags, grammar::range_sweep, r, "a sweep range", hint)) return std::nullopt;
    out.range = std::move(r);
  } else {
    ast::ListSweep l;
    if (!ParseSpan(file, clean_text, span, diags, grammar::list_sweep, l, "a sweep list", hint)) return std::nullopt;
    out.list = std::move(l);
  }
  return out;
}

}  // namespace lcc
