#include "parser/elaborate.h"

#include <fmt/format.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <numbers>
#include <set>
#include <sstream>

#include "models/capacitor.h"
#include "models/core.h"
#include "models/inductor.h"
#include "models/winding.h"
#include "models/resistor.h"
#include "models/source_branch.h"
#include "models/sources.h"
#include "models/valve.h"
#include "parser/expression.h"
#include "parser/kinds.h"
#include "parser/layout.h"
#include "parser/netlist.h"
#include "parser/vector_group.h"

namespace lcc {
namespace {

namespace fs = std::filesystem;
using FilePtr = std::shared_ptr<const SourceFile>;

// Largest file read, a guard against pointing the tool at the wrong file.
constexpr std::uintmax_t kMaxFileBytes = std::uintmax_t{64} * 1024 * 1024;
constexpr int kMaxIncludeDepth = 32;

// The settings of one statement after checking.
struct Settings {
  std::map<std::string, double> numbers;
  std::map<std::string, std::string> words;
  std::map<std::string, std::vector<ast::Ident>> nodes;
  std::map<std::string, SourceLoc> where;

  bool has(const std::string& key) const { return where.count(key) > 0; }
  double number(const std::string& key, double fallback = 0.0) const {
    auto it = numbers.find(key);
    return it == numbers.end() ? fallback : it->second;
  }
};

struct PendingProbe {
  ast::Setting setting;
  FilePtr file;
};

std::string ConstraintText(Constraint c) {
  switch (c) {
    case Constraint::kPositive: return "greater than zero";
    case Constraint::kNonNegative: return "zero or more";
    case Constraint::kPositiveInteger: return "a whole number of 1 or more";
    case Constraint::kFraction: return "between 0 and 0.1";
    case Constraint::kPerUnit: return "greater than zero and below 1 (100 %)";
    case Constraint::kAny: return "";
  }
  return "";
}

bool Satisfies(Constraint c, double v) {
  switch (c) {
    case Constraint::kPositive: return v > 0;
    case Constraint::kNonNegative: return v >= 0;
    case Constraint::kPositiveInteger: return v >= 1 && v == std::floor(v) && v < 1e6;
    case Constraint::kFraction: return v > 0 && v <= 0.1;
    case Constraint::kPerUnit: return v > 0 && v < 1;
    case Constraint::kAny: return true;
  }
  return true;
}

// Is `key` of the form hN with 2 <= N <= 50?
int HarmonicOrder(const std::string& key) {
  if (key.size() < 2 || key.size() > 3 || key[0] != 'h') return 0;
  for (std::size_t i = 1; i < key.size(); ++i)
    if (key[i] < '0' || key[i] > '9') return 0;
  int n = std::stoi(key.substr(1));
  return n >= 2 && n <= 50 ? n : 0;
}

class Elaborator {
 public:
  Elaborator(Design& design, Diagnostics& diags, const Overrides* overrides)
      : design_(design), diags_(diags), overrides_(overrides) {}

  void RunFile(const std::string& path) {
    std::string text;
    std::string error;
    if (!ReadFile(path, &text, &error)) {
      diags_.Error({}, fmt::format("cannot read '{}': {}", path, error));
      return;
    }
    include_stack_.push_back(Canonical(path));
    RunText(std::make_shared<SourceFile>(path, std::move(text)));
  }

  void RunText(const FilePtr& file) {
    design_.files.push_back(file);
    Layout layout = LayOut(file, diags_);
    for (const auto& span : layout.statements) {
      if (diags_.saturated()) return;
      const std::string keyword = FirstWord(layout.clean, span);
      if (keyword == "case") {
        CaseStatement(file, layout.clean, span);
        continue;
      }
      if (keyword == "sweep") {
        SweepStatement(file, layout.clean, span);
        continue;
      }
      auto statement = ParseStatement(file, layout.clean, span, diags_);
      if (statement) Statement(*statement, file);
    }
  }

  void Finish() {
    // Cores built from `core` statements: their reference winding, and the
    // lossless default of Rc.
    for (auto& [core_name, use] : cores_) {
      if (use.windings.empty()) {
        diags_.Error(use.core->loc(), fmt::format("core {} has no windings", core_name));
        continue;
      }
      const Winding* ref = use.windings.front();
      if (!use.ref.empty()) {
        ref = nullptr;
        for (const Winding* w : use.windings)
          if (w->name() == use.ref) ref = w;
        if (!ref) {
          diags_.Error(use.ref_loc, fmt::format("'{}' is not a winding on core {}", use.ref, core_name));
          continue;
        }
      }
      double rc = use.core->rc();
      if (rc == 0.0) {
        if (design_.study.fundamental <= 0) {
          diags_.Error(use.core->loc(), fmt::format("core {} needs Rc: the circuit has no fundamental frequency "
                                                    "to set its lossless default", core_name));
          continue;
        }
        rc = kLosslessRcFactor * 2 * std::numbers::pi * design_.study.fundamental * use.core->lm();
      }
      use.core->Configure(rc, ref->turns());
    }
    if (diags_.has_errors()) return;
    // Probes refer to unknowns by index: number them first.
    design_.circuit.Finalize();
    for (const auto& p : probes_) CompileProbe(p);
    // Regulating firing elements sample a probe: resolve its name.
    for (const auto& [index, where] : regulated_) {
      Firing& f = design_.circuit.firings()[index];
      const auto& probes = design_.study.probes;
      for (std::size_t k = 0; k < probes.size(); ++k)
        if (probes[k].name == f.regulate) f.regulate_probe = static_cast<int>(k);
      if (f.regulate_probe < 0) {
        diags_.Error(where, fmt::format("no probe named '{}' to regulate", f.regulate),
                     "define it with: probe NAME = ELEMENT.i");
      } else if (!(probes[f.regulate_probe].dim == dims::kCurrent)) {
        diags_.Error(where, fmt::format("probe '{}' is not a current", f.regulate));
      }
    }
    CheckTargets();
    for (PccSpec pcc : pending_pccs_) {
      const auto& supplies = design_.circuit.supplies();
      for (std::size_t k = 0; k < supplies.size(); ++k)
        if (supplies[k].name == pcc.supply) pcc.supply_index = static_cast<int>(k);
      if (pcc.supply_index < 0) {
        diags_.Error(pcc.loc, fmt::format("no supply named '{}'", pcc.supply),
                     "the point of common coupling is the terminals of a supply element");
        continue;
      }
      design_.study.pccs.push_back(pcc);
    }
    if (design_.study.steady && design_.study.steady->frequency == 0.0) {
      if (design_.study.fundamental > 0) {
        design_.study.steady->frequency = design_.study.fundamental;
      } else {
        diags_.Error(design_.study.steady->loc,
                     "steady needs a periodic source to know the cycle",
                     "add a supply or a sinusoidal source, or give steady f = ...");
      }
    }
    if (design_.circuit.devices().empty() && !diags_.has_errors() && !design_.files.empty()) {
      diags_.Error(SourceLoc{design_.files.front(), 0}, "the netlist describes no circuit",
                   "add elements such as: resistor R1 (a, gnd) R = 10 ohm");
    }
  }

 private:
  // ---- cases and sweeps -------------------------------------------------------

  static constexpr double kMaxCases = 100000;  // cases in one batch

  static std::string FirstWord(const std::string& clean, const StatementSpan& span) {
    std::size_t e = span.begin;
    while (e < span.end && (std::isalnum(static_cast<unsigned char>(clean[e])) || clean[e] == '_')) ++e;
    return clean.substr(span.begin, e - span.begin);
  }

  static std::string PathText(const ast::Path& p) {
    std::string out;
    for (const auto& part : p.parts) {
      if (!out.empty()) out += ".";
      out += part.name;
      if (part.index >= 0) out += fmt::format("[{}]", part.index);
    }
    return out;
  }

