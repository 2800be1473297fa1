// Elaboration: from netlist text to a flat Circuit and a Study.
//
// Reads a file and its includes, lays out and parses every statement, and
// then, statement by statement, evaluates parameters (with units), checks
// every element's ports and settings against parser/kinds.h, expands
// composite kinds (supply, bridge) into primitive devices and compiles the
// probes. It collects every error it can find before giving up, each at the
// file, line and column it belongs to; nothing is simulated when any exists.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "models/circuit.h"
#include "models/study.h"
#include "parser/batch.h"
#include "parser/diagnostics.h"

namespace lcc {

struct Design {
  std::vector<std::shared_ptr<const SourceFile>> files;  // main file first
  Circuit circuit;
  Study study;
  Batch batch;   // the `case` and `sweep` statements
};

// Returns the design, or nullptr when `diags` holds errors. With
// `overrides`, the named parameters and element keys take those values
// instead of the ones written (a case's design).
std::unique_ptr<Design> ElaborateFile(const std::string& path, Diagnostics& diags,
                                      const Overrides* overrides = nullptr);

// The same for text in memory (`name` is used in messages; includes are
// resolved relative to the current directory).
std::unique_ptr<Design> ElaborateText(const std::string& name, std::string text,
                                      Diagnostics& diags, const Overrides* overrides = nullptr);

}  // namespace lcc
