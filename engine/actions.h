// Actions at an instant of a run: what a case's `at TIME ...` lines become
// once their targets are resolved to devices and firing elements.
//
//   kSwitch      a switch closes or opens (and stays so)
//   kValveOpen   a valve fails open: blocks from then on, whatever its gate
//                or its voltage
//   kValveShort  a valve fails short: conducts from then on in both
//                directions (its Ron)
//   kMisfire     the next `pulses` gate pulses of one pulse train of a
//                firing element starting at or after the instant are lost
//   kRebind      parameter values change: the circuit from then on is
//                `circuit` (same structure, other values) with its study's
//                probes (a resistor's current depends on its R)
//
// Actions at one instant are applied together, in the order given, and the
// circuit is then settled as after a switching event.
#pragma once

#include <string>
#include <vector>

#include "models/circuit.h"
#include "models/study.h"

namespace lcc {

struct EngineAction {
  enum class Kind { kSwitch, kValveOpen, kValveShort, kMisfire, kRebind };
  double t = 0.0;
  Kind kind = Kind::kSwitch;
  int device = -1;            // kSwitch, kValveOpen, kValveShort: index into Circuit::devices()
  bool closed = false;        // kSwitch
  int firing = -1;            // kMisfire: index into Circuit::firings()
  int pulse = 0;              // kMisfire: 1..6
  int pulses = 1;             // kMisfire
  const Circuit* circuit = nullptr;  // kRebind
  const Study* study = nullptr;      // kRebind
  std::string text;           // as written, for messages and the event log
};

}  // namespace lcc