  // `case NAME` or `case NAME { lines }`: each line a set or an at-action.
  void CaseStatement(const FilePtr& file, const std::string& clean, const StatementSpan& span) {
    std::size_t at = span.begin + 4;
    while (at < span.end && std::isspace(static_cast<unsigned char>(clean[at]))) ++at;
    std::size_t name_end = at;
    while (name_end < span.end && (std::isalnum(static_cast<unsigned char>(clean[name_end])) || clean[name_end] == '_'))
      ++name_end;
    if (name_end == at || std::isdigit(static_cast<unsigned char>(clean[at]))) {
      Error(file, at, "case needs a name", "for example: case dc_short { at 300 ms close Sdc }");
      return;
    }
    CaseDecl decl;
    decl.name = clean.substr(at, name_end - at);
    decl.loc = SourceLoc{file, at};
    for (const auto& other : design_.batch.cases)
      if (other.name == decl.name) {
        Error(file, at, fmt::format("a second case named '{}'", decl.name));
        diags_.Note(other.loc, "the first is here");
        return;
      }
    std::size_t open = name_end;
    while (open < span.end && std::isspace(static_cast<unsigned char>(clean[open]))) ++open;
    if (open < span.end) {
      std::size_t close = span.end;
      while (close > open && std::isspace(static_cast<unsigned char>(clean[close - 1]))) --close;
      if (clean[open] != '{' || close == open + 0 || clean[close - 1] != '}') {
        Error(file, open, "expected '{' and the case's lines, ending with '}'",
              "for example: case sag {\n        at 300 ms set Grid.Vll = 0.7 * Vll\n    }");
        return;
      }
      // The lines between the braces, one action each.
      std::size_t line = open + 1;
      const std::size_t body_end = close - 1;
      while (line < body_end) {
        std::size_t end = clean.find('\n', line);
        if (end == std::string::npos || end > body_end) end = body_end;
        std::size_t b = line, e = end;
        while (b < e && std::isspace(static_cast<unsigned char>(clean[b]))) ++b;
        while (e > b && std::isspace(static_cast<unsigned char>(clean[e - 1]))) --e;
        if (b < e) {
          auto action = ParseAction(file, clean, StatementSpan{b, e}, diags_);
          if (action) CaseAction(*action, file, &decl);
        }
        line = end + 1;
      }
    }
    std::stable_sort(decl.timed.begin(), decl.timed.end(),
                     [](const TimedActionSpec& a, const TimedActionSpec& b) { return a.t < b.t; });
    design_.batch.cases.push_back(std::move(decl));
  }

  void CaseAction(const ast::Action& a, const FilePtr& file, CaseDecl* decl) {
    using Verb = TimedActionSpec::Verb;
    static const std::map<std::string, Verb> kVerbs{{"set", Verb::kSet}, {"close", Verb::kClose},
                                                    {"open", Verb::kOpen}, {"short", Verb::kShort},
                                                    {"misfire", Verb::kMisfire}};
    auto verb = kVerbs.find(a.verb.name);
    if (verb == kVerbs.end()) {
      Error(file, a.verb.offset, fmt::format("unknown action '{}'", a.verb.name),
            "actions are set, close, open, short and misfire");
      return;
    }
    TimedActionSpec spec;
    spec.verb = verb->second;
    spec.target = PathText(a.target);
    spec.loc = SourceLoc{file, a.target.offset};
    if (a.at) {
      auto t = EvaluateConstant(*a.at, file);
      if (!t) return;
      if (!(t->dim == dims::kTime) || t->value < 0) {
        Error(file, a.at->offset, "the time of an action must be a time of 0 s or more");
        return;
      }
      spec.t = t->value;
    } else if (spec.verb != Verb::kSet) {
      Error(file, a.verb.offset, fmt::format("{} needs a time", a.verb.name),
            fmt::format("for example: at 300 ms {} {}", a.verb.name, spec.target));
      return;
    }
    if (spec.verb == Verb::kSet) {
      if (!a.value) {
        Error(file, a.target.offset + spec.target.size(), "set needs '= value'");
        return;
      }
      auto q = EvaluateConstant(*a.value, file);
      if (!q) return;
      spec.value = *q;
    } else if (a.value) {
      Error(file, a.value->offset, fmt::format("{} takes no value", a.verb.name));
      return;
    }
    for (const auto& setting : a.settings) {
      if (spec.verb != Verb::kMisfire || setting.key.name != "pulses" ||
          setting.value.get().type() != typeid(ast::Expr)) {
        Error(file, setting.key.offset, fmt::format("{} has no setting '{}'", a.verb.name, setting.key.name),
              spec.verb == Verb::kMisfire ? "misfire takes pulses = N" : "");
        return;
      }
      auto n = EvaluateConstant(boost::get<ast::Expr>(setting.value), file);
      if (!n) return;
      if (!n->dim.dimensionless() || n->value < 1 || n->value != std::floor(n->value)) {
        Error(file, setting.key.offset, "pulses must be a whole number of 1 or more");
        return;
      }
      spec.pulses = static_cast<int>(n->value);
    }
    pending_targets_.push_back({spec.target, spec.loc, spec.value, spec.verb == Verb::kSet, spec.verb, spec.t,
                                a.at.has_value()});
    if (spec.verb == Verb::kSet && !a.at) {
      decl->start[spec.target] = spec.value;
    } else {
      decl->timed.push_back(spec);
    }
  }

  void SweepStatement(const FilePtr& file, const std::string& clean, const StatementSpan& span) {
    std::size_t b = span.begin + 5;
    while (b < span.end && std::isspace(static_cast<unsigned char>(clean[b]))) ++b;
    auto syntax = ParseSweep(file, clean, StatementSpan{b, span.end}, diags_);
    if (!syntax) return;
    SweepDecl decl;
    std::vector<Quantity> values;
    if (syntax->range) {
      const auto& r = *syntax->range;
      decl.target = PathText(r.target);
      decl.loc = SourceLoc{file, r.target.offset};
      auto from = EvaluateConstant(r.from, file), to = EvaluateConstant(r.to, file), step = EvaluateConstant(r.step, file);
      if (!from || !to || !step) return;
      if (!(from->dim == to->dim) || !(from->dim == step->dim)) {
        Error(file, r.step.offset, "the range's start, end and step must have the same unit");
        return;
      }
      if (step->value <= 0 || to->value < from->value) {
        Error(file, r.step.offset, "a sweep runs upwards: the step must be positive and the end at least the start");
        return;
      }
      const double n = std::floor((to->value - from->value) / step->value + 1e-9);
      if (n > 10000) {
        Error(file, r.step.offset, fmt::format("the range has {:g} points, more than 10000", n + 1));
        return;
      }
      for (int k = 0; k <= static_cast<int>(n); ++k) values.push_back({from->value + k * step->value, from->dim});
      // Labels in the unit the start is written in (`0 deg .. 75 deg`).
      std::string unit;
      double scale = 1.0;
      if (r.from.rest.empty() && r.from.first.get().type() == typeid(ast::Number)) {
        unit = boost::get<ast::Number>(r.from.first).unit;
        if (auto info = LookUpUnit(unit)) scale = info->scale;
      }
      if (!unit.empty())
        for (const auto& v : values) decl.labels.push_back(fmt::format("{:.6g}{}", v.value / scale, unit));
    } else {
      const auto& l = *syntax->list;
      decl.target = PathText(l.target);
      decl.loc = SourceLoc{file, l.target.offset};
      for (const auto& e : l.values) {
        auto q = EvaluateConstant(e, file);
        if (!q) return;
        // The label is the value as written, blanks removed.
        std::size_t end = e.offset;
        int depth = 0;
        while (end < span.end && !(depth == 0 && (clean[end] == ',' || clean[end] == ')'))) {
          depth += clean[end] == '(' ? 1 : clean[end] == ')' ? -1 : 0;
          ++end;
        }
        std::string label;
        for (std::size_t i = e.offset; i < end; ++i)
          if (!std::isspace(static_cast<unsigned char>(clean[i]))) label += clean[i];
        decl.labels.push_back(label);
        if (!values.empty() && !(q->dim == values.front().dim)) {
          Error(file, e.offset, "the values of a sweep must have the same unit");
          return;
        }
        values.push_back(*q);
      }
    }
    for (const auto& other : design_.batch.sweeps)
      if (other.target == decl.target) {
        diags_.Error(decl.loc, fmt::format("{} is swept twice", decl.target));
        diags_.Note(other.loc, "the first sweep is here");
        return;
      }
    decl.values = values;
    pending_targets_.push_back({decl.target, decl.loc, values.front(), true, TimedActionSpec::Verb::kSet, 0.0, false});
    design_.batch.sweeps.push_back(std::move(decl));
  }

