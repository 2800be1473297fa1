#include "parser/kinds.h"

#include <numbers>

namespace lcc {
namespace {

KeySpec Num(std::string_view name, Dim dim, std::optional<double> def, Constraint c,
            std::string_view doc, bool required = false) {
  KeySpec k;
  k.name = name;
  k.dim = dim;
  k.default_value = def;
  k.constraint = c;
  k.doc = doc;
  k.required = required;
  return k;
}
KeySpec Angle(std::string_view name, double def, std::string_view doc) {
  KeySpec k = Num(name, dims::kNone, def, Constraint::kAny, doc);
  k.angle = true;
  return k;
}
KeySpec Word(std::string_view name, std::vector<std::string_view> words,
             std::optional<std::string_view> def, std::string_view doc) {
  KeySpec k;
  k.name = name;
  k.type = KeyType::kWord;
  k.words = std::move(words);
  k.required = !def.has_value();
  k.default_word = def.value_or("");
  k.doc = doc;
  return k;
}
KeySpec Name(std::string_view name, bool required, std::string_view doc) {
  KeySpec k;
  k.name = name;
  k.type = KeyType::kName;
  k.required = required;
  k.doc = doc;
  return k;
}
KeySpec Nodes(std::string_view name, int count, bool required, std::string_view doc) {
  KeySpec k;
  k.name = name;
  k.type = KeyType::kNodes;
  k.count = count;
  k.required = required;
  k.doc = doc;
  return k;
}

constexpr Constraint kPos = Constraint::kPositive;
constexpr Constraint kNonNeg = Constraint::kNonNegative;
constexpr Constraint kAnyValue = Constraint::kAny;

std::vector<KeySpec> SourceKeys(Dim dim) {
  return {
      Num("dc", dim, 0.0, kAnyValue, "constant part"),
      Num("peak", dim, std::nullopt, kNonNeg, "peak of the sinusoidal part"),
      Num("rms", dim, std::nullopt, kNonNeg, "rms of the sinusoidal part (instead of peak)"),
      Num("f", dims::kFrequency, std::nullopt, kPos, "frequency of the sinusoidal part; required with peak or rms"),
      Angle("phase", 0.0, "phase of the sinusoid at t = 0 (sine reference)"),
  };
}

// `sync = SUPPLY` (ideal) or `sync = (a, b, c)` (measured, through a PLL).
KeySpec SyncKey() {
  KeySpec k = Name("sync", true, "the supply whose EMF is the ideal timing reference, or (a, b, c): measured voltages through a phase-locked loop");
  k.count = 3;
  return k;
}

std::vector<KeySpec> ThyristorKeys() {
  return {
      Num("Ih", dims::kCurrent, 0.0, kNonNeg, "holding current: below it the thyristor turns off"),
      Num("tq", dims::kTime, 0.0, kNonNeg, "turn-off time: forward voltage sooner re-fires it without a gate pulse"),
  };
}

std::vector<KeySpec> ValveKeys() {
  return {
      Num("Ron", dims::kResistance, 1e-3, kPos, "on-state resistance"),
      Num("Roff", dims::kResistance, 1e9, kPos, "off-state resistance"),
      Num("Vf", dims::kVoltage, 0.0, kNonNeg, "forward voltage drop while conducting"),
      Num("Irms_max", dims::kCurrent, std::nullopt, kPos, "rated rms current (the report flags a valve above it)"),
      Num("Ipk_max", dims::kCurrent, std::nullopt, kPos, "rated peak (surge) current"),
      Num("I2t_max", Dim{0, 0, 1, 2}, std::nullopt, kPos, "rated I²t (fuse coordination), A²s"),
      Num("Vrrm", dims::kVoltage, std::nullopt, kPos, "rated repetitive peak reverse voltage"),
  };
}

}  // namespace

const std::vector<KindSpec>& ElementKinds() {
  static const std::vector<KindSpec> kKinds = [] {
    std::vector<KindSpec> kinds;
    kinds.push_back({"resistor", {"a", "b"},
                     {Num("R", dims::kResistance, std::nullopt, kPos, "resistance", true)},
                     "a linear resistor"});
    kinds.push_back({"inductor", {"a", "b"},
                     {Num("L", dims::kInductance, std::nullopt, kPos, "inductance", true),
                      Num("R", dims::kResistance, 0.0, kNonNeg, "series resistance"),
                      Num("i0", dims::kCurrent, 0.0, kAnyValue, "current from a to b at t = 0")},
                     "a linear inductor with optional series resistance"});
    kinds.push_back({"capacitor", {"a", "b"},
                     {Num("C", dims::kCapacitance, std::nullopt, kPos, "capacitance", true),
                      Num("v0", dims::kVoltage, 0.0, kAnyValue, "voltage a minus b at t = 0")},
                     "a linear capacitor"});
    kinds.push_back({"voltage_source", {"p", "n"}, SourceKeys(dims::kVoltage),
                     "an ideal voltage source, v(p) − v(n) = dc + peak·sin(2πf·t + phase)"});
    kinds.push_back({"current_source", {"p", "n"}, SourceKeys(dims::kCurrent),
                     "an ideal current source driving dc + peak·sin(2πf·t + phase) out of p"});
    {
      KindSpec supply{"supply", {"a", "b", "c"}, {}, "a three-phase network equivalent", true};
      supply.keys = {
          Num("Vll", dims::kVoltage, std::nullopt, kPos, "rms line-to-line voltage of the EMF", true),
          Num("f", dims::kFrequency, std::nullopt, kPos, "frequency", true),
          Angle("phase", 0.0, "phase of the phase-a EMF at t = 0 (sine reference)"),
          Num("Ssc", dims::kPower, std::nullopt, kPos, "short-circuit power at the terminals"),
          Num("xr", dims::kNone, 10.0, kPos, "X/R ratio of the source impedance (with Ssc)"),
          Num("R", dims::kResistance, std::nullopt, kNonNeg, "resistance per phase (instead of Ssc)"),
          Num("L", dims::kInductance, std::nullopt, kNonNeg, "inductance per phase (instead of Ssc)"),
          Num("unbalance", dims::kNone, 0.0, kNonNeg, "negative-sequence EMF, fraction of positive sequence"),
          Nodes("neutral", 1, false, "node of the star point (default: gnd)"),
      };
      kinds.push_back(std::move(supply));
    }
    {
      std::vector<KeySpec> keys = {Word("state", {"open", "closed"}, "closed", "position")};
      for (auto& k : ValveKeys())
        if (k.name == "Ron" || k.name == "Roff") keys.push_back(k);
      keys[1].doc = "resistance when closed";
      keys[2].doc = "resistance when open";
      kinds.push_back({"switch", {"a", "b"}, keys, "a switch held open or closed"});
    }
    kinds.push_back({"diode", {"anode", "cathode"}, ValveKeys(), "a diode valve"});
    {
      std::vector<KeySpec> keys = {Name("gate", true, "the gate pulse train driving it: FIRING[k]")};
      for (auto& k : ValveKeys()) keys.push_back(k);
      for (auto& k : ThyristorKeys()) keys.push_back(k);
      kinds.push_back({"thyristor", {"anode", "cathode"}, keys, "a thyristor valve"});
    }
    kinds.push_back({"firing", {},
                     {SyncKey(),
                      Angle("alpha", 0.0, "delay angle after the natural commutation instant"),
                      Angle("width", 2.0 * std::numbers::pi / 3.0, "gate pulse width"),
                      Angle("alpha_min", 0.0, "smallest delay angle allowed"),
                      Angle("alpha_max", std::numbers::pi, "largest delay angle allowed"),
                      Name("regulate", false, "a probe (a current) to hold at target by moving alpha"),
                      Num("target", dims::kCurrent, std::nullopt, kAnyValue, "the regulated current's set point"),
                      Num("kp", dims::kNone / dims::kCurrent, 0.0, kNonNeg, "proportional gain, rad per A of error"),
                      Num("ki", dims::kNone / (dims::kCurrent * dims::kTime), 0.0, kNonNeg, "integral gain, rad per A·s of error"),
                      Angle("gamma", 0.0, "extinction angle to hold in inverter operation (0: off)"),
                      Num("pll_bandwidth", dims::kFrequency, 10.0, kPos, "natural frequency of the phase-locked loop (with sync = (a, b, c))")},
                     "the six gate pulse trains of a bridge"});
    kinds.push_back({"core", {},
                     {Num("Lm", dims::kInductance, std::nullopt, kPos, "magnetising inductance, referred to the reference winding", true),
                      Num("Rc", dims::kResistance, std::nullopt, kPos, "core-loss resistance across the reference winding (default: lossless, 1e4 × ωLm)"),
                      Name("ref", false, "the reference winding (default: the first winding on the core)")},
                     "a magnetic core coupling windings"});
    kinds.push_back({"winding", {"a", "b"},
                     {Name("core", true, "the core it is wound on"),
                      Num("turns", dims::kNone, std::nullopt, kPos, "number of turns", true),
                      Num("R", dims::kResistance, 0.0, kNonNeg, "series resistance"),
                      Num("Lleak", dims::kInductance, 0.0, kNonNeg, "leakage inductance")},
                     "a winding on a core; a is its dotted end"});
    kinds.push_back({"transformer", {},
                     {Nodes("hv", 3, true, "the HV terminals (A, B, C)"),
                      Nodes("lv", 3, true, "the LV terminals (a, b, c)"),
                      Nodes("neutral_hv", 1, false, "node of the HV star point (groups with YN)"),
                      Nodes("neutral_lv", 1, false, "node of the LV star point (groups with yn)"),
                      Name("group", true, "IEC 60076-1 vector group, e.g. Dyn11"),
                      Num("S", dims::kPower, std::nullopt, kPos, "rated power (three-phase)", true),
                      Num("V1", dims::kVoltage, std::nullopt, kPos, "rated HV line-to-line voltage", true),
                      Num("V2", dims::kVoltage, std::nullopt, kPos, "rated LV line-to-line voltage", true),
                      Num("z", dims::kNone, std::nullopt, Constraint::kPerUnit, "short-circuit impedance, fraction of the rating base", true),
                      Num("xr", dims::kNone, 10.0, kPos, "X/R ratio of the short-circuit impedance"),
                      Num("im", dims::kNone, 0.01, Constraint::kPerUnit, "magnetising current, fraction of rated current"),
                      Num("p0", dims::kPower, 0.0, kNonNeg, "no-load (core) loss, three-phase"),
                      Num("f", dims::kFrequency, std::nullopt, kPos, "rated frequency (default: the circuit's fundamental)"),
                      Angle("shift", 0.0, "extra phase shift of the LV voltages, leading when positive (zig-zag LV)")},
                     "a three-phase two-winding transformer from its nameplate"});
    {
      std::vector<KeySpec> keys = {
          Nodes("ac", 3, true, "the AC terminals (a, b, c)"),
          Nodes("dc", 2, true, "the DC terminals (p, n)"),
          Word("valve", {"diode", "thyristor"}, "diode", "valve kind"),
          Name("firing", false, "the firing element driving its thyristors"),
      };
      for (auto& k : ValveKeys()) keys.push_back(k);
      for (auto& k : ThyristorKeys()) keys.push_back(k);
      keys.push_back(Num("snubber_R", dims::kResistance, std::nullopt, kPos, "RC snubber resistance across each valve"));
      keys.push_back(Num("snubber_C", dims::kCapacitance, std::nullopt, kPos, "RC snubber capacitance across each valve"));
      kinds.push_back({"bridge", {}, keys, "a six-pulse (Graetz) bridge of six valves"});
    }
    return kinds;
  }();
  return kKinds;
}

const std::vector<KindSpec>& StudyStatements() {
  static const std::vector<KindSpec> kStatements = [] {
    std::vector<KindSpec> s;
    s.push_back({"simulate", {},
                 {Num("stop", dims::kTime, std::nullopt, kPos, "end of the run", true),
                  Num("sample", dims::kTime, std::nullopt, kPos, "output interval (default: period/1024, or stop/10000 without a periodic source)"),
                  Num("reltol", dims::kNone, 1e-6, Constraint::kFraction, "relative tolerance of the integrator"),
                  Num("max_step", dims::kTime, std::nullopt, kPos, "largest integration step (default: two electrical degrees, or stop/1000)"),
                  Word("start", {"phasor", "zero"}, "phasor", "initial state: the AC steady state of the network with the valves blocking, or zero")},
                 "the run"});
    s.push_back({"steady", {},
                 {Num("cycles", dims::kNone, 2.0, Constraint::kPositiveInteger, "whole cycles recorded once steady"),
                  Num("tol", dims::kNone, 1e-5, Constraint::kFraction, "largest relative change of the state over one cycle"),
                  Num("settle_max", dims::kTime, std::nullopt, kPos, "give up waiting for steady state after this time (default: stop)"),
                  Num("f", dims::kFrequency, std::nullopt, kPos, "fundamental frequency (default: that of the first periodic source)"),
                  Word("method", {"simulate", "shooting"}, "simulate", "how the steady state is reached: simulated cycle after cycle, or by shooting-Newton from the first cycle boundary")},
                 "periodic steady state"});
    s.push_back({"window", {},
                 {Num("from", dims::kTime, std::nullopt, Constraint::kNonNegative, "start of the analysis window", true),
                  Num("to", dims::kTime, std::nullopt, kPos, "end of the analysis window", true)},
                 "the analysis window of a transient case"});
    s.push_back({"pcc", {},
                 {Name("at", true, "the supply whose terminals are the point of common coupling"),
                  Num("IL", dims::kCurrent, std::nullopt, kPos, "maximum demand load current, fundamental rms (default: this case's)"),
                  Num("pulses", dims::kNone, 6.0, Constraint::kPositiveInteger, "pulse number of the converter, for the IEEE 519 §5.5 allowance")},
                 "an IEEE Std 519-2014 harmonic check at a supply's terminals"});
    return s;
  }();
  return kStatements;
}

const KindSpec* FindElementKind(std::string_view name) {
  for (const auto& k : ElementKinds())
    if (k.name == name) return &k;
  return nullptr;
}

const KeySpec* FindKey(const KindSpec& kind, std::string_view key) {
  for (const auto& k : kind.keys)
    if (k.name == key) return &k;
  return nullptr;
}

std::string KeyList(const KindSpec& kind) {
  std::string out;
  for (const auto& k : kind.keys) {
    if (!out.empty()) out += ", ";
    out += k.name;
  }
  if (kind.harmonic_keys) out += ", h2 ... h50";
  return out;
}

std::string KindList() {
  std::string out;
  for (const auto& k : ElementKinds()) {
    if (!out.empty()) out += ", ";
    out += k.name;
  }
  return out;
}

}  // namespace lcc
