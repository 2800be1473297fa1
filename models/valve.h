// Valves and switches: two-value resistors.
//
// Between anode a and cathode k, with branch unknown i (from a to k):
//   KCL rows a, k:  ± i                                   [A]
//   branch row:     v_a − v_k − R(s)·i − Vf(s) = 0        [V]
// where R(on) = Ron, R(off) = Roff, Vf(on) = Vf and Vf(off) = 0. Only values
// change with the state, never positions. Keeping i as an unknown (rather
// than (v_a − v_k)/Ron) lets the solver control its error directly, which is
// what the turn-off root function watches.
//
// A diode (natural = true) switches by itself:
//   on  → off when i falls through 0;
//   off → on  when v_a − v_k rises through Vf.
// The engine locates both as roots, with a backstop root offset by a small
// hysteresis ε (see engine/simulator.h).
// A switch (natural = false) changes state only when commanded.
#pragma once

#include "models/device.h"

namespace lcc {

struct ValveParams {
  double r_on = 1e-3;   // ohm
  double r_off = 1e9;   // ohm
  double v_f = 0.0;     // V, forward drop while on
};

class Valve final : public Device {
 public:
  enum class Type { kDiode, kSwitch };

  Valve(std::string name, SourceLoc loc, int anode, int cathode, Type type, ValveParams params,
        bool initially_on = false)
      : Device(std::move(name), std::move(loc), {anode, cathode}),
        type_(type), p_(params), initially_on_(initially_on) {}

  const char* kind_name() const override { return type_ == Type::kDiode ? "diode" : "switch"; }
  TopologyRole role() const override { return TopologyRole::kResistive; }
  int num_branches() const override { return 1; }
  bool has_switch_state() const override { return true; }
  bool natural() const override { return type_ == Type::kDiode; }
  bool initially_on() const override { return initially_on_; }
  const ValveParams& params() const { return p_; }

  void Stamp(StampSink& sink, bool on) const override;
  // Only a forward drop adds to b(t); valves with Vf = 0 are skipped in
  // every residual.
  bool has_sources() const override { return p_.v_f != 0.0; }
  void AddSources(double t, bool on, double* b) const override;
  void SourceRows(std::vector<int>* rows) const override { rows->push_back(branch()); }
  bool Signal(std::string_view what, LinearForm* form, Dim* dim) const override;
  double resistance_scale() const override { return 0.0; }

  // Current (a to k) and voltage (v_a − v_k) from the unknowns.
  double Current(const double* y) const { return y[branch()]; }
  double Voltage(const double* y) const {
    const int a = NodeUnknown(nodes()[0]), k = NodeUnknown(nodes()[1]);
    return (a >= 0 ? y[a] : 0.0) - (k >= 0 ? y[k] : 0.0);
  }

 private:
  Type type_;
  ValveParams p_;
  bool initially_on_;
};

}  // namespace lcc