  // Every case and sweep target names something that exists and takes the
  // value given; every action falls before the stop time.
  void CheckTargets() {
    using Verb = TimedActionSpec::Verb;
    // A batch is cases × sweep points; refuse one that could not be run (or
    // even listed) before it is expanded.
    double cases = std::max<double>(1.0, static_cast<double>(design_.batch.cases.size()));
    for (const auto& sweep : design_.batch.sweeps) {
      cases *= static_cast<double>(sweep.values.size());
      if (cases > kMaxCases) {
        diags_.Error(sweep.loc, fmt::format("the batch would have {:g} cases, more than {:g}", cases, kMaxCases),
                     "split the study into several files, or sweep fewer values");
        return;
      }
    }
    const double stop = design_.study.simulate ? design_.study.simulate->stop : 0.0;
    for (const auto& p : pending_targets_) {
      if (p.timed && stop > 0 && p.t >= stop) {
        diags_.Error(p.loc, fmt::format("the action at {:g} s falls at or after the stop time ({:g} s)", p.t, stop));
        continue;
      }
      const std::size_t dot = p.target.find('.');
      const std::size_t bracket = p.target.find('[');
      const std::string element = p.target.substr(0, std::min(dot, bracket));
      int index = -1;
      if (bracket != std::string::npos && dot == std::string::npos)
        index = std::atoi(p.target.c_str() + bracket + 1);
      auto kind_it = element_kinds_.find(element);
      const KindSpec* kind = kind_it == element_kinds_.end() ? nullptr : kind_it->second;
      if (p.verb == Verb::kSet) {
        if (dot == std::string::npos && bracket == std::string::npos) {
          auto param = params_.find(p.target);
          if (param == params_.end()) {
            diags_.Error(p.loc, fmt::format("no parameter or element key '{}'", p.target),
                         "write ELEMENT.KEY (for example Grid.Vll) or the name of a param");
          } else if (!p.value.dim.dimensionless() && !(p.value.dim == param->second.dim)) {
            diags_.Error(p.loc, fmt::format("{} is {}, the value given is {}", p.target, DimName(param->second.dim),
                                            DimName(p.value.dim)));
          }
          continue;
        }
        if (!kind || bracket != std::string::npos) {
          diags_.Error(p.loc, fmt::format("no element named '{}'", element));
          continue;
        }
        const std::string key = p.target.substr(dot + 1);
        const KeySpec* spec = FindKey(*kind, key);
        if (!spec && !(kind->harmonic_keys && HarmonicOrder(key))) {
          diags_.Error(p.loc, fmt::format("{} has no key '{}'", kind->name, key), "its keys are: " + KeyList(*kind));
          continue;
        }
        if (spec && spec->type != KeyType::kNumber) {
          diags_.Error(p.loc, fmt::format("{} of {} is not a number; only numeric keys can be set", key, kind->name));
          continue;
        }
        if (spec && !p.value.dim.dimensionless() && !(p.value.dim == spec->dim)) {
          diags_.Error(p.loc, fmt::format("{} of {} expects {}, found {}", key, kind->name, DimName(spec->dim),
                                          DimName(p.value.dim)));
          continue;
        }
        if (spec && spec->angle)
          for (auto& sweep : design_.batch.sweeps)
            if (sweep.target == p.target) sweep.angle = true;
        continue;
      }
      if (!kind) {
        diags_.Error(p.loc, fmt::format("no element named '{}'", element));
        continue;
      }
      const bool valve_kind = kind->name == "diode" || kind->name == "thyristor";
      const bool bridge_valve = kind->name == "bridge" && index >= 1 && index <= 6;
      if (p.verb == Verb::kMisfire) {
        if (kind->name != "firing" || index < 1 || index > 6)
          diags_.Error(p.loc, "misfire needs a firing element's pulse train, FIRING[1] .. FIRING[6]");
        continue;
      }
      if (p.verb == Verb::kShort && !(valve_kind || bridge_valve)) {
        diags_.Error(p.loc, "short needs a valve: a diode, a thyristor or BRIDGE[1] .. BRIDGE[6]");
        continue;
      }
      if (p.verb == Verb::kClose && kind->name != "switch") {
        diags_.Error(p.loc, "close needs a switch", valve_kind || bridge_valve ? "a valve that fails conducting: short" : "");
        continue;
      }
      if (p.verb == Verb::kOpen && !(kind->name == "switch" || valve_kind || bridge_valve)) {
        diags_.Error(p.loc, "open needs a switch or a valve");
        continue;
      }
      if (kind->name == "bridge" && !bridge_valve) diags_.Error(p.loc, "name one valve: BRIDGE[1] .. BRIDGE[6]");
    }
  }

  // ---- statements ---------------------------------------------------------

  void Statement(const ast::Statement& s, const FilePtr& file) {
    const std::string& kw = s.keyword.name;
    if (kw == "param") return Param(s, file);
    if (kw == "include") return Include(s, file);
    if (kw == "probe") return ProbeStatement(s, file);
    if (kw == "simulate" || kw == "steady" || kw == "window" || kw == "pcc") return StudyStatement(s, file);
    if (const KindSpec* kind = FindElementKind(kw)) return Element(*kind, s, file);
    static const std::set<std::string> kLater{"define"};
    if (kw == "at" || kw == "set") {
      Error(file, s.keyword.offset, fmt::format("'{}' belongs inside a case block", kw),
                "for example: case sag { at 300 ms set Grid.Vll = 0.7 * Vll }");
      return;
    }
    if (kLater.count(kw)) {
      Error(file, s.keyword.offset, fmt::format("'{}' is not supported by this version", kw));
      return;
    }
    Error(file, s.keyword.offset, fmt::format("unknown kind or statement '{}'", kw),
          "element kinds are " + KindList() +
              "; statements are param, include, simulate, steady, window, pcc, probe, case, sweep");
  }

  // A statement of the form `keyword NAME = value` (param, probe).
  const ast::Setting* SingleSetting(const ast::Statement& s, const FilePtr& file) {
    const std::string& kw = s.keyword.name;
    if (s.name || s.ports || s.text || s.settings.size() != 1) {
      std::size_t at = s.name ? s.name->offset
                     : s.ports ? s.ports->offset
                     : s.text ? s.text->offset
                     : s.settings.size() > 1 ? s.settings[1].offset
                                             : s.keyword.offset;
      Error(file, at, fmt::format("{} takes exactly one NAME = value", kw),
            fmt::format("for example: {} x = 2 * 3 A", kw));
      return nullptr;
    }
    if (s.settings[0].value.get().type() != typeid(ast::Expr)) {
      Error(file, s.settings[0].value.get().type() == typeid(ast::Tuple)
                      ? boost::get<ast::Tuple>(s.settings[0].value).offset
                      : s.settings[0].offset,
            fmt::format("{} needs an expression, not a node list", kw));
      return nullptr;
    }
    return &s.settings[0];
  }

  void Param(const ast::Statement& s, const FilePtr& file) {
    const ast::Setting* set = SingleSetting(s, file);
    if (!set) return;
    const std::string& name = set->key.name;
    if (!DeclareName(name, file, set->key.offset)) return;
    auto q = EvaluateConstant(boost::get<ast::Expr>(set->value), file);
    if (q && overrides_ && overrides_->count(name)) q->value = overrides_->at(name);
    if (q) params_[name] = *q;
  }

  void Include(const ast::Statement& s, const FilePtr& file) {
    if (!s.text || s.name || s.ports || !s.settings.empty()) {
      Error(file, s.keyword.offset, "include takes one quoted path", "for example: include \"grid.lcc\"");
      return;
    }
    const std::size_t at = s.text->offset;
    fs::path base = fs::path(file->path()).parent_path();
    fs::path target = fs::path(s.text->value).is_absolute() ? fs::path(s.text->value)
                                                            : base / s.text->value;
    const std::string canonical = Canonical(target.string());
    for (std::size_t i = 0; i < include_stack_.size(); ++i) {
      if (include_stack_[i] == canonical) {
        std::string chain;
        for (std::size_t k = i; k < include_stack_.size(); ++k)
          chain += fs::path(include_stack_[k]).filename().string() + " -> ";
        chain += fs::path(canonical).filename().string();
        Error(file, at, "include cycle: " + chain);
        return;
      }
    }
    if (static_cast<int>(include_stack_.size()) >= kMaxIncludeDepth) {
      Error(file, at, fmt::format("includes nested deeper than {}", kMaxIncludeDepth));
      return;
    }
    std::string text, error;
    if (!ReadFile(target.string(), &text, &error)) {
      Error(file, at, fmt::format("cannot read '{}': {}", target.string(), error));
      return;
    }
    include_stack_.push_back(canonical);
    RunText(std::make_shared<SourceFile>(target.string(), std::move(text)));
    include_stack_.pop_back();
  }

  void ProbeStatement(const ast::Statement& s, const FilePtr& file) {
    const ast::Setting* set = SingleSetting(s, file);
    if (!set) return;
    auto [it, inserted] = probe_names_.emplace(set->key.name, SourceLoc{file, set->key.offset});
    if (!inserted) {
      Error(file, set->key.offset, fmt::format("probe '{}' is already defined", set->key.name));
      diags_.Note(it->second, "first defined here");
      return;
    }
    probes_.push_back({*set, file});
  }

