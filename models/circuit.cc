#include "models/circuit.h"

namespace lcc {

Circuit::Circuit() {
  node_names_.push_back("gnd");
  node_locs_.push_back({});
  node_index_["gnd"] = 0;
}

int Circuit::Node(const std::string& name, const SourceLoc& where) {
  auto it = node_index_.find(name);
  if (it != node_index_.end()) {
    if (!node_locs_[it->second].valid()) node_locs_[it->second] = where;
    return it->second;
  }
  const int index = static_cast<int>(node_names_.size());
  node_names_.push_back(name);
  node_locs_.push_back(where);
  node_index_[name] = index;
  return index;
}

int Circuit::FindNode(const std::string& name) const {
  auto it = node_index_.find(name);
  return it == node_index_.end() ? -1 : it->second;
}

Device& Circuit::Add(std::unique_ptr<Device> device) {
  device_index_[device->name()] = device.get();
  devices_.push_back(std::move(device));
  return *devices_.back();
}

const Device* Circuit::FindDevice(const std::string& name) const {
  auto it = device_index_.find(name);
  return it == device_index_.end() ? nullptr : it->second;
}

const DeviceAlias* Circuit::FindAlias(const std::string& name) const {
  auto it = aliases_.find(name);
  return it == aliases_.end() ? nullptr : &it->second;
}

void Circuit::Finalize() {
  int next = num_nodes() - 1;
  int slot = 0;
  for (auto& d : devices_) {
    d->set_first_branch(next);
    next += d->num_branches();
    if (d->has_switch_state()) d->set_switch_slot(slot++);
  }
  num_unknowns_ = next;
  num_switch_slots_ = slot;
}

std::string Circuit::UnknownName(int k) const {
  if (k < num_nodes() - 1) return "v(" + node_names_[k + 1] + ")";
  for (const auto& d : devices_) {
    if (d->num_branches() > 0 && k >= d->branch(0) && k < d->branch(0) + d->num_branches()) {
      if (d->role() == TopologyRole::kMagnetic)
        return (k == d->branch(0) ? "e(" : "i_m(") + d->name() + ")";
      return std::string(d->role() == TopologyRole::kCapacitive ? "v(" : "i(") + d->name() + ")";
    }
  }
  return "?";
}

}  // namespace lcc
