// Commutations of a six-pulse bridge, from the engine's switching events.
//
// In a bridge the valve that turns on at a commutation takes over the
// current of the valve two places before it in conduction order, on the same
// DC rail (3 from 1, 4 from 2, ..., 1 from 5). The overlap angle is
//     μ = ω·(t_off(outgoing) − t_on(incoming)),
// exact here because both instants are located roots, not sampled edges.
#pragma once

#include <string>
#include <vector>

#include "engine/simulator.h"
#include "models/circuit.h"

namespace lcc {

struct Commutation {
  int incoming = 0;       // valve number 1..6
  int outgoing = 0;       // valve number 1..6
  double t_on = 0.0;      // s, incoming valve turns on
  double t_off = 0.0;     // s, outgoing valve turns off
  double overlap = 0.0;   // rad
};

// Commutations of `group` whose incoming valve turned on in [begin, end).
std::vector<Commutation> BridgeCommutations(const ValveGroup& group, const std::vector<SwitchEvent>& events,
                                            double frequency, double begin, double end);

}  // namespace lcc
