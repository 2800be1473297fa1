#include "engine/topology.h"

#include <fmt/format.h>

#include <algorithm>
#include <deque>
#include <map>
#include <numeric>

#include "models/resistor.h"

namespace lcc {
namespace {

class UnionFind {
 public:
  explicit UnionFind(int n) : parent_(n) { std::iota(parent_.begin(), parent_.end(), 0); }
  int Find(int x) {
    while (parent_[x] != x) x = parent_[x] = parent_[parent_[x]];
    return x;
  }
  bool Join(int a, int b) {
    a = Find(a);
    b = Find(b);
    if (a == b) return false;
    parent_[a] = b;
    return true;
  }

 private:
  std::vector<int> parent_;
};

std::string Describe(const Device& d) { return fmt::format("{} ({})", d.name(), d.loc().Where()); }

std::string DescribeList(const std::vector<const Device*>& devices) {
  std::string out;
  for (std::size_t i = 0; i < devices.size(); ++i) {
    if (i == 8) {
      out += fmt::format(", and {} more", devices.size() - 8);
      break;
    }
    out += (i ? ", " : "") + Describe(*devices[i]);
  }
  return out;
}

bool ConductsDc(TopologyRole r) {
  return r == TopologyRole::kResistive || r == TopologyRole::kInductive ||
         r == TopologyRole::kVoltageSource || r == TopologyRole::kWinding;
}

// Two-terminal devices are the edges of the node graph; cores have no nodes.
bool IsEdge(const Device& d) { return d.nodes().size() == 2; }

// The devices on the path between nodes a and b in a forest of edges.
std::vector<const Device*> PathInForest(int n, const std::vector<std::pair<int, const Device*>>* adj,
                                        int a, int b) {
  std::vector<const Device*> via(n, nullptr);
  std::vector<int> from(n, -1);
  std::deque<int> queue{a};
  from[a] = a;
  while (!queue.empty()) {
    int x = queue.front();
    queue.pop_front();
    if (x == b) break;
    for (const auto& [y, d] : adj[x]) {
      if (from[y] >= 0) continue;
      from[y] = x;
      via[y] = d;
      queue.push_back(y);
    }
  }
  std::vector<const Device*> path;
  for (int x = b; x != a && from[x] >= 0; x = from[x]) path.push_back(via[x]);
  return path;
}

}  // namespace

TopologyReport CheckTopology(Circuit& circuit, Diagnostics& diags, const TopologyOptions& options) {
  TopologyReport report;
  const int n = circuit.num_nodes();
  const auto& devices = circuit.devices();
  if (devices.empty()) return report;

  // 1. Something must be connected to gnd.
  bool grounded = false;
  for (const auto& d : devices)
    for (int node : d->nodes()) grounded |= node == 0;
  if (!grounded) {
    diags.Error(devices.front()->loc(), "nothing is connected to gnd",
                "connect the circuit's reference node to gnd (a supply's star point is on gnd "
                "unless its neutral is given)");
    report.ok = false;
    return report;
  }

  // 2. A node with a single terminal on it carries no current: most often a
  // misspelt node name, or an element whose other end was never connected.
  // Later checks may reference it to gnd (and it then simulates, with the
  // element open), so it is said here, where its name is still the user's.
  {
    std::vector<std::vector<const Device*>> terminals(n);
    for (const auto& d : devices)
      for (int node : d->nodes()) terminals[node].push_back(d.get());
    for (int node = 1; node < n; ++node)
      if (terminals[node].size() == 1)
        diags.Warning(circuit.node_loc(node),
                      fmt::format("node '{}' has a single connection, {}: no current can flow through it",
                                  circuit.node_name(node), DescribeList(terminals[node])),
                      "check the node name for a typing error, or connect the element's other end");
  }

  // 3. Every node needs a DC path to gnd.
  {
    UnionFind uf(n);
    for (const auto& d : devices)
      if (IsEdge(*d) && ConductsDc(d->role())) uf.Join(d->nodes()[0], d->nodes()[1]);
    std::map<int, std::vector<int>> floating;
    for (int node = 1; node < n; ++node)
      if (uf.Find(node) != uf.Find(0)) floating[uf.Find(node)].push_back(node);
    std::vector<std::unique_ptr<Device>> references;
    for (const auto& [root, nodes] : floating) {
      std::vector<const Device*> touching;
      std::string names;
      bool magnetic = false;
      for (int node : nodes) {
        names += (names.empty() ? "'" : ", '") + circuit.node_name(node) + "'";
        for (const auto& d : devices)
          if (std::count(d->nodes().begin(), d->nodes().end(), node) &&
              std::find(touching.begin(), touching.end(), d.get()) == touching.end()) {
            touching.push_back(d.get());
            magnetic |= d->magnetic() && ConductsDc(d->role());
          }
      }
      if (magnetic) {
        // Coupled to the rest only through a core (the valve side of a
        // rectifier transformer): reference it through a high resistance,
        // at a star point where it has one.
        int node = nodes.front();
        for (int candidate : nodes)
          if (circuit.is_star_point(candidate)) {
            node = candidate;
            break;
          }
        const std::string name = "reference." + circuit.node_name(node);
        references.push_back(std::make_unique<Resistor>(name, circuit.node_loc(node), node, 0,
                                                        options.reference_resistance));
        report.notes.push_back(fmt::format(
            "node{} {} {} coupled to the rest only magnetically; added {} ({:g} ohm to gnd) as {} reference",
            nodes.size() > 1 ? "s" : "", names, nodes.size() > 1 ? "are" : "is", name,
            options.reference_resistance, nodes.size() > 1 ? "their" : "its"));
        continue;
      }
      diags.Error(circuit.node_loc(nodes.front()),
                  fmt::format("node{} {} {} no DC path to gnd; {} connected only through {}",
                              nodes.size() > 1 ? "s" : "", names, nodes.size() > 1 ? "have" : "has",
                              nodes.size() > 1 ? "they are" : "it is", DescribeList(touching)),
                  "add a resistor to gnd, or check the node names for a typing error");
      report.ok = false;
    }
    for (auto& r : references) circuit.Add(std::move(r));
    if (!references.empty()) circuit.Finalize();
  }

  // 4. No loop of voltage sources and capacitors.
  {
    UnionFind uf(n);
    std::vector<std::vector<std::pair<int, const Device*>>> adj(n);
    for (const auto& d : devices) {
      const TopologyRole r = d->role();
      if (!IsEdge(*d) || (r != TopologyRole::kVoltageSource && r != TopologyRole::kCapacitive)) continue;
      const int a = d->nodes()[0], b = d->nodes()[1];
      if (!uf.Join(a, b)) {
        auto loop = PathInForest(n, adj.data(), a, b);
        std::reverse(loop.begin(), loop.end());
        loop.push_back(d.get());
        diags.Error(d->loc(),
                    fmt::format("voltage sources and capacitors form a loop: {}", DescribeList(loop)),
                    "add a series resistance or inductance to one of them");
        report.ok = false;
        continue;
      }
      adj[a].emplace_back(b, d.get());
      adj[b].emplace_back(a, d.get());
    }
  }

  // 5. Cut-sets of current sources and inductors.
  if (report.ok) {
    UnionFind uf(n);
    for (const auto& d : devices) {
      const TopologyRole r = d->role();
      if (IsEdge(*d) && r != TopologyRole::kInductive && r != TopologyRole::kCurrentSource)
        uf.Join(d->nodes()[0], d->nodes()[1]);
    }
    std::map<int, std::vector<int>> parts;
    for (int node = 1; node < n; ++node)
      if (uf.Find(node) != uf.Find(0)) parts[uf.Find(node)].push_back(node);
    std::vector<std::unique_ptr<Device>> references;
    for (const auto& [root, nodes] : parts) {
      std::vector<const Device*> cut;
      bool has_current_source = false;
      for (const auto& d : devices) {
        if (!IsEdge(*d)) continue;
        const int inside = (uf.Find(d->nodes()[0]) == root) + (uf.Find(d->nodes()[1]) == root);
        if (inside == 1) {
          cut.push_back(d.get());
          has_current_source |= d->role() == TopologyRole::kCurrentSource;
        }
      }
      if (has_current_source) {
        diags.Error(cut.front()->loc(),
                    fmt::format("current sources and inductors form a cut-set around node '{}': {}",
                                circuit.node_name(nodes.front()), DescribeList(cut)),
                    "the current into that part of the circuit is forced twice; add a resistor "
                    "across one of them");
        report.ok = false;
        continue;
      }
      // Inductors only: reference the part through a high resistance.
      const int node = nodes.front();
      const std::string name = "reference." + circuit.node_name(node);
      references.push_back(std::make_unique<Resistor>(name, circuit.node_loc(node), node, 0,
                                                      options.reference_resistance));
      report.notes.push_back(fmt::format(
          "node '{}' and {} other node{} connect to the rest only through inductors ({}); "
          "added {} ({:g} ohm to gnd) as their reference",
          circuit.node_name(node), nodes.size() - 1, nodes.size() == 2 ? "" : "s",
          DescribeList(cut), name, options.reference_resistance));
    }
    for (auto& r : references) circuit.Add(std::move(r));
    if (!references.empty()) circuit.Finalize();
  }
  return report;
}

}  // namespace lcc