  void StudyStatement(const ast::Statement& s, const FilePtr& file) {
    const KindSpec* spec = nullptr;
    for (const auto& k : StudyStatements())
      if (k.name == s.keyword.name) spec = &k;
    if (s.name || s.ports || s.text) {
      std::size_t at = s.name ? s.name->offset : s.ports ? s.ports->offset : s.text->offset;
      Error(file, at, fmt::format("{} takes only key = value settings", spec->name));
      return;
    }
    Settings set;
    if (!ReadSettings(*spec, s, file, &set)) return;
    SourceLoc loc{file, s.keyword.offset};
    if (spec->name == "simulate") {
      if (design_.study.simulate) {
        Error(file, s.keyword.offset, "a second simulate statement");
        diags_.Note(design_.study.simulate->loc, "the first is here");
        return;
      }
      SimulateSpec sim;
      sim.stop = set.number("stop");
      sim.sample = set.number("sample");
      sim.reltol = set.number("reltol", 1e-6);
      sim.max_step = set.number("max_step");
      sim.periodic_start = set.words["start"] != "zero";
      sim.loc = loc;
      // A run of less than a nanosecond resolves nothing of a converter, and
      // at 1e-303 s IDA's first step underflows to zero.
      if (sim.stop < 1e-9) {
        diags_.Error(set.where.at("stop"), fmt::format("stop = {:g} s is shorter than 1 ns", sim.stop));
        return;
      }
      // Output samples are emitted one by one: a sample interval of 1e-306 s
      // over 60 ms never finished, and its spooled rows filled the disk.
      // A billion rows (1000 s at 1 µs) is far past any study's need.
      constexpr double kMostSamples = 1e9;
      if (sim.sample > 0 && sim.stop / sim.sample > kMostSamples) {
        diags_.Error(set.where.at("sample"),
                     fmt::format("sample = {:g} s makes {:.3g} output samples up to stop = {:g} s, more than {:g}",
                                 sim.sample, sim.stop / sim.sample, sim.stop, kMostSamples),
                     "choose a longer sample interval");
        return;
      }
      design_.study.simulate = sim;
    } else if (spec->name == "window") {
      if (design_.study.window) {
        Error(file, s.keyword.offset, "a second window statement");
        diags_.Note(design_.study.window->loc, "the first is here");
        return;
      }
      WindowSpec win{set.number("from"), set.number("to"), loc};
      if (win.to <= win.from) {
        diags_.Error(set.where.at("to"), "the window must end after it begins");
        return;
      }
      design_.study.window = win;
    } else if (spec->name == "pcc") {
      PccSpec pcc;
      pcc.supply = set.words.at("at");
      pcc.il = set.number("IL");
      pcc.pulses = static_cast<int>(set.number("pulses", 6));
      pcc.loc = set.where.at("at");
      if (pcc.pulses % 6 != 0) {
        diags_.Error(set.where.at("pulses"), "the pulse number of a converter is a multiple of 6");
        return;
      }
      pending_pccs_.push_back(pcc);
    } else {
      if (design_.study.steady) {
        Error(file, s.keyword.offset, "a second steady statement");
        diags_.Note(design_.study.steady->loc, "the first is here");
        return;
      }
      SteadySpec st;
      st.cycles = static_cast<int>(set.number("cycles", 2));
      st.tol = set.number("tol", 1e-5);
      st.settle_max = set.number("settle_max");
      st.frequency = set.number("f");
      st.shooting = set.words["method"] == "shooting";
      st.loc = loc;
      design_.study.steady = st;
    }
  }

  // ---- elements -------------------------------------------------------------

  void Element(const KindSpec& kind, const ast::Statement& s, const FilePtr& file) {
    if (!s.name) {
      Error(file, s.keyword.offset + kind.name.size(),
            fmt::format("{} needs a name", kind.name),
            fmt::format("for example: {} X1 ...", kind.name));
      return;
    }
    if (s.text) {
      Error(file, s.text->offset, "unexpected quoted text");
      return;
    }
    const std::string& name = s.name->name;
    const bool named_ok = DeclareName(name, file, s.name->offset);

    // Positional ports.
    std::vector<ast::Ident> ports;
    if (!kind.ports.empty()) {
      std::string expected = "(";
      for (std::size_t i = 0; i < kind.ports.size(); ++i)
        expected += (i ? ", " : "") + std::string(kind.ports[i]);
      expected += ")";
      if (!s.ports) {
        Error(file, s.name->offset + name.size(),
              fmt::format("{} {} needs its ports {} after the name", kind.name, name, expected));
        return;
      }
      if (s.ports->items.empty()) {
        Error(file, s.ports->offset, fmt::format("empty port list: {} takes {}", kind.name, expected));
        return;
      }
      if (s.ports->items.size() != kind.ports.size()) {
        Error(file, s.ports->offset,
              fmt::format("{} takes {} ports {}, found {}", kind.name, kind.ports.size(), expected,
                          s.ports->items.size()));
        return;
      }
      ports = s.ports->items;
    } else if (s.ports) {
      Error(file, s.ports->offset,
            fmt::format("{} has no positional ports; name its port groups, e.g. ac = (a, b, c)",
                        kind.name));
      return;
    }

    if (named_ok) element_kinds_[name] = &kind;
    Settings set;
    if (!ReadSettings(kind, s, file, &set) || !named_ok) return;
    SourceLoc loc{file, s.name->offset};
    if (overrides_)
      for (const auto& [target, value] : *overrides_)
        if (target.size() > name.size() + 1 && target.compare(0, name.size() + 1, name + ".") == 0) {
          const std::string key = target.substr(name.size() + 1);
          const KeySpec* spec = FindKey(kind, key);
          if (spec && !Satisfies(spec->constraint, value)) {
            diags_.Error(loc, fmt::format("{} must be {}, found {:g}{} (the case's value)", key,
                                          ConstraintText(spec->constraint), value,
                                          spec->dim.dimensionless() ? "" : " " + UnitLabel(spec->dim)));
            return;
          }
          set.numbers[key] = value;
          if (!set.where.count(key)) set.where[key] = loc;
        }
    auto node = [&](const ast::Ident& id) { return design_.circuit.Node(id.name, SourceLoc{file, id.offset}); };

    // Two-terminal elements whose terminals coincide are always a mistake.
    if (ports.size() == 2 && ports[0].name == ports[1].name) {
      Error(file, ports[1].offset,
            fmt::format("both ports of {} {} are node '{}'", kind.name, name, ports[0].name),
            "an element must connect two different nodes");
      return;
    }

    Circuit& c = design_.circuit;
    if (kind.name == "resistor") {
      c.Add(std::make_unique<Resistor>(name, loc, node(ports[0]), node(ports[1]), set.number("R")));
    } else if (kind.name == "inductor") {
      c.Add(std::make_unique<Inductor>(name, loc, node(ports[0]), node(ports[1]), set.number("L"),
                                       set.number("R"), set.number("i0"), set.has("i0")));
    } else if (kind.name == "capacitor") {
      c.Add(std::make_unique<Capacitor>(name, loc, node(ports[0]), node(ports[1]), set.number("C"),
                                        set.number("v0"), set.has("v0")));
    } else if (kind.name == "voltage_source" || kind.name == "current_source") {
      auto w = SourceWaveform(kind, s, file, set);
      if (!w) return;
      if (kind.name == "voltage_source")
        c.Add(std::make_unique<VoltageSource>(name, loc, node(ports[0]), node(ports[1]), *w));
      else
        c.Add(std::make_unique<CurrentSource>(name, loc, node(ports[0]), node(ports[1]), *w));
    } else if (kind.name == "switch") {
      ValveParams p{set.number("Ron", 1e-3), set.number("Roff", 1e9), 0.0};
      if (!CheckValveParams(p, set, file)) return;
      c.Add(std::make_unique<Valve>(name, loc, node(ports[0]), node(ports[1]), Valve::Type::kSwitch,
                                    p, set.words["state"] != "open"));
    } else if (kind.name == "diode") {
      ValveParams p = ValveParamsOf(set);
      if (!CheckValveParams(p, set, file)) return;
      c.Add(std::make_unique<Valve>(name, loc, node(ports[0]), node(ports[1]), Valve::Type::kDiode, p));
    } else if (kind.name == "supply") {
      Supply(name, loc, ports, set, s, file);
    } else if (kind.name == "bridge") {
      Bridge(name, loc, set, s, file);
    } else if (kind.name == "thyristor") {
      const std::string& gate = set.words.at("gate");
      const auto open = gate.find('[');
      const std::string firing = gate.substr(0, open);
      const int pulse = open == std::string::npos ? 0 : std::atoi(gate.c_str() + open + 1);
      auto it = firings_.find(firing);
      if (it == firings_.end() || pulse < 1 || pulse > 6) {
        diags_.Error(set.where.at("gate"),
                     it == firings_.end() ? fmt::format("no firing element named '{}' (define it before)", firing)
                                          : fmt::format("gate {} has no pulse train: use {}[1] .. {}[6]", gate, firing, firing));
        return;
      }
      ValveParams p = ValveParamsOf(set);
      if (!CheckValveParams(p, set, file)) return;
      c.Add(std::make_unique<Valve>(name, loc, node(ports[0]), node(ports[1]), Valve::Type::kThyristor, p, false,
                                    GateRef{it->second, pulse}));
    } else if (kind.name == "firing") {
      const bool measured = set.nodes.count("sync") > 0;
      const std::string sync = measured ? std::string() : set.words.at("sync");
      const Device* phase_a = measured ? nullptr : c.FindDevice(sync + ".a");
      if (!measured && (!phase_a || std::string(phase_a->kind_name()) != "source_branch")) {
        diags_.Error(set.where.at("sync"), fmt::format("'{}' is not a supply (define the supply before)", sync));
        return;
      }
      const double lo = set.number("alpha_min"), hi = set.number("alpha_max");
      if (lo > hi) {
        Error(file, s.name->offset, "alpha_min is larger than alpha_max");
        return;
      }
      Firing f;
      f.name = name;
      f.loc = loc;
      f.alpha = std::clamp(set.number("alpha"), lo, hi);
      f.width = set.number("width");
      f.sync = sync;
      f.alpha_min = lo;
      f.alpha_max = hi;
      if (measured) {
        if (design_.study.fundamental <= 0) {
          diags_.Error(set.where.at("sync"), "a phase-locked loop needs the nominal frequency: define a supply first");
          return;
        }
        for (int k = 0; k < 3; ++k) f.pll_nodes[k] = node(set.nodes.at("sync")[k]);
        f.pll_frequency = design_.study.fundamental;
        f.pll_bandwidth = 2 * std::numbers::pi * set.number("pll_bandwidth", 10.0);
      }
      f.gamma = set.number("gamma");
      if (f.gamma > 0 && set.words.count("regulate")) {
        diags_.Error(set.where.at("gamma"), "a firing element regulates a current or the extinction angle, not both");
        return;
      }
      if (set.words.count("regulate")) {
        if (!set.has("target") || (!set.has("kp") && !set.has("ki"))) {
          diags_.Error(set.where.at("regulate"), "a regulating firing needs target and kp or ki");
          return;
        }
        f.regulate = set.words.at("regulate");
        f.target = set.number("target");
        f.kp = set.number("kp");
        f.ki = set.number("ki");
        regulated_.push_back({static_cast<int>(c.firings().size()), set.where.at("regulate")});
      }
      for (std::size_t k = 0; k < c.devices().size(); ++k)
        if (c.devices()[k].get() == phase_a) f.supply_phase_device = static_cast<int>(k);
      if (f.alpha != set.number("alpha"))
        diags_.Warning(set.has("alpha") ? set.where.at("alpha") : loc,
                       fmt::format("alpha limited to {:.4g} deg by alpha_min/alpha_max", f.alpha * 180 / std::numbers::pi));
      firings_[name] = c.AddFiring(f);
    } else if (kind.name == "core") {
      auto& core = static_cast<Core&>(c.Add(std::make_unique<Core>(name, loc, set.number("Lm"), set.number("Rc"), 0.0)));
      cores_[name] = {&core, set.words.count("ref") ? set.words.at("ref") : "", set.has("ref") ? set.where.at("ref") : loc, {}};
    } else if (kind.name == "winding") {
      const std::string& core_name = set.words.at("core");
      auto it = cores_.find(core_name);
      if (it == cores_.end()) {
        diags_.Error(set.where.at("core"), fmt::format("no core named '{}' (define it before its windings)", core_name));
        return;
      }
      auto& w = static_cast<Winding&>(c.Add(std::make_unique<Winding>(
          name, loc, node(ports[0]), node(ports[1]), it->second.core, set.number("turns"), set.number("R"),
          set.number("Lleak"))));
      it->second.windings.push_back(&w);
    } else if (kind.name == "transformer") {
      Transformer(name, loc, set, s, file);
    }
  }

