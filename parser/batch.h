// Batch studies: the `case` and `sweep` statements, and their expansion into
// the cases a run simulates (cases × sweep points, first sweep outermost).
//
// Values are evaluated when the statements are elaborated, with the file's
// parameters as written (a swept parameter does not change the value of a
// case's `set` expression). A case's `set` lines without `at` and the sweep
// values become overrides: the case's design is elaborated again with those
// keys (or parameters) replaced. Timed actions stay actions: the engine
// applies them at their instants (engine/actions.h).
#pragma once

#include <map>
#include <string>
#include <vector>

#include "parser/diagnostics.h"
#include "parser/units.h"

namespace lcc {

struct TimedActionSpec {
  enum class Verb { kSet, kClose, kOpen, kShort, kMisfire };
  double t = 0.0;           // s
  Verb verb = Verb::kSet;
  std::string target;       // "Grid.Vll", "Sdc", "B1[5]", "F1[3]"
  Quantity value;           // kSet
  int pulses = 1;           // kMisfire: how many pulses are lost
  SourceLoc loc;
};

struct CaseDecl {
  std::string name;
  SourceLoc loc;
  std::map<std::string, Quantity> start;   // `set` without `at`: target → value
  std::vector<TimedActionSpec> timed;      // in time order
};

struct SweepDecl {
  std::string target;       // "F1.alpha" or a parameter name
  SourceLoc loc;
  std::vector<Quantity> values;
  std::vector<std::string> labels;  // each value as written (list) or in the unit of the start (range)
  bool angle = false;       // labels in degrees (when none were written)
};

struct Batch {
  std::vector<CaseDecl> cases;   // none: one case, `base`
  std::vector<SweepDecl> sweeps;
};

// Replacement values of parameters (by name) and element keys (`E.key`), SI.
using Overrides = std::map<std::string, double>;

struct CaseInstance {
  int index = 0;            // position in the batch
  std::string name;         // case name and sweep values, readable
  std::string folder;       // the same, safe as a folder name
  Overrides start;          // at t = 0
  std::vector<TimedActionSpec> timed;
};

std::vector<CaseInstance> ExpandCases(const Batch& batch);

}  // namespace lcc
