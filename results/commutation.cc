#include "results/commutation.h"

#include <numbers>

namespace lcc {

std::vector<Commutation> BridgeCommutations(const ValveGroup& group, const std::vector<SwitchEvent>& events,
                                            double frequency, double begin, double end) {
  std::vector<Commutation> out;
  if (group.devices.size() != 6) return out;
  auto number_of = [&](int device) {
    for (int k = 0; k < 6; ++k)
      if (group.devices[k] == device) return k + 1;
    return 0;
  };
  const double omega = 2.0 * std::numbers::pi * frequency;
  for (std::size_t e = 0; e < events.size(); ++e) {
    const SwitchEvent& on = events[e];
    const int incoming = number_of(on.device);
    if (!on.on || incoming == 0 || on.t < begin || on.t >= end) continue;
    const int outgoing = (incoming + 3) % 6 + 1;  // two places before, on the same rail
    for (std::size_t f = e + 1; f < events.size(); ++f) {
      const SwitchEvent& off = events[f];
      if (!off.on && number_of(off.device) == outgoing) {
        out.push_back({incoming, outgoing, on.t, off.t, omega * (off.t - on.t)});
        break;
      }
      if (off.on && off.device == on.device) break;  // no turn-off before the next turn-on
    }
  }
  return out;
}

}  // namespace lcc
