// The signals the reports analyse, built from the circuit itself: for every
// bridge its DC voltage and current and each valve's current and voltage;
// for every supply and each side of every transformer its three phase
// voltages and line currents; and each transformer winding's voltage and
// current. Users need not probe any of them.
//
// Phase voltages are taken to the mean of the three terminal voltages (a
// virtual star point), which gives the right powers on three-wire systems
// whatever is earthed where. Line currents are counted in the direction of
// rectifier power flow: out of a supply, into a transformer's HV side, out
// of its LV side.
#pragma once

#include <string>
#include <vector>

#include "models/circuit.h"

namespace lcc {

struct Channel {
  std::string name;
  std::string unit;  // "V" or "A"
  LinearForm form;
};

struct BridgeChannels {
  int group = -1;  // index into Circuit::valve_groups()
  int vd = -1, id = -1;
  int valve_i[6] = {-1, -1, -1, -1, -1, -1};
  int valve_v[6] = {-1, -1, -1, -1, -1, -1};
};

struct AcPointChannels {
  enum class Kind { kSupply, kTransformerHv, kTransformerLv };
  std::string name;      // "Grid", "T1 HV", "T1 LV"
  Kind kind = Kind::kSupply;
  int owner = -1;        // index into supplies() or transformers()
  int v[3] = {-1, -1, -1}, i[3] = {-1, -1, -1};
  std::vector<int> winding_v, winding_i;  // transformer sides: each winding
  int bridge = -1;       // LV side: the bridge (index into bridges) its terminals feed, if any
};

struct AnalysisChannels {
  std::vector<Channel> channels;
  std::vector<BridgeChannels> bridges;
  std::vector<AcPointChannels> ac_points;
};

AnalysisChannels BuildAnalysisChannels(const Circuit& circuit);

}  // namespace lcc
