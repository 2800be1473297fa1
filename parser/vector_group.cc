#include "parser/vector_group.h"

#include <regex>
#include <vector>

namespace lcc {
namespace {

// Phase angle (degrees) of the HV winding EMF relative to its phase voltage.
int HvAngle(const WindingArrangement& w) { return w.delta ? (w.step == 1 ? 30 : -30) : 0; }

// Phase angle of the LV phase voltage relative to its winding EMF.
int LvAngle(const WindingArrangement& w) {
  const int base = w.delta ? (w.step == 1 ? -30 : 30) : 0;
  return base + (w.reversed ? 180 : 0);
}

}  // namespace

std::optional<VectorGroup> ParseVectorGroup(const std::string& name) {
  static const std::regex kForm("(YN|Y|D)(yn|y|d)(0|1|2|3|4|5|6|7|8|9|10|11)");
  std::smatch m;
  if (!std::regex_match(name, m, kForm)) return std::nullopt;
  VectorGroup g;
  g.name = name;
  g.clock = std::stoi(m[3]);
  const bool hv_delta = m[1] == "D", lv_delta = m[2] == "d";
  // HV: star, or a delta leading its phase voltage (the usual construction),
  // then the lagging delta; LV: every arrangement, in a fixed order.
  const std::vector<int> hv_steps = hv_delta ? std::vector<int>{1, -1} : std::vector<int>{0};
  const std::vector<int> lv_steps = lv_delta ? std::vector<int>{1, -1} : std::vector<int>{0};
  for (int hv_step : hv_steps) {
    for (int lv_step : lv_steps) {
      for (bool reversed : {false, true}) {
        WindingArrangement hv{hv_delta, hv_step, false, m[1] == "YN"};
        WindingArrangement lv{lv_delta, lv_step, reversed, m[2] == "yn"};
        const int lag = ((-(HvAngle(hv) + LvAngle(lv))) % 360 + 360) % 360;
        if (lag == g.clock * 30) {
          g.hv = hv;
          g.lv = lv;
          return g;
        }
      }
    }
  }
  return std::nullopt;
}

const char* KnownVectorGroups() {
  return "Yy0, Yy6, Yd1, Yd5, Yd7, Yd11, Dy1, Dy5, Dy7, Dy11, Dd0, Dd2, Dd4, Dd6, Dd8, Dd10, with N "
         "or n for a brought-out neutral (e.g. YNd11, Dyn11)";
}

}  // namespace lcc
