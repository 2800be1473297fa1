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
// A thyristor switches like a diode, except that it turns on only while its
// gate pulse is on or while it is still recovering: for tq after its
// current fell through the holding current Ih it blocks no forward voltage,
// and a forward voltage then re-fires it without a gate pulse (a
// commutation failure in inverter operation).
// A switch (natural = false) changes state only when commanded.
#pragma once

#include "models/device.h"

namespace lcc {

struct ValveParams {
  double r_on = 1e-3;   // ohm
  double r_off = 1e9;   // ohm
  double v_f = 0.0;     // V, forward drop while on
  double i_h = 0.0;     // A, holding current (thyristors)
  double t_q = 0.0;     // s, turn-off (recovery) time (thyristors)
  // Ratings, for the report's checks only (0: not given).
  double irms_max = 0.0, ipk_max = 0.0, i2t_max = 0.0, vrrm = 0.0;
};

// Which gate pulse train drives a thyristor: firing element `firing`
// (an index into Circuit::firings()), pulse `pulse` (1..6).
struct GateRef {
  int firing = -1;
  int pulse = 0;
};

class Valve final : public Device {
 public:
  enum class Type { kDiode, kThyristor, kSwitch };

  Valve(std::string name, SourceLoc loc, int anode, int cathode, Type type, ValveParams params,
        bool initially_on = false, GateRef gate = {})
      : Device(std::move(name), std::move(loc), {anode, cathode}),
        type_(type), p_(params), initially_on_(initially_on), gate_(gate) {}

  const char* kind_name() const override {
    return type_ == Type::kDiode ? "diode" : type_ == Type::kThyristor ? "thyristor" : "switch";
  }
  Type type() const { return type_; }
  const GateRef& gate() const { return gate_; }
  TopologyRole role() const override { return TopologyRole::kResistive; }
  int num_branches() const override { return 1; }
  bool has_switch_state() const override { return true; }
  bool natural() const override { return type_ != Type::kSwitch; }
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
  GateRef gate_;
};

}  // namespace lcc