  // A transformer is three single-phase cores, each with an HV and an LV
  // winding, connected as its vector group says (parser/vector_group.h).
  // Per phase (per core), on the HV winding's base Z = V_w1²/(S/3):
  //   R + jX = z·Z with X/R = xr, split equally between the windings
  //   (the LV half referred by (N2/N1)²), the usual assumption when the
  //   test report gives no split;
  //   magnetising reactance X_m = V_w1/(im·I_w1), I_w1 = S/(3·V_w1);
  //   core loss Rc = V_w1²/(p0/3) across the HV winding.
  // Turns are the windings' rated voltages, so the core EMF is near 1 V per
  // turn at rated voltage.
  void Transformer(const std::string& name, const SourceLoc& loc, const Settings& set,
                   const ast::Statement& s, const FilePtr& file) {
    const std::string& group_name = set.words.at("group");
    auto group = ParseVectorGroup(group_name);
    if (!group) {
      diags_.Error(set.where.at("group"), fmt::format("unknown vector group '{}'", group_name),
                   std::string("known groups: ") + KnownVectorGroups());
      return;
    }
    const double f = set.has("f") ? set.number("f") : design_.study.fundamental;
    if (f <= 0) {
      Error(file, s.name->offset, fmt::format("transformer {} needs f: no supply or sinusoidal source precedes it", name));
      return;
    }
    Circuit& c = design_.circuit;
    const double w = 2 * std::numbers::pi * f;
    const double S = set.number("S"), v1 = set.number("V1"), v2 = set.number("V2");
    const double vw1 = group->hv.delta ? v1 : v1 / std::sqrt(3.0);
    const double vw2 = group->lv.delta ? v2 : v2 / std::sqrt(3.0);
    const double zbase = vw1 * vw1 / (S / 3.0);
    const double xr = set.number("xr", 10.0);
    const double r_total = set.number("z") * zbase / std::sqrt(1.0 + xr * xr);
    const double x_total = xr * r_total;
    const double ratio2 = (vw2 / vw1) * (vw2 / vw1);
    const double xm = vw1 / (set.number("im", 0.01) * (S / 3.0) / vw1);
    const double rc = set.number("p0") > 0 ? vw1 * vw1 / (set.number("p0") / 3.0) : kLosslessRcFactor * xm;

    auto node = [&](const ast::Ident& id) { return c.Node(id.name, SourceLoc{file, id.offset}); };
    const auto& hv = set.nodes.at("hv");
    const auto& lv = set.nodes.at("lv");
    int hv_term[3], lv_term[3];
    for (int k = 0; k < 3; ++k) {
      hv_term[k] = node(hv[k]);
      lv_term[k] = node(lv[k]);
    }
    auto star = [&](bool delta, const char* key, const std::string& internal) {
      if (delta) return -1;
      int n = set.nodes.count(key) ? node(set.nodes.at(key)[0]) : c.Node(internal, loc);
      c.MarkStarPoint(n);
      return n;
    };
    if ((set.nodes.count("neutral_hv") && !group->hv.neutral) || (set.nodes.count("neutral_lv") && !group->lv.neutral)) {
      Error(file, s.name->offset, fmt::format("a neutral is given but group {} brings none out", group_name),
            "write N (HV) or n (LV) in the group, e.g. YNd11 or Dyn11");
      return;
    }
    const int hv_star = star(group->hv.delta, "neutral_hv", name + ".hv_star");
    const int lv_star = star(group->lv.delta, "neutral_lv", name + ".lv_star");
    // Ends of the winding of phase k: (dotted, other).
    auto ends = [](const WindingArrangement& a, const int* term, int star_node, int k) {
      const int other = a.delta ? term[(k + a.step + 3) % 3] : star_node;
      return a.reversed ? std::pair{other, term[k]} : std::pair{term[k], other};
    };
    const char* phase[3] = {"a", "b", "c"};
    const char* hv_port[3] = {"A", "B", "C"};
    const double shift = set.number("shift");
    if (shift != 0.0 && group->lv.delta) {
      diags_.Error(set.where.at("shift"), "a phase shift needs a star (y or yn) LV winding",
                   "the shift is made by a zig-zag LV winding; use for example Yy0 or Dyn11");
      return;
    }
    if (std::abs(shift) > std::numbers::pi / 6 + 1e-12) {
      diags_.Error(set.where.at("shift"), "shift must lie within ±30 deg");
      return;
    }
    std::vector<const Winding*> hv_w, lv_w;
    std::vector<Core*> cores;
    for (int k = 0; k < 3; ++k) {
      auto& core = static_cast<Core&>(c.Add(std::make_unique<Core>(
          fmt::format("{}.core_{}", name, phase[k]), loc, xm / w, rc, vw1)));
      cores.push_back(&core);
      auto [h1, h2] = ends(group->hv, hv_term, hv_star, k);
      hv_w.push_back(&static_cast<const Winding&>(c.Add(std::make_unique<Winding>(
          fmt::format("{}.hv_{}", name, phase[k]), loc, h1, h2, &core, vw1, r_total / 2, x_total / 2 / w))));
    }
    for (int k = 0; k < 3; ++k) {
      auto [l1, l2] = ends(group->lv, lv_term, lv_star, k);
      if (shift == 0.0) {
        lv_w.push_back(&static_cast<const Winding&>(c.Add(std::make_unique<Winding>(
            fmt::format("{}.lv_{}", name, phase[k]), loc, l1, l2, cores[k], vw2, r_total / 2 * ratio2,
            x_total / 2 / w * ratio2))));
        continue;
      }
      // Zig-zag: a section of n_a turns on this phase's core in series with
      // n_b turns, reversed, on the next core (a lead) or the previous one
      // (a lag). With E_k+1 = E_k·e^(−j120°), the phase voltage is
      //   E_k·(n_a + n_b·e^(±j60°)) = vw2·e^(±j·shift)  when
      //   n_b = vw2·sin|shift|/sin 60°,  n_a = vw2·cos(shift) − n_b/2.
      // The LV leakage is shared by the sections in proportion to turns.
      const double nb = vw2 * std::sin(std::abs(shift)) / std::sin(std::numbers::pi / 3);
      const double na = vw2 * std::cos(shift) - nb / 2;
      const int other = (k + (shift > 0 ? 1 : 2)) % 3;
      const int mid = c.Node(fmt::format("{}.zz_{}", name, phase[k]), loc);
      const double share_a = na / (na + nb), share_b = nb / (na + nb);
      // Ends as for a plain star winding (l1 dotted), the series node between.
      lv_w.push_back(&static_cast<const Winding&>(c.Add(std::make_unique<Winding>(
          fmt::format("{}.lv_{}", name, phase[k]), loc, l1 == lv_term[k] ? l1 : mid, l1 == lv_term[k] ? mid : l1,
          cores[k], na, r_total / 2 * ratio2 * share_a, x_total / 2 / w * ratio2 * share_a))));
      // The second section is reversed: its dotted end faces away from the terminal.
      const int sa = l1 == lv_term[k] ? l2 : mid, sb = l1 == lv_term[k] ? mid : l2;
      lv_w.push_back(&static_cast<const Winding&>(c.Add(std::make_unique<Winding>(
          fmt::format("{}.lv_{}_zz", name, phase[k]), loc, sa, sb, cores[other], nb,
          r_total / 2 * ratio2 * share_b, x_total / 2 / w * ratio2 * share_b))));
    }
    // Line currents into the terminals: the sum of the winding currents
    // leaving each terminal into a winding.
    auto line_alias = [&](const std::vector<const Winding*>& ws, int terminal, const std::string& alias) {
      DeviceAlias a;
      for (const Winding* wd : ws) {
        if (wd->nodes()[0] == terminal) a.terms.emplace_back(wd, 1.0);
        if (wd->nodes()[1] == terminal) a.terms.emplace_back(wd, -1.0);
      }
      c.AddAlias(alias, a);
    };
    for (int k = 0; k < 3; ++k) {
      line_alias(hv_w, hv_term[k], fmt::format("{}.{}", name, hv_port[k]));
      line_alias(lv_w, lv_term[k], fmt::format("{}.{}", name, phase[k]));
    }
    TransformerGroup info;
    info.name = name;
    info.loc = loc;
    info.vector_group = group_name;
    info.s_rated = S;
    info.v1 = set.number("V1");
    info.v2 = set.number("V2");
    info.z = set.number("z");
    for (int k = 0; k < 3; ++k) {
      info.hv[k] = hv_term[k];
      info.lv[k] = lv_term[k];
    }
    auto index_of = [&](const Winding* wd) {
      for (std::size_t d = 0; d < c.devices().size(); ++d)
        if (c.devices()[d].get() == wd) return static_cast<int>(d);
      return -1;
    };
    for (const Winding* wd : hv_w) info.hv_windings.push_back(index_of(wd));
    for (const Winding* wd : lv_w) info.lv_windings.push_back(index_of(wd));
    c.AddTransformer(std::move(info));
  }

