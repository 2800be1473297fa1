#include "results/events.h"

#include <fmt/format.h>

#include <algorithm>
#include <limits>
#include <map>
#include <numbers>

#include "results/atomic_file.h"
#include "results/commutation.h"

namespace lcc {
namespace {

const char* CauseWord(SwitchEvent::Cause c) {
  switch (c) {
    case SwitchEvent::Cause::kNatural: return "natural";
    case SwitchEvent::Cause::kGate: return "gate";
    case SwitchEvent::Cause::kTurnOff: return "turn_off";
    case SwitchEvent::Cause::kRecoveryFailure: return "recovery";
    case SwitchEvent::Cause::kAction: return "action";
  }
  return "natural";
}

}  // namespace

std::vector<EventRow> EventLog(const Circuit& circuit, const RunResult& run, double frequency) {
  const double deg_per_s = 360.0 * frequency;
  // Overlap of each commutation, keyed by (outgoing device, t_off).
  std::map<std::pair<int, double>, double> overlap;
  if (frequency > 0) {
    for (const auto& group : circuit.valve_groups()) {
      for (const auto& c : BridgeCommutations(group, run.events, frequency, 0.0,
                                              std::numeric_limits<double>::infinity()))
        overlap[{group.devices[c.outgoing - 1], c.t_off}] = c.overlap * 180.0 / std::numbers::pi;
    }
  }
  std::vector<EventRow> rows;
  std::map<int, double> last_off;
  for (const auto& e : run.events) {
    EventRow r;
    r.t = e.t;
    r.valve = circuit.devices()[e.device]->name();
    r.cause = CauseWord(e.cause);
    if (e.on && e.cause == SwitchEvent::Cause::kRecoveryFailure) {
      r.event = "commutation_failure";
      if (frequency > 0 && last_off.count(e.device)) r.extinction_deg = (e.t - last_off[e.device]) * deg_per_s;
    } else {
      r.event = e.on ? "on" : "off";
    }
    if (!e.on) {
      last_off[e.device] = e.t;
      auto it = overlap.find({e.device, e.t});
      if (it != overlap.end()) r.overlap_deg = it->second;
    }
    rows.push_back(r);
  }
  for (const auto& f : run.forward_voltage) {
    EventRow r;
    r.t = f.t;
    r.valve = circuit.devices()[f.device]->name();
    r.event = "forward_voltage";
    r.cause = "natural";
    if (frequency > 0) r.extinction_deg = (f.t - f.t_off) * deg_per_s;
    rows.push_back(r);
  }
  std::stable_sort(rows.begin(), rows.end(), [](const EventRow& a, const EventRow& b) { return a.t < b.t; });
  return rows;
}

void WriteEventsCsv(const std::string& path, const std::vector<EventRow>& rows) {
  AtomicFile file(path);
  std::ostream& out = file.stream();
  out << "time [s],valve,event,cause,overlap [deg],extinction [deg]\n";
  for (const auto& r : rows) {
    out << fmt::format("{:.12g},{},{},{},{},{}\n", r.t, r.valve, r.event, r.cause,
                       r.overlap_deg >= 0 ? fmt::format("{:.6f}", r.overlap_deg) : "",
                       r.extinction_deg >= 0 ? fmt::format("{:.6f}", r.extinction_deg) : "");
  }
  file.Commit();
}

}  // namespace lcc
