// The abstract syntax tree of a netlist statement.
//
// Plain structs; every node that elaboration may need to point at carries
// the byte offset of its first character (`Located`), so a message about a
// value can put its caret under that value. The grammar is generic: every
// statement is `keyword [name] [(ports)] key = value ... ["text"]`, and
// elaboration decides what each keyword allows.
#pragma once

#include <boost/optional.hpp>
#include <boost/spirit/home/x3/support/ast/variant.hpp>
#include <cstddef>
#include <string>
#include <vector>

namespace lcc::ast {

namespace x3 = boost::spirit::x3;

struct Located {
  std::size_t offset = 0;
};

struct Ident : Located {
  std::string name;
};

// A literal number with its (optional) unit word, e.g. `2.5 mH`.
struct Number : Located {
  double value = 0.0;
  std::string unit;          // empty when none was written
  std::size_t unit_offset = 0;
};

// A dotted, optionally indexed name: `x`, `Ld.i`, `B1[1].i`, `Grid.a.i`.
struct PathPart {
  std::string name;
  int index = -1;  // -1: no [index]
};
struct Path : Located {
  std::vector<PathPart> parts;
};

struct StringLit : Located {
  std::string value;
};

// A parenthesised list of node names: `(a, b, c)`.
struct Tuple : Located {
  std::vector<Ident> items;
};

struct Unary;
struct Call;
struct Expr;

struct Operand : x3::variant<Number, Path, x3::forward_ast<Call>,
                             x3::forward_ast<Unary>, x3::forward_ast<Expr>> {
  using base_type::base_type;
  using base_type::operator=;
};

struct Unary : Located {
  char op = '-';
  Operand operand;
};

struct Operation : Located {
  char op = '+';
  Operand operand;
};

// A left-to-right chain of operations of one precedence level ('^' chains
// are evaluated right to left).
struct Expr : Located {
  Operand first;
  std::vector<Operation> rest;
};

struct Call : Located {
  Ident function;
  std::vector<Expr> args;
};

struct Value : x3::variant<Tuple, Expr> {
  using base_type::base_type;
  using base_type::operator=;
};

struct Setting : Located {
  Ident key;
  Value value;
};

struct Statement : Located {
  Ident keyword;
  boost::optional<Ident> name;
  boost::optional<Tuple> ports;
  std::vector<Setting> settings;
  boost::optional<StringLit> text;
};

// One line of a case: `set TARGET = EXPR` at the start, or
// `at TIME VERB TARGET [= EXPR] [key = value ...]` during the run
// (verbs: set, close, open, short, misfire).
struct Action : Located {
  boost::optional<Expr> at;
  Ident verb;
  Path target;
  boost::optional<Expr> value;
  std::vector<Setting> settings;
};

// `sweep TARGET = FROM .. TO step STEP`.
struct RangeSweep : Located {
  Path target;
  Expr from, to, step;
};

// `sweep TARGET in (V1, V2, ...)`.
struct ListSweep : Located {
  Path target;
  std::vector<Expr> values;
};

}  // namespace lcc::ast