  std::optional<Waveform> SourceWaveform(const KindSpec& kind, const ast::Statement& s,
                                         const FilePtr& file, const Settings& set) {
    Waveform w;
    w.dc = set.number("dc");
    if (set.has("peak") && set.has("rms")) {
      diags_.Error(set.where.at("rms"), "give peak or rms, not both");
      return std::nullopt;
    }
    const bool sine = set.has("peak") || set.has("rms");
    if (sine && !set.has("f")) {
      Error(file, s.name->offset, fmt::format("{} {} needs f with peak or rms", kind.name, s.name->name));
      return std::nullopt;
    }
    if (!sine && set.has("f")) {
      diags_.Error(set.where.at("f"), "f without peak or rms", "give the amplitude with peak = or rms =");
      return std::nullopt;
    }
    if (sine) {
      double peak = set.has("peak") ? set.number("peak") : std::sqrt(2.0) * set.number("rms");
      w.sines.push_back({peak, set.number("f"), set.number("phase")});
      if (design_.study.fundamental == 0.0) design_.study.fundamental = set.number("f");
    }
    return w;
  }

  static ValveParams ValveParamsOf(const Settings& set) {
    return {set.number("Ron", 1e-3), set.number("Roff", 1e9), set.number("Vf"),       set.number("Ih"),
            set.number("tq"),         set.number("Irms_max"),  set.number("Ipk_max"), set.number("I2t_max"),
            set.number("Vrrm")};
  }

  bool CheckValveParams(const ValveParams& p, const Settings& set, const FilePtr& file) {
    if (p.r_off <= p.r_on) {
      SourceLoc at = set.has("Roff") ? set.where.at("Roff") : set.has("Ron") ? set.where.at("Ron") : SourceLoc{file, 0};
      diags_.Error(at, fmt::format("Roff ({} ohm) must be larger than Ron ({} ohm)", p.r_off, p.r_on));
      return false;
    }
    return true;
  }

  // A supply is, per phase, a source branch (models/source_branch.h): the
  // EMF behind the source impedance, from the star point to the terminal:
  //   e_k(t) = √2/√3·Vll·[sin(θ_k) + u·sin(θ'_k) + Σ_n h_n·sin(n·θ_k)],
  //   θ_k = 2πf·t + phase − k·120°,  θ'_k = 2πf·t + phase + k·120°,
  // where u is the negative-sequence unbalance. With Ssc and xr the
  // impedance is Z = Vll²/Ssc split as R = Z/√(1 + xr²), X = xr·R.
  void Supply(const std::string& name, const SourceLoc& loc, const std::vector<ast::Ident>& ports,
              const Settings& set, const ast::Statement& s, const FilePtr& file) {
    const bool by_ssc = set.has("Ssc");
    const bool by_rl = set.has("R") || set.has("L");
    if (by_ssc && by_rl) {
      diags_.Error(set.where.at("Ssc"), "give Ssc (with xr) or R and L, not both");
      return;
    }
    if (!by_ssc && !by_rl) {
      Error(file, s.name->offset, fmt::format("supply {} needs Ssc (with xr) or R and L", name),
            "R = 0 ohm  L = 0 H makes an ideal source");
      return;
    }
    if (set.has("xr") && !by_ssc) {
      diags_.Error(set.where.at("xr"), "xr goes with Ssc");
      return;
    }
    const double vll = set.number("Vll"), f = set.number("f"), phase = set.number("phase");
    const double w = 2.0 * std::numbers::pi * f;
    double r = set.number("R"), l = set.number("L");
    if (by_ssc) {
      const double z = vll * vll / set.number("Ssc");
      const double xr = set.number("xr", 10.0);
      r = z / std::sqrt(1.0 + xr * xr);
      l = xr * r / w;
    }
    int star = 0;
    if (set.nodes.count("neutral")) {
      const auto& id = set.nodes.at("neutral")[0];
      star = design_.circuit.Node(id.name, SourceLoc{file, id.offset});
      design_.circuit.MarkStarPoint(star);
    }
    if (design_.study.fundamental == 0.0) design_.study.fundamental = f;
    const double vph = std::sqrt(2.0 / 3.0) * vll;
    const double u = set.number("unbalance");
    std::vector<std::pair<int, double>> harmonics;
    for (const auto& [key, value] : set.numbers)
      if (int n = HarmonicOrder(key)) harmonics.emplace_back(n, value);

    SupplyGroup group{name, loc, {}, star, {}, vll, f, 0.0};
    const double zs = std::hypot(r, w * l);
    group.ssc = zs > 0 ? vll * vll / zs : 0.0;  // 0: an ideal source
    const char* phases[3] = {"a", "b", "c"};
    for (int k = 0; k < 3; ++k) {
      const double shift = -k * 2.0 * std::numbers::pi / 3.0;
      Waveform e;
      e.sines.push_back({vph, f, phase + shift});
      if (u > 0) e.sines.push_back({u * vph, f, phase - shift});
      for (const auto& [n, h] : harmonics)
        if (h > 0) e.sines.push_back({h * vph, n * f, n * (phase + shift)});
      const std::string ph = phases[k];
      const int terminal = design_.circuit.Node(ports[k].name, SourceLoc{file, ports[k].offset});
      const std::string phase_name = name + '.' + ph;
      auto& branch = design_.circuit.Add(std::make_unique<SourceBranch>(phase_name, loc, star, terminal, e, r, l));
      design_.circuit.AddAlias(phase_name, {{{&branch, 1.0}}});
      group.terminals[k] = terminal;
      group.devices[k] = static_cast<int>(design_.circuit.devices().size()) - 1;
    }
    design_.circuit.AddSupply(std::move(group));
  }

