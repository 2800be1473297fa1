// The device interface: what every element of the flat circuit tells the
// engine.
//
// The engine solves the modified-nodal-analysis DAE
//     F(t, y, y') = C·y' + G(s)·y − b(t, s) = 0
// where y holds the node voltages (ground removed) followed by the branch
// unknowns the devices declare, and s is the vector of switch states.
// A device is immutable after elaboration. It
//   * declares how many branch unknowns it needs (num_branches) and which of
//     them are differential states (an inductor current, a capacitor voltage);
//   * stamps its entries of G and C for a given switch state. It must stamp
//     the same (row, column) positions in the same order whatever the state,
//     so the sparsity pattern, and the LU's symbolic analysis, never change;
//   * adds its source terms to b(t);
//   * describes its probe-able quantities (`.i`, `.v`) as linear forms in y
//     and y'.
// Switching devices (valves, switches) also say whether they switch on their
// own (diodes, through root functions) or only by command.
#pragma once

#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "parser/source.h"
#include "parser/units.h"

namespace lcc {

// Node 0 is ground; node k > 0 is unknown k − 1.
inline int NodeUnknown(int node) { return node - 1; }

// Collects G and C entries. Rows or columns of ground (−1) are dropped.
class StampSink {
 public:
  virtual ~StampSink() = default;
  virtual void G(int row, int col, double value) = 0;
  virtual void C(int row, int col, double value) = 0;
};

// A quantity that is linear in the unknowns and their derivatives:
//   value = Σ a_k·y[k] + Σ c_k·y'[k].
struct LinearForm {
  std::vector<std::pair<int, double>> y;
  std::vector<std::pair<int, double>> yp;
  void AddY(int index, double coeff) { if (index >= 0) y.emplace_back(index, coeff); }
  void AddYp(int index, double coeff) { if (index >= 0) yp.emplace_back(index, coeff); }
  double Evaluate(const double* y_values, const double* yp_values) const {
    double v = 0.0;
    for (const auto& [k, a] : y) v += a * y_values[k];
    for (const auto& [k, a] : yp) v += a * yp_values[k];
    return v;
  }
  // The unknowns it reads (of y and of y'), appended to `out`.
  void AppendUnknowns(std::vector<int>* out) const {
    for (const auto& term : y) out->push_back(term.first);
    for (const auto& term : yp) out->push_back(term.first);
  }
};

// How an element counts in the topology checks.
enum class TopologyRole {
  kResistive,      // a DC path (resistors, valves and switches in any state)
  kInductive,      // a DC path, and an element of possible inductor cut-sets
  kCapacitive,     // no DC path; an element of possible capacitor loops
  kVoltageSource,  // a DC path; an element of possible source loops
  kCurrentSource,  // no DC path; an element of possible source cut-sets
  kWinding,        // a winding without leakage: a DC path between its own
                   // terminals that behaves like a voltage source (n·e)
  kMagnetic,       // a core: no terminals, not part of the node graph
};

class Device {
 public:
  Device(std::string name, SourceLoc loc, std::vector<int> nodes)
      : name_(std::move(name)), loc_(std::move(loc)), nodes_(std::move(nodes)) {}
  virtual ~Device() = default;
  Device(const Device&) = delete;
  Device& operator=(const Device&) = delete;

  const std::string& name() const { return name_; }
  const SourceLoc& loc() const { return loc_; }
  const std::vector<int>& nodes() const { return nodes_; }
  virtual const char* kind_name() const = 0;
  virtual TopologyRole role() const = 0;

  // Branch unknowns: how many, where they start, which are states.
  virtual int num_branches() const { return 0; }
  void set_first_branch(int index) { first_branch_ = index; }
  int branch(int k = 0) const { return first_branch_ + k; }
  // The size of branch unknown k, for its absolute tolerance, given the
  // circuit's voltage and current scales: a capacitor's voltage is a
  // voltage, every other branch unknown a current unless the device says.
  virtual double unknown_scale(int /*k*/, double v_ref, double i_ref) const {
    return role() == TopologyRole::kCapacitive ? v_ref : i_ref;
  }
  // Initial value of a differential branch unknown (i0 of an inductor, v0 of
  // a capacitor); 0 for the others.
  virtual double initial_value(int /*k*/) const { return 0.0; }
  // True when the user wrote the initial value (i0, v0): a periodic start
  // then leaves it alone.
  virtual bool has_initial_value() const { return false; }

  // Switching: devices with an on/off state get a slot in the state vector.
  virtual bool has_switch_state() const { return false; }
  // True for valves that turn on and off by themselves (root functions).
  virtual bool natural() const { return false; }
  virtual bool initially_on() const { return false; }
  void set_switch_slot(int slot) { switch_slot_ = slot; }
  int switch_slot() const { return switch_slot_; }

  virtual void Stamp(StampSink& sink, bool on) const = 0;
  // Devices that add to b(t) say so, so that only they are visited for
  // every residual.
  virtual bool has_sources() const { return false; }
  // The rows of b that AddSources() may write.
  virtual void SourceRows(std::vector<int>* /*rows*/) const {}
  virtual void AddSources(double /*t*/, bool /*on*/, double* /*b*/) const {}

  // The probe-able quantity `what` ("i" or "v"): its linear form and unit.
  // Returns false if the device has no such quantity.
  virtual bool Signal(std::string_view what, LinearForm* form, Dim* dim) const;

  // Largest source amplitude (V or A) and smallest resistance, used to set
  // the engine's absolute tolerances. 0 when the device has none.
  // Windings couple their terminals to the rest only through a core.
  virtual bool magnetic() const { return false; }

  virtual double voltage_scale() const { return 0.0; }
  virtual double current_scale() const { return 0.0; }
  virtual double resistance_scale() const { return 0.0; }

 protected:
  // Current through the element from its first to its second node, for
  // devices whose current is a branch unknown.
  void BranchCurrentForm(LinearForm* form, double sign = 1.0) const {
    form->AddY(branch(0), sign);
  }
  // The stamps every branch device between nodes a and b shares: its
  // current k leaves a and enters b (KCL rows), and its branch row starts
  // with v_a − v_b.
  void StampBranchIncidence(StampSink& sink) const {
    const int a = NodeUnknown(nodes_[0]), b = NodeUnknown(nodes_[1]), k = branch();
    sink.G(a, k, 1.0);
    sink.G(b, k, -1.0);
    sink.G(k, a, 1.0);
    sink.G(k, b, -1.0);
  }

  // `.i` is the branch current, `.v` the terminal voltage: the signals of
  // every device whose current is its branch unknown.
  bool BranchSignal(std::string_view what, LinearForm* form, Dim* dim) const {
    if (what == "i") {
      BranchCurrentForm(form);
      *dim = dims::kCurrent;
      return true;
    }
    return Device::Signal(what, form, dim);
  }
  void VoltageForm(LinearForm* form) const {
    form->AddY(NodeUnknown(nodes_[0]), 1.0);
    form->AddY(NodeUnknown(nodes_[1]), -1.0);
  }

 private:
  std::string name_;
  SourceLoc loc_;
  std::vector<int> nodes_;
  int first_branch_ = -1;
  int switch_slot_ = -1;
};

}  // namespace lcc
