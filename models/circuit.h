// The flat circuit: named nodes and primitive devices, ready for the engine.
//
// Composite elements (supply, bridge) have already been expanded into
// primitives by elaboration; `aliases` keeps the names users probe through
// (`Grid.a` is the device that carries the current out of port a).
// Finalize() numbers the unknowns: node voltages first (ground removed),
// then the branch unknowns of each device in order; and the switch slots.
#pragma once

#include <map>
#include <memory>
#include <set>
#include <string>
#include <vector>

#include "models/device.h"

namespace lcc {

// A current users probe by a name of its own (`Grid.a.i`, `T.A.i`): a sum
// of device currents, each with its sign (a delta winding's line current is
// the difference of two winding currents).
struct DeviceAlias {
  std::vector<std::pair<const Device*, double>> terms;
};

// The valves of one composite converter (a bridge), in conduction order.
struct ValveGroup {
  std::string name;
  std::vector<int> devices;  // indices into devices()
  SourceLoc loc;
  int ac[3] = {-1, -1, -1};  // AC terminal nodes (a, b, c)
  int dc[2] = {-1, -1};      // DC terminal nodes (p, n)
  int firing = -1;           // index into firings(); -1 for diodes
};

// A three-phase supply as written: what the reports need to know of it
// (its phases are SourceBranch devices).
struct SupplyGroup {
  std::string name;
  SourceLoc loc;
  int terminals[3] = {-1, -1, -1};
  int star = 0;              // node of the EMFs' star point (gnd unless given)
  int devices[3] = {-1, -1, -1};
  double vll = 0.0;          // V, rated line-to-line rms
  double frequency = 0.0;    // Hz
  double ssc = 0.0;          // VA, short-circuit power at the terminals (from Ssc or R, L)
};

// A transformer from its nameplate: ratings and the windings it became.
struct TransformerGroup {
  std::string name;
  SourceLoc loc;
  std::string vector_group;
  double s_rated = 0.0, v1 = 0.0, v2 = 0.0, z = 0.0;
  int hv[3] = {-1, -1, -1}, lv[3] = {-1, -1, -1};  // terminal nodes
  std::vector<int> hv_windings, lv_windings;      // device indices
};

// A firing element: six gate pulse trains, pulse k starting alpha after
// the natural commutation instant of valve k of the bridge it drives (or,
// driving no bridge, of an ideal bridge on the sync supply's EMF), each
// `width` long. Angles in radians.
struct Firing {
  std::string name;
  SourceLoc loc;
  double alpha = 0.0;
  double width = 0.0;
  std::string sync;       // the supply whose EMF is the ideal reference
  int supply_phase_device = -1;  // that supply's phase-a branch (a device index)
  int group = -1;         // the bridge (valve group) it drives, -1 if none

  // Current regulation (a DC drive's or an HVDC rectifier's current loop):
  // at every gate pulse start the probe is sampled and
  //   alpha = alpha₀ − kp·e − ki·∫e dt,   e = target − probe,
  // limited to [alpha_min, alpha_max], the integral held while limited.
  std::string regulate;   // probe name; empty: constant alpha
  int regulate_probe = -1;  // index into Study::probes once resolved
  double target = 0.0;    // A
  double kp = 0.0;        // rad/A
  double ki = 0.0;        // rad/(A·s)
  double alpha_min = 0.0;
  double alpha_max = 3.141592653589793;

  // Extinction-angle control (an inverter's γ_min control): after each
  // valve's extinction interval γ is measured, alpha moves by half the
  // error γ − gamma (at most 2° a step), so that the inverter runs with the
  // least advance that still leaves `gamma` for the valves to recover.
  double gamma = 0.0;     // rad; 0: off

  // Measured synchronisation: a synchronous-reference-frame phase-locked
  // loop (Kaura & Blasko, IEEE TIA 33(1), 1997) on the voltages of these
  // three nodes to gnd, instead of the ideal EMF. -1: ideal.
  int pll_nodes[3] = {-1, -1, -1};
  double pll_frequency = 0.0;  // Hz, the loop's centre frequency
  double pll_bandwidth = 0.0;  // rad/s, the loop's natural frequency ω_n
  bool measured_sync() const { return pll_nodes[0] >= 0; }
};

class Circuit {
 public:
  Circuit();

  // The index of a node, created on first use. "gnd" is node 0.
  int Node(const std::string& name, const SourceLoc& where);
  int FindNode(const std::string& name) const;  // −1 if unknown
  const std::string& node_name(int node) const { return node_names_[node]; }
  const SourceLoc& node_loc(int node) const { return node_locs_[node]; }
  int num_nodes() const { return static_cast<int>(node_names_.size()); }
  // Star points (of supplies and transformer windings) are preferred where
  // the topology checks add a reference to gnd.
  void MarkStarPoint(int node) { star_points_.insert(node); }
  bool is_star_point(int node) const { return star_points_.count(node) > 0; }

  Device& Add(std::unique_ptr<Device> device);
  const std::vector<std::unique_ptr<Device>>& devices() const { return devices_; }
  const Device* FindDevice(const std::string& name) const;

  void AddAlias(const std::string& name, DeviceAlias alias) { aliases_[name] = std::move(alias); }
  void AddValveGroup(ValveGroup group) { valve_groups_.push_back(std::move(group)); }
  const std::vector<ValveGroup>& valve_groups() const { return valve_groups_; }
  void AddSupply(SupplyGroup s) { supplies_.push_back(std::move(s)); }
  const std::vector<SupplyGroup>& supplies() const { return supplies_; }
  void AddTransformer(TransformerGroup t) { transformers_.push_back(std::move(t)); }
  const std::vector<TransformerGroup>& transformers() const { return transformers_; }
  int AddFiring(Firing f) {
    firings_.push_back(std::move(f));
    return static_cast<int>(firings_.size()) - 1;
  }
  std::vector<Firing>& firings() { return firings_; }
  const std::vector<Firing>& firings() const { return firings_; }
  const DeviceAlias* FindAlias(const std::string& name) const;

  // Numbers unknowns and switch slots. Call once, after the last Add().
  void Finalize();
  int num_unknowns() const { return num_unknowns_; }
  int num_switch_slots() const { return num_switch_slots_; }
  // A readable name of unknown k: "v(p)" or "i(Ld)".
  std::string UnknownName(int k) const;

 private:
  std::vector<std::string> node_names_;
  std::vector<SourceLoc> node_locs_;
  std::map<std::string, int> node_index_;
  std::vector<std::unique_ptr<Device>> devices_;
  std::map<std::string, const Device*> device_index_;
  std::map<std::string, DeviceAlias> aliases_;
  std::vector<ValveGroup> valve_groups_;
  std::vector<Firing> firings_;
  std::vector<SupplyGroup> supplies_;
  std::vector<TransformerGroup> transformers_;
  std::set<int> star_points_;
  int num_unknowns_ = 0;
  int num_switch_slots_ = 0;
};

}  // namespace lcc