  // Valves in the trade's conduction order: 1 a→p, 2 n→c, 3 b→p, 4 n→a,
  // 5 c→p, 6 n→b (anode → cathode).
  void Bridge(const std::string& name, const SourceLoc& loc, const Settings& set,
              const ast::Statement& s, const FilePtr& file) {
    if (set.has("snubber_R") != set.has("snubber_C")) {
      Error(file, s.name->offset, "give both snubber_R and snubber_C, or neither");
      return;
    }
    ValveParams p = ValveParamsOf(set);
    if (!CheckValveParams(p, set, file)) return;
    Circuit& c = design_.circuit;
    const bool thyristor = set.words.at("valve") == "thyristor";
    int firing = -1;
    if (thyristor) {
      if (!set.words.count("firing")) {
        Error(file, s.name->offset, fmt::format("bridge {} of thyristors needs firing = FIRING", name));
        return;
      }
      auto it = firings_.find(set.words.at("firing"));
      if (it == firings_.end()) {
        diags_.Error(set.where.at("firing"),
                     fmt::format("no firing element named '{}' (define it before the bridge)", set.words.at("firing")));
        return;
      }
      firing = it->second;
      if (c.firings()[firing].group >= 0) {
        diags_.Error(set.where.at("firing"), fmt::format("firing {} already drives a bridge", it->first),
                     "each bridge needs its own firing element, referred to its own voltages");
        return;
      }
      c.firings()[firing].group = static_cast<int>(c.valve_groups().size());
    } else if (set.words.count("firing")) {
      diags_.Error(set.where.at("firing"), "a bridge of diodes has no firing");
      return;
    }
    auto node = [&](const ast::Ident& id) { return c.Node(id.name, SourceLoc{file, id.offset}); };
    const auto& ac = set.nodes.at("ac");
    const auto& dc = set.nodes.at("dc");
    const int a = node(ac[0]), b = node(ac[1]), cc = node(ac[2]), pos = node(dc[0]), neg = node(dc[1]);
    const int anode[6] = {a, neg, b, neg, cc, neg};
    const int cathode[6] = {pos, cc, pos, a, pos, b};
    ValveGroup group{name, {}, loc, {a, b, cc}, {pos, neg}, firing};
    for (int k = 0; k < 6; ++k) {
      const std::string vname = fmt::format("{}[{}]", name, k + 1);
      group.devices.push_back(static_cast<int>(c.devices().size()));
      c.Add(std::make_unique<Valve>(vname, loc, anode[k], cathode[k],
                                    thyristor ? Valve::Type::kThyristor : Valve::Type::kDiode, p, false,
                                    thyristor ? GateRef{firing, k + 1} : GateRef{}));
      if (set.has("snubber_R")) {
        const int mid = c.Node(vname + ".snubber", loc);
        c.Add(std::make_unique<Resistor>(vname + ".snubber_R", loc, anode[k], mid, set.number("snubber_R")));
        c.Add(std::make_unique<Capacitor>(vname + ".snubber_C", loc, mid, cathode[k], set.number("snubber_C"), 0.0));
      }
    }
    c.AddValveGroup(std::move(group));
  }

  // ---- settings -------------------------------------------------------------

  bool ReadSettings(const KindSpec& kind, const ast::Statement& s, const FilePtr& file, Settings* out) {
    bool ok = true;
    for (const auto& setting : s.settings) {
      const std::string& key = setting.key.name;
      SourceLoc key_loc{file, setting.key.offset};
      if (out->where.count(key)) {
        Error(file, setting.key.offset, fmt::format("'{}' is set twice", key));
        diags_.Note(out->where[key], "first set here");
        ok = false;
        continue;
      }
      const KeySpec* spec = FindKey(kind, key);
      KeySpec harmonic;
      if (!spec && kind.harmonic_keys && HarmonicOrder(key)) {
        harmonic.name = key;
        harmonic.dim = dims::kNone;
        harmonic.constraint = Constraint::kNonNegative;
        spec = &harmonic;
      }
      if (!spec) {
        Error(file, setting.key.offset, fmt::format("{} has no key '{}'", kind.name, key),
              "its keys are: " + KeyList(kind));
        ok = false;
        continue;
      }
      out->where[key] = key_loc;
      const bool is_tuple = setting.value.get().type() == typeid(ast::Tuple);
      if (spec->type == KeyType::kNodes) {
        std::vector<ast::Ident> nodes;
        std::size_t at = setting.offset;
        if (is_tuple) {
          const auto& t = boost::get<ast::Tuple>(setting.value);
          nodes = t.items;
          at = t.offset;
        } else {
          const auto& e = boost::get<ast::Expr>(setting.value);
          at = e.offset;
          if (auto id = SingleName(e)) nodes.push_back(*id);
        }
        if (static_cast<int>(nodes.size()) != spec->count) {
          Error(file, at,
                spec->count == 1
                    ? fmt::format("{} needs one node name", key)
                    : fmt::format("{} needs {} nodes in brackets, found {}", key, spec->count,
                                  nodes.empty() ? std::string("something else")
                                                : std::to_string(nodes.size())));
          ok = false;
          continue;
        }
        out->nodes[key] = nodes;
        continue;
      }
      if (is_tuple && spec->count == 3 && spec->type == KeyType::kName) {
        // A name or a node list (`sync = Grid` or `sync = (a, b, c)`).
        const auto& t = boost::get<ast::Tuple>(setting.value);
        if (t.items.size() != 3) {
          Error(file, t.offset, fmt::format("{} needs 3 nodes in brackets, found {}", key, t.items.size()));
          ok = false;
          continue;
        }
        out->nodes[key] = t.items;
        continue;
      }
      if (is_tuple) {
        Error(file, boost::get<ast::Tuple>(setting.value).offset,
              fmt::format("{} takes a value, not a node list", key));
        ok = false;
        continue;
      }
      const auto& expr = boost::get<ast::Expr>(setting.value);
      if (spec->type == KeyType::kName) {
        auto id = SingleName(expr, /*allow_index=*/true);
        if (!id) {
          Error(file, expr.offset, fmt::format("{} needs a name", key));
          ok = false;
          continue;
        }
        out->words[key] = id->name;
        out->where[key] = SourceLoc{file, expr.offset};
        continue;
      }
      if (spec->type == KeyType::kWord) {
        auto id = SingleName(expr);
        std::string words;
        for (auto w : spec->words) words += (words.empty() ? "" : ", ") + std::string(w);
        if (!id || std::find(spec->words.begin(), spec->words.end(), id->name) == spec->words.end()) {
          Error(file, expr.offset, fmt::format("{} must be one of: {}", key, words));
          ok = false;
          continue;
        }
        out->words[key] = id->name;
        continue;
      }
      auto q = EvaluateConstant(expr, file);
      if (!q) {
        ok = false;
        continue;
      }
      if (!q->dim.dimensionless() && !(q->dim == spec->dim)) {
        Error(file, expr.offset,
              fmt::format("{} of {} expects {}, found {}", key, kind.name, DimName(spec->dim),
                          DimName(q->dim)));
        ok = false;
        continue;
      }
      if (!Satisfies(spec->constraint, q->value)) {
        Error(file, expr.offset,
              fmt::format("{} must be {}, found {:g}{}", key, ConstraintText(spec->constraint),
                          q->value, spec->dim.dimensionless() ? "" : " " + UnitLabel(spec->dim)));
        ok = false;
        continue;
      }
      out->numbers[key] = q->value;
    }
    // Defaults and required keys.
    for (const auto& spec : kind.keys) {
      const std::string key(spec.name);
      if (out->where.count(key)) continue;
      if (spec.required) {
        std::size_t at = s.name ? s.name->offset : s.keyword.offset;
        Error(file, at, fmt::format("{} needs {} ({})", kind.name, key,
                                    spec.type == KeyType::kNumber ? DimName(spec.dim) : std::string(spec.doc)));
        ok = false;
      } else if (spec.default_value) {
        out->numbers[key] = *spec.default_value;
      } else if (spec.type == KeyType::kWord) {
        out->words[key] = std::string(spec.default_word);
      }
    }
    return ok;
  }

