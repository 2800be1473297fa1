// The event log of a run, OUT/CASE/events.csv: one row per valve event, in
// time order:
//   time [s]      when
//   valve         which valve
//   event         on | off | forward_voltage | commutation_failure
//   cause         natural (a diode's own root or settling), gate, turn_off,
//                 recovery (re-fired within tq)
//   overlap [deg] on an `off` row ending a commutation in a bridge: the
//                 overlap angle μ = ω·(t_off − t_on of the incoming valve)
//   extinction [deg]  on forward_voltage and commutation_failure rows: the
//                 extinction angle γ = ω·(t − t_off), the time the valve
//                 had to recover
#pragma once

#include <string>
#include <vector>

#include "engine/simulator.h"
#include "models/circuit.h"

namespace lcc {

struct EventRow {
  double t = 0.0;
  std::string valve;
  std::string event;
  std::string cause;
  double overlap_deg = -1.0;     // < 0: not applicable
  double extinction_deg = -1.0;  // < 0: not applicable
};

// The rows of the log; `frequency` (Hz) converts times to angles (0: none).
std::vector<EventRow> EventLog(const Circuit& circuit, const RunResult& run, double frequency);

void WriteEventsCsv(const std::string& path, const std::vector<EventRow>& rows);

}  // namespace lcc
