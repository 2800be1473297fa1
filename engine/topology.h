// Topology checks, run on every circuit before any simulation.
//
// Errors (each names the elements and the lines they come from):
//   * nothing is connected to gnd;
//   * a node has no DC path to gnd (it hangs on capacitors or current
//     sources only), which leaves its voltage undefined;
//   * voltage sources and capacitors form a loop, which over-determines a
//     voltage (an index-2 DAE);
//   * current sources (with or without inductors) form a cut-set, which
//     over-determines a current.
// Warned about (the circuit still runs): a node with a single terminal on
// it, most often a misspelt node name.
// A cut-set of inductors alone is normal in converter circuits: a bridge fed
// through the supply's inductance, with its DC side unearthed, is joined to
// the grounded part only through inductors. Its common-mode voltage is then
// fixed only through a derivative (index 2), so the check adds a reference
// resistor (`reference_resistance`, default 1 MΩ) from one node of that part
// to gnd and says so. A user's own earthing makes it unnecessary.
#pragma once

#include <string>
#include <vector>

#include "models/circuit.h"
#include "parser/diagnostics.h"

namespace lcc {

struct TopologyOptions {
  double reference_resistance = 1e6;  // ohm, for automatic references
};

struct TopologyReport {
  bool ok = true;
  std::vector<std::string> notes;  // what was added, in words
};

// Checks `circuit`; may add reference resistors (and re-finalises it).
TopologyReport CheckTopology(Circuit& circuit, Diagnostics& diags,
                             const TopologyOptions& options = {});

}  // namespace lcc
