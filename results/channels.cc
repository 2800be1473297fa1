#include "results/channels.h"

#include <fmt/format.h>

#include <stdexcept>

namespace lcc {
namespace {

class Builder {
 public:
  explicit Builder(const Circuit& c) : c_(c) {}

  int Add(std::string name, std::string unit, LinearForm form) {
    out_.channels.push_back({std::move(name), std::move(unit), std::move(form)});
    return static_cast<int>(out_.channels.size()) - 1;
  }
  int DeviceSignal(int device, const char* what, const std::string& name) {
    LinearForm form;
    Dim dim;
    if (!c_.devices()[device]->Signal(what, &form, &dim))
      throw std::logic_error(fmt::format("{} has no .{} signal", c_.devices()[device]->name(), what));
    return Add(name, dim == dims::kCurrent ? "A" : "V", std::move(form));
  }
  // Line currents of three terminals from an alias (`T.A`) with a sign.
  int AliasCurrent(const std::string& alias, const std::string& name, double sign) {
    const DeviceAlias* a = c_.FindAlias(alias);
    if (!a) throw std::logic_error("no alias " + alias);
    LinearForm form;
    for (const auto& [dev, s] : a->terms) {
      LinearForm part;
      Dim dim;
      dev->Signal("i", &part, &dim);
      for (const auto& [k, v] : part.y) form.AddY(k, sign * s * v);
    }
    return Add(name, "A", std::move(form));
  }
  void PhaseVoltages(const int* terminals, const std::string& prefix, int* v) {
    const char* ph[3] = {"a", "b", "c"};
    for (int k = 0; k < 3; ++k) {
      LinearForm form;
      for (int m = 0; m < 3; ++m) form.AddY(NodeUnknown(terminals[m]), (m == k ? 1.0 : 0.0) - 1.0 / 3.0);
      v[k] = Add(fmt::format("{} v{}", prefix, ph[k]), "V", std::move(form));
    }
  }

  AnalysisChannels Build() {
    const auto& groups = c_.valve_groups();
    for (std::size_t g = 0; g < groups.size(); ++g) {
      const ValveGroup& vg = groups[g];
      BridgeChannels b;
      b.group = static_cast<int>(g);
      LinearForm vd;
      vd.AddY(NodeUnknown(vg.dc[0]), 1.0);
      vd.AddY(NodeUnknown(vg.dc[1]), -1.0);
      b.vd = Add(vg.name + " Vd", "V", std::move(vd));
      for (int k = 0; k < 6; ++k) {
        const int dev = vg.devices[k];
        b.valve_i[k] = DeviceSignal(dev, "i", c_.devices()[dev]->name() + " i");
        b.valve_v[k] = DeviceSignal(dev, "v", c_.devices()[dev]->name() + " v");
      }
      // The DC current leaves through the upper valves 1, 3, 5 (cathodes on p).
      LinearForm id;
      for (int k : {0, 2, 4})
        for (const auto& [idx, a] : out_.channels[b.valve_i[k]].form.y) id.AddY(idx, a);
      b.id = Add(vg.name + " Id", "A", std::move(id));
      out_.bridges.push_back(b);
    }
    const char* ph[3] = {"a", "b", "c"};
    const auto& supplies = c_.supplies();
    for (std::size_t s = 0; s < supplies.size(); ++s) {
      AcPointChannels p;
      p.name = supplies[s].name;
      p.kind = AcPointChannels::Kind::kSupply;
      p.owner = static_cast<int>(s);
      PhaseVoltages(supplies[s].terminals, p.name, p.v);
      for (int k = 0; k < 3; ++k)
        p.i[k] = DeviceSignal(supplies[s].devices[k], "i", fmt::format("{} i{}", p.name, ph[k]));
      out_.ac_points.push_back(std::move(p));
    }
    const auto& transformers = c_.transformers();
    const char* hv_port[3] = {"A", "B", "C"};
    for (std::size_t t = 0; t < transformers.size(); ++t) {
      const TransformerGroup& tg = transformers[t];
      for (int side = 0; side < 2; ++side) {
        AcPointChannels p;
        p.name = tg.name + (side == 0 ? " HV" : " LV");
        p.kind = side == 0 ? AcPointChannels::Kind::kTransformerHv : AcPointChannels::Kind::kTransformerLv;
        p.owner = static_cast<int>(t);
        const int* terms = side == 0 ? tg.hv : tg.lv;
        PhaseVoltages(terms, p.name, p.v);
        for (int k = 0; k < 3; ++k)
          p.i[k] = AliasCurrent(fmt::format("{}.{}", tg.name, side == 0 ? hv_port[k] : ph[k]),
                                fmt::format("{} i{}", p.name, ph[k]), side == 0 ? 1.0 : -1.0);
        for (int dev : side == 0 ? tg.hv_windings : tg.lv_windings) {
          p.winding_v.push_back(DeviceSignal(dev, "v", c_.devices()[dev]->name() + " v"));
          p.winding_i.push_back(DeviceSignal(dev, "i", c_.devices()[dev]->name() + " i"));
        }
        if (side == 1)
          for (std::size_t g = 0; g < groups.size(); ++g) {
            bool same = true;
            for (int k = 0; k < 3; ++k) same &= groups[g].ac[k] == terms[k];
            if (same) p.bridge = static_cast<int>(g);
          }
        out_.ac_points.push_back(std::move(p));
      }
    }
    return std::move(out_);
  }

 private:
  const Circuit& c_;
  AnalysisChannels out_;
};

}  // namespace

AnalysisChannels BuildAnalysisChannels(const Circuit& circuit) { return Builder(circuit).Build(); }

}  // namespace lcc