  // The name an expression consists of, if it is just one: `F`, or with
  // allow_index also `F[3]` (returned as the text "F[3]").
  static std::optional<ast::Ident> SingleName(const ast::Expr& e, bool allow_index = false) {
    if (!e.rest.empty()) return std::nullopt;
    if (e.first.get().type() == typeid(ast::Path)) {
      const auto& p = boost::get<ast::Path>(e.first);
      if (p.parts.size() == 1 && (p.parts[0].index < 0 || allow_index)) {
        ast::Ident id;
        id.offset = p.offset;
        id.name = p.parts[0].name;
        if (p.parts[0].index >= 0) id.name += fmt::format("[{}]", p.parts[0].index);
        return id;
      }
    }
    if (e.first.get().type() == typeid(ast::x3::forward_ast<ast::Expr>))
      return SingleName(boost::get<ast::x3::forward_ast<ast::Expr>>(e.first).get(), allow_index);
    return std::nullopt;
  }

  std::optional<Quantity> EvaluateConstant(const ast::Expr& expr, const FilePtr& file) {
    PathResolver resolve = [&](const ast::Path& p) -> std::optional<Resolved> {
      if (p.parts.size() == 1 && p.parts[0].index < 0) {
        auto it = params_.find(p.parts[0].name);
        if (it != params_.end()) return Resolved{Resolved::Kind::kConstant, it->second, 0, {}};
        Error(file, p.offset, fmt::format("undefined parameter '{}'", p.parts[0].name),
              names_.count(p.parts[0].name) ? "it is an element, not a parameter"
                                            : "define it first with: param NAME = value");
        return std::nullopt;
      }
      Error(file, p.offset, "element quantities can only be used in probe statements");
      return std::nullopt;
    };
    auto program = CompileExpression(expr, file, resolve, diags_);
    if (!program) return std::nullopt;
    auto value = EvaluateProgram(*program, nullptr, file, &diags_);
    if (!value) return std::nullopt;
    return Quantity{*value, program->dim};
  }

  // ---- probes ----------------------------------------------------------------

  void CompileProbe(const PendingProbe& pending) {
    const FilePtr& file = pending.file;
    Probe probe;
    probe.name = pending.setting.key.name;
    probe.loc = SourceLoc{file, pending.setting.key.offset};
    std::map<std::string, int> slot_of;
    const Circuit& c = design_.circuit;
    PathResolver resolve = [&](const ast::Path& p) -> std::optional<Resolved> {
      std::string key;
      for (const auto& part : p.parts) {
        if (!key.empty()) key += '.';
        key += part.name;
        if (part.index >= 0) key += fmt::format("[{}]", part.index);
      }
      LinearForm form;
      Dim dim;
      if (p.parts.size() == 1 && p.parts[0].index < 0) {
        int node = c.FindNode(key);
        if (node > 0) {
          form.AddY(NodeUnknown(node), 1.0);
          dim = dims::kVoltage;
        } else if (node == 0) {
          dim = dims::kVoltage;  // ground: an empty form is 0 V
        } else if (auto it = params_.find(key); it != params_.end()) {
          return Resolved{Resolved::Kind::kConstant, it->second, 0, {}};
        } else {
          Error(file, p.offset, fmt::format("no node or parameter named '{}'", key));
          return std::nullopt;
        }
      } else {
        const auto& last = p.parts.back();
        if (last.index >= 0 || (last.name != "i" && last.name != "v")) {
          Error(file, p.offset, fmt::format("'{}' is not a quantity: probe .i (current) or .v (voltage)",
                                            last.name));
          return std::nullopt;
        }
        const std::string element = key.substr(0, key.size() - last.name.size() - 1);
        if (const DeviceAlias* alias = c.FindAlias(element)) {
          if (last.name != "i") {
            Error(file, p.offset, fmt::format("'{}' has only a current (.i)", element));
            return std::nullopt;
          }
          for (const auto& [device, sign] : alias->terms) {
            LinearForm part;
            device->Signal("i", &part, &dim);
            for (const auto& [k, a] : part.y) form.AddY(k, sign * a);
            for (const auto& [k, a] : part.yp) form.AddYp(k, sign * a);
          }
        } else {
          const Device* device = c.FindDevice(element);
          if (!device) {
            Error(file, p.offset, fmt::format("no element named '{}'", element));
            return std::nullopt;
          }
          if (!device->Signal(last.name, &form, &dim)) {
            Error(file, p.offset,
                  fmt::format("{} {} has no probe-able .{}", device->kind_name(), element, last.name));
            return std::nullopt;
          }
        }
      }
      auto [it, inserted] = slot_of.emplace(key, static_cast<int>(probe.slots.size()));
      if (inserted) {
        if (probe.slots.size() >= 32) {
          Error(file, p.offset, "a probe may use at most 32 quantities");
          return std::nullopt;
        }
        probe.slots.push_back(form);
      }
      Resolved r;
      r.kind = Resolved::Kind::kSignal;
      r.slot = it->second;
      r.dim = dim;
      return r;
    };
    auto program = CompileExpression(boost::get<ast::Expr>(pending.setting.value), file, resolve, diags_);
    if (!program) return;
    probe.program = std::move(*program);
    probe.dim = probe.program.dim;
    design_.study.probes.push_back(std::move(probe));
  }

  // ---- helpers ---------------------------------------------------------------

  bool DeclareName(const std::string& name, const FilePtr& file, std::size_t offset) {
    if (name == "gnd" || name == "pi") {
      Error(file, offset, fmt::format("'{}' is reserved", name));
      return false;
    }
    auto [it, inserted] = names_.emplace(name, SourceLoc{file, offset});
    if (!inserted) {
      Error(file, offset, fmt::format("'{}' is already defined", name));
      diags_.Note(it->second, "first defined here");
      return false;
    }
    return true;
  }

  static std::string Canonical(const std::string& path) {
    std::error_code ec;
    auto p = fs::weakly_canonical(fs::path(path), ec);
    return ec ? path : p.string();
  }

  static bool ReadFile(const std::string& path, std::string* text, std::string* error) {
    std::error_code ec;
    if (fs::is_directory(path, ec)) {
      *error = "it is a folder";
      return false;
    }
    auto size = fs::file_size(path, ec);
    if (ec) {
      *error = ec.message();
      return false;
    }
    if (size > kMaxFileBytes) {
      *error = "larger than 64 MiB";
      return false;
    }
    std::ifstream in(path, std::ios::binary);
    if (!in) {
      *error = "cannot open it";
      return false;
    }
    std::ostringstream buffer;
    buffer << in.rdbuf();
    *text = buffer.str();
    return true;
  }

  void Error(const FilePtr& file, std::size_t offset, std::string message, std::string hint = {}) {
    diags_.Error(SourceLoc{file, offset}, std::move(message), std::move(hint));
  }

  Design& design_;
  Diagnostics& diags_;
  std::map<std::string, Quantity> params_;
  std::map<std::string, SourceLoc> names_;
  std::map<std::string, SourceLoc> probe_names_;
  std::vector<PendingProbe> probes_;
  std::vector<PccSpec> pending_pccs_;  // resolved once every supply is known
  const Overrides* overrides_ = nullptr;
  std::map<std::string, const KindSpec*> element_kinds_;
  // Case and sweep targets, checked once every element is known.
  struct PendingTarget {
    std::string target;
    SourceLoc loc;
    Quantity value;
    bool has_value = false;
    TimedActionSpec::Verb verb = TimedActionSpec::Verb::kSet;
    double t = 0.0;
    bool timed = false;
  };
  std::vector<PendingTarget> pending_targets_;
  std::vector<std::string> include_stack_;

  struct CoreUse {
    Core* core = nullptr;
    std::string ref;  // reference winding's name, empty: the first
    SourceLoc ref_loc;
    std::vector<Winding*> windings;
  };
  std::map<std::string, CoreUse> cores_;
  std::map<std::string, int> firings_;  // firing name → index in Circuit::firings()
  std::vector<std::pair<int, SourceLoc>> regulated_;  // firings that regulate a probe
};

}  // namespace

std::unique_ptr<Design> ElaborateFile(const std::string& path, Diagnostics& diags, const Overrides* overrides) {
  auto design = std::make_unique<Design>();
  Elaborator e(*design, diags, overrides);
  e.RunFile(path);
  if (!diags.has_errors()) e.Finish();
  if (diags.has_errors()) return nullptr;
  return design;
}

std::unique_ptr<Design> ElaborateText(const std::string& name, std::string text, Diagnostics& diags,
                                      const Overrides* overrides) {
  auto design = std::make_unique<Design>();
  Elaborator e(*design, diags, overrides);
  e.RunText(std::make_shared<SourceFile>(name, std::move(text)));
  if (!diags.has_errors()) e.Finish();
  if (diags.has_errors()) return nullptr;
  return design;
}

}  // namespace lcc
