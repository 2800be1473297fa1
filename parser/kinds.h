// The element kinds and statements the language accepts, with every key,
// its quantity, its default and its constraint.
//
// This table is the single list elaboration checks settings against, and the
// one the documentation test compares docs/netlist.md with, so the reference
// and the parser cannot drift apart.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "parser/units.h"

namespace lcc {

enum class KeyType {
  kNumber,  // an expression with a unit
  kWord,    // one of a fixed set of words (`valve = diode`)
  kNodes,   // a node list `(a, b, c)`, or one node name when count == 1
  kName,    // a name: of another element (`core = C1`) or a code (`group = Dyn11`)
};

// kFraction: a tolerance, in (0, 0.1]; kPerUnit: a share of a rating, in (0, 1).
enum class Constraint { kAny, kPositive, kNonNegative, kPositiveInteger, kFraction, kPerUnit };

struct KeySpec {
  std::string_view name;
  KeyType type = KeyType::kNumber;
  Dim dim;
  std::optional<double> default_value;  // none: required, or optional without default
  bool required = false;
  Constraint constraint = Constraint::kAny;
  std::vector<std::string_view> words;  // kWord: the accepted words
  std::string_view default_word;        // kWord: the default, if not required
  int count = 0;                        // kNodes: how many nodes
  bool angle = false;                   // a plain number that is an angle
  std::string_view doc;
};

struct KindSpec {
  std::string_view name;
  std::vector<std::string_view> ports;  // positional ports; empty if none
  std::vector<KeySpec> keys;
  std::string_view summary;
  // Keys of the form hN (N = 2..50) are accepted (supply voltage harmonics).
  bool harmonic_keys = false;
};

// Element kinds, in documentation order.
const std::vector<KindSpec>& ElementKinds();
// Statements other than elements that take key = value settings
// (simulate, steady); `param`, `probe` and `include` have their own forms.
const std::vector<KindSpec>& StudyStatements();

const KindSpec* FindElementKind(std::string_view name);
const KeySpec* FindKey(const KindSpec& kind, std::string_view key);

// "R, L, i0" for hints.
std::string KeyList(const KindSpec& kind);
std::string KindList();

}  // namespace lcc
