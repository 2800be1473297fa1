// IEC 60076-1 vector groups: what a group name such as `Dyn11` means for
// the connection of a three-phase transformer built from three single-phase
// cores.
//
// The clock number h says the LV phasor lags the HV phasor by h·30°. With
// positive-sequence phase voltages V_k = V∠(−120°·k):
//   HV star,  winding k from terminal k to the star point:  E_k ∝ V_k
//   HV delta, winding k from terminal k to terminal k+1:    E_k ∝ V_k∠+30°
//   HV delta, winding k from terminal k to terminal k−1:    E_k ∝ V_k∠−30°
//   LV star,  dotted end at terminal k:                      U_k ∝ E_k
//   LV delta, winding k from terminal k to terminal k+1:    U_k ∝ E_k∠−30°
//   LV delta, winding k from terminal k to terminal k−1:    U_k ∝ E_k∠+30°
// and reversing a winding (dot at the other end) adds 180°. ParseVectorGroup
// finds, for a group name, the connection whose angles add up to −h·30°.
#pragma once

#include <optional>
#include <string>

namespace lcc {

struct WindingArrangement {
  bool delta = false;
  int step = 0;           // delta: the winding of phase k ends at terminal k + step (±1)
  bool reversed = false;  // the dotted end is at the star point / terminal k + step
  bool neutral = false;   // `N`/`n`: the star point is brought out
};

struct VectorGroup {
  std::string name;
  WindingArrangement hv, lv;
  int clock = 0;          // LV lags HV by clock × 30°
};

// Nothing if `name` is not a group of the form (Y|YN|D)(y|yn|d)(0..11) that
// three single-phase cores can realise.
std::optional<VectorGroup> ParseVectorGroup(const std::string& name);

// The groups offered in messages.
const char* KnownVectorGroups();

}  // namespace lcc
