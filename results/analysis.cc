#include "results/analysis.h"

#include <Eigen/Core>
#include <chrono>
#include <cmath>
#include <complex>
#include <numbers>
#include <optional>
#include <span>

#include "results/closed_forms.h"
#include "results/commutation.h"
#include "results/harmonics.h"
#include "models/valve.h"
#include <fmt/format.h>

namespace lcc {
namespace {

constexpr double kDeg = 180.0 / std::numbers::pi;
constexpr int kMaxOrder = 50;

// Statistics of a window column. Eigen's reductions are vectorised
// whatever the optimisation level; a report takes them over some eighty
// channels of two thousand samples.
WindowStats StatsOfColumn(std::span<const double> x) {
  WindowStats s;
  if (x.empty()) return s;
  const Eigen::Map<const Eigen::ArrayXd> a(x.data(), static_cast<Eigen::Index>(x.size()));
  s.samples = static_cast<int>(x.size());
  s.min = a.minCoeff();
  s.max = a.maxCoeff();
  s.mean = a.sum() / s.samples;
  s.rms = std::sqrt(a.square().sum() / s.samples);
  return s;
}

// Σ x·y over two window columns (vectorised).
double Dot(std::span<const double> x, std::span<const double> y) {
  const Eigen::Map<const Eigen::VectorXd> a(x.data(), static_cast<Eigen::Index>(x.size()));
  const Eigen::Map<const Eigen::VectorXd> b(y.data(), static_cast<Eigen::Index>(y.size()));
  return a.dot(b);
}

RunFigures RunFiguresOf(const RunSummary& s) {
  RunFigures r;
  r.status = s.status == RunSummary::Status::kCompleted ? "completed"
             : s.status == RunSummary::Status::kFailed  ? "failed"
                                                         : "not run";
  r.message = s.message;
  r.steady_requested = s.steady_requested;
  r.steady_reached = s.steady_reached;
  r.steady_time_s = s.steady_time;
  r.t_reached_s = s.t_reached;
  r.period_s = s.period;
  r.steps = s.steps;
  r.events = s.events;
  r.switchings = s.switchings;
  r.samples = s.samples;
  r.wall_s = s.wall_seconds;
  r.statistics = s.FullReport(/*with_wall=*/false);
  return r;
}

// Everything computed from the channel window.
class WindowAnalysis {
 public:
  WindowAnalysis(const AnalysisInput& in, CaseAnalysis* out) : in_(in), out_(*out) {
    const RunSummary& s = in.run->summary;
    period_ = s.period;
    omega_ = period_ > 0 ? 2.0 * std::numbers::pi / period_ : 0.0;
    window_ = in.recorder->Extract(s.window_begin, s.window_end);
    const int n = static_cast<int>(window_.t.size());
    cycles_ = out_.window_cycles;
    spectra_ok_ = cycles_ >= 1 && n >= 2 * cycles_ && n % cycles_ == 0;
    dt_ = n >= 2 ? window_.t[1] - window_.t[0] : 0.0;
  }

  void Run() {
    const auto& ch = in_.recorder->channels();
    if (window_.t.empty()) return;
    for (const auto& b : ch.bridges) out_.bridges.push_back(Bridge(b));
    for (const auto& p : ch.ac_points) out_.ac_points.push_back(AcPoint(p));
    for (const auto& pcc : in_.study->pccs) Pcc(pcc);
  }

 private:
  std::span<const double> Col(int c) const { return window_.columns[c]; }
  // Statistics of a channel, computed once.
  const WindowStats& ChannelStats(int c) {
    if (stats_.empty()) stats_.resize(window_.columns.size());
    if (!stats_[c]) stats_[c] = StatsOfColumn(Col(c));
    return *stats_[c];
  }

  // The fundamental phasor (peak) of a channel: one DFT bin, cheaper than a
  // whole spectrum where only P1 and Q1 need it.
  std::complex<double> Fundamental(int c) {
    const auto x = Col(c);
    const std::size_t n = x.size();
    if (cos_table_.size() != n) {
      cos_table_.resize(n);
      sin_table_.resize(n);
      for (std::size_t m = 0; m < n; ++m) {
        const double angle = 2.0 * std::numbers::pi * cycles_ * static_cast<double>(m) / n;
        cos_table_[m] = 2.0 / n * std::cos(angle);
        sin_table_[m] = -2.0 / n * std::sin(angle);
      }
    }
    return {Dot(x, cos_table_), Dot(x, sin_table_)};
  }

  // The spectrum of a channel, computed once.
  const Spectrum& SpectrumOf(int c) {
    if (spectra_.empty()) spectra_.resize(window_.columns.size());
    if (!spectra_[c]) spectra_[c] = AnalyseHarmonics(Col(c).data(), static_cast<int>(Col(c).size()), cycles_, kMaxOrder);
    return *spectra_[c];
  }

  double ValveOnTime(int device) const {
    const double b = in_.run->summary.window_begin, e = in_.run->summary.window_end;
    bool on = false;
    double since = b, total = 0.0;
    for (const auto& ev : in_.run->events) {
      if (ev.device != device) continue;
      if (ev.t < b) {
        on = ev.on;
        continue;
      }
      if (ev.t >= e) break;
      if (on && !ev.on) total += ev.t - since;
      if (!on && ev.on) since = ev.t;
      on = ev.on;
    }
    if (on) total += e - std::max(since, b);
    return total;
  }

  // The delay angle in effect over the window, for the closed forms: the
  // mean delay of the gate turn-ons in the window after their valves'
  // natural instants. A regulator moves alpha pulse by pulse, so its last
  // value alone can be a few tenths of a degree off the window's. The final
  // alpha where nothing was fired in the window, or under a PLL (whose
  // frame moves); 0 for diodes.
  double WindowDelay(const ValveGroup& g) const {
    const auto& alphas = in_.run->final_alpha;
    if (g.firing < 0 || g.firing >= static_cast<int>(alphas.size())) return 0.0;
    const double last = alphas[g.firing];
    const auto& refs = in_.run->firing_reference;
    if (period_ <= 0 || g.firing >= static_cast<int>(refs.size()) || in_.circuit->firings()[g.firing].measured_sync())
      return last;
    const double b = in_.run->summary.window_begin, e = in_.run->summary.window_end;
    double sum = 0.0;
    int count = 0;
    for (const auto& ev : in_.run->events) {
      if (ev.t < b || ev.t >= e || !ev.on || ev.cause != SwitchEvent::Cause::kGate) continue;
      const auto v = std::find(g.devices.begin(), g.devices.end(), ev.device) - g.devices.begin();
      if (v >= static_cast<long>(g.devices.size())) continue;
      // Valve v + 1's natural instant is (v/6) of a period after valve 1's;
      // the delay is taken nearest the last alpha, so no wrap can bite.
      const double delay = omega_ * (ev.t - refs[g.firing] - static_cast<double>(v) * period_ / 6.0);
      sum += last + std::remainder(delay - last, 2 * std::numbers::pi);
      ++count;
    }
    return count > 0 ? sum / count : last;
  }

  BridgeFigures Bridge(const BridgeChannels& bc) {
    const Circuit& c = *in_.circuit;
    const ValveGroup& g = c.valve_groups()[bc.group];
    BridgeFigures f;
    f.name = g.name;
    f.valve = g.firing >= 0 ? "thyristor" : "diode";
    const WindowStats vd = ChannelStats(bc.vd), id = ChannelStats(bc.id);
    f.vd = StatsOf(vd, "V");
    f.id = StatsOf(id, "A");
    f.pd_W = Dot(Col(bc.vd), Col(bc.id)) / static_cast<double>(Col(bc.vd).size());
    if (spectra_ok_) {
      const Spectrum& s = SpectrumOf(bc.vd);
      for (int h = 1; h <= s.max_order(); ++h)
        if (s.rms(h) > f.ripple_order_rms_V) {
          f.ripple_order_rms_V = s.rms(h);
          f.ripple_order = h;
        }
    }
    const double alpha = WindowDelay(g);
    f.alpha_deg = alpha * kDeg;

    const double frequency = period_ > 0 ? 1.0 / period_ : 0.0;
    if (commutating_.empty()) commutating_ = FindCommutatingCircuits(c, frequency);
    const CommutatingCircuit& cc = commutating_[bc.group];
    if (cc.valid) {
      f.vll_V = cc.vll;
      f.ls_H = cc.ls;
      f.rs_ohm = cc.rs;
      f.vdo_V = IdealNoLoadVoltage(cc.vll);
      f.vd_closed_form_V = ClosedFormVd(cc.vll, alpha, omega_, cc.ls, id.mean);
      if (f.vd_closed_form_V != 0.0)
        f.vd_difference_pct = 100.0 * (vd.mean - f.vd_closed_form_V) / std::abs(f.vd_closed_form_V);
      const double mu = ClosedFormOverlap(cc.vll, alpha, omega_, cc.ls, id.mean);
      f.overlap_closed_form_deg = mu >= 0 ? mu * kDeg : -1.0;
    }

    const RunSummary& s = in_.run->summary;
    const auto commutations = period_ > 0 ? BridgeCommutations(g, in_.run->events, frequency, s.window_begin,
                                                                s.window_end)
                                          : std::vector<Commutation>{};
    if (!commutations.empty()) {
      double sum = 0;
      for (const auto& cm : commutations) sum += cm.overlap;
      f.overlap_deg = sum / commutations.size() * kDeg;
    }
    const double blocking_current = 1e-3 * std::max(id.max, 1e-9);
    for (int k = 0; k < 6; ++k) {
      const int dev = g.devices[k];
      const auto i = Col(bc.valve_i[k]);
      const auto v = Col(bc.valve_v[k]);
      ValveFigures vf;
      vf.name = c.devices()[dev]->name();
      const WindowStats& is = ChannelStats(bc.valve_i[k]);
      vf.i_mean_A = is.mean;
      vf.i_rms_A = is.rms;
      vf.i_peak_A = is.max;
      double v_fwd = 0.0, rise = 0.0;
      for (std::size_t m = 0; m < v.size(); ++m) {
        if (std::abs(i[m]) < blocking_current) v_fwd = std::max(v_fwd, v[m]);
        if (m + 1 < i.size()) rise = std::max(rise, i[m + 1] - i[m]);
      }
      vf.v_reverse_peak_V = -std::min(ChannelStats(bc.valve_v[k]).min, 0.0);
      vf.v_forward_peak_V = v_fwd;
      vf.i2t_A2s = is.rms * is.rms * is.samples * dt_;
      vf.didt_max_A_per_s = dt_ > 0 ? rise / dt_ : 0.0;
      if (period_ > 0 && cycles_ > 0) vf.conduction_deg = ValveOnTime(dev) / (cycles_ * period_) * 360.0;
      double sum = 0;
      int n = 0;
      for (const auto& cm : commutations)
        if (cm.incoming == k + 1) {
          sum += cm.overlap;
          ++n;
        }
      if (n) vf.overlap_deg = sum / n * kDeg;
      // The extinction angle is an inverter's margin (α > 90°); a rectifier's
      // valves see forward voltage again long after they turn off.
      for (const auto& fv : in_.run->forward_voltage)
        if (alpha > std::numbers::pi / 2 && fv.device == dev && fv.t >= s.window_begin && fv.t < s.window_end) {
          const double gamma = omega_ * (fv.t - fv.t_off) * kDeg;
          vf.extinction_min_deg = vf.extinction_min_deg < 0 ? gamma : std::min(vf.extinction_min_deg, gamma);
        }
      f.valves.push_back(vf);
    }
    return f;
  }

  AcPointFigures AcPoint(const AcPointChannels& pc) {
    AcPointFigures f;
    f.name = pc.name;
    f.kind = pc.kind == AcPointChannels::Kind::kSupply          ? "supply"
             : pc.kind == AcPointChannels::Kind::kTransformerHv ? "transformer HV"
                                                                 : "transformer LV";
    double p = 0.0, s_va = 0.0;
    const std::size_t n = Col(pc.v[0]).size();
    for (int k = 0; k < 3; ++k) {
      const WindowStats &v = ChannelStats(pc.v[k]), &i = ChannelStats(pc.i[k]);
      f.v_rms_V[k] = v.rms;
      f.i_rms_A[k] = i.rms;
      s_va += v.rms * i.rms;
      p += Dot(Col(pc.v[k]), Col(pc.i[k]));
    }
    f.p_W = p / n;
    f.s_VA = s_va;
    f.power_factor = s_va > 0 ? f.p_W / s_va : 0.0;
    for (std::size_t w = 0; w < pc.winding_v.size(); ++w)
      f.winding_VA += ChannelStats(pc.winding_v[w]).rms * ChannelStats(pc.winding_i[w]).rms;
    if (spectra_ok_) {
      double p1 = 0.0, q1 = 0.0;
      for (int k = 0; k < 3; ++k) {
        if (k != 0) {  // phases b and c: the fundamental is all P1 and Q1 need
          const std::complex<double> s1 = Fundamental(pc.v[k]) * std::conj(Fundamental(pc.i[k])) / 2.0;
          p1 += s1.real();
          q1 += s1.imag();
          continue;
        }
        const Spectrum &sv = SpectrumOf(pc.v[k]), &si = SpectrumOf(pc.i[k]);
        const std::complex<double> s1 = sv.phasor[1] * std::conj(si.phasor[1]) / 2.0;
        p1 += s1.real();
        q1 += s1.imag();
        f.i1_A = si.rms(1);
        for (int h = 1; h <= si.max_order(); ++h)
          f.current_harmonics.push_back({h, si.rms(h), f.i1_A > 0 ? 100.0 * si.rms(h) / f.i1_A : 0.0,
                                         std::arg(si.phasor[h]) * kDeg});
        f.thd_pct = 100.0 * si.Thd();
        f.thd_all_orders_pct = 100.0 * si.ThdAllOrders();
        f.voltage_thd_pct = 100.0 * sv.Thd();
        f.il_A = f.i1_A;
        for (const auto& pcc : in_.study->pccs)
          if (pc.kind == AcPointChannels::Kind::kSupply && pcc.supply_index == pc.owner && pcc.il > 0) f.il_A = pcc.il;
        f.tdd_pct = 100.0 * si.Tdd(f.il_A);
      }
      f.q1_var = q1;
      const double s1 = std::hypot(p1, q1);
      f.displacement_factor = s1 > 0 ? p1 / s1 : 0.0;
    }
    // Utilisation: the DC power of the bridge this transformer feeds over
    // the side's winding VA (check values §1.17: 3/π for a six-pulse bridge).
    if (pc.kind != AcPointChannels::Kind::kSupply && f.winding_VA > 0) {
      int bridge = -1;
      for (const auto& other : in_.recorder->channels().ac_points)
        if (other.owner == pc.owner && other.kind == AcPointChannels::Kind::kTransformerLv) bridge = other.bridge;
      double pd = f.p_W;
      for (std::size_t b = 0; b < out_.bridges.size(); ++b)
        if (bridge >= 0 && in_.recorder->channels().bridges[b].group == bridge) pd = out_.bridges[b].pd_W;
      f.utilisation = pd / f.winding_VA;
    }
    return f;
  }

  void Pcc(const PccSpec& pcc) {
    if (!spectra_ok_) return;
    const auto& ch = in_.recorder->channels();
    const SupplyGroup& supply = in_.circuit->supplies()[pcc.supply_index];
    for (const auto& pc : ch.ac_points) {
      if (pc.kind != AcPointChannels::Kind::kSupply || pc.owner != pcc.supply_index) continue;
      std::vector<double> worst_i(kMaxOrder + 1, 0.0), worst_v(kMaxOrder + 1, 0.0);
      double i1 = 0.0;
      for (int k = 0; k < 3; ++k) {
        const Spectrum &si = SpectrumOf(pc.i[k]), &sv = SpectrumOf(pc.v[k]);
        i1 = std::max(i1, si.rms(1));
        for (int h = 0; h <= std::min(kMaxOrder, si.max_order()); ++h) {
          worst_i[h] = std::max(worst_i[h], si.rms(h));
          worst_v[h] = std::max(worst_v[h], sv.rms(h));
        }
      }
      const double isc = supply.ssc > 0 ? supply.ssc / (std::sqrt(3.0) * supply.vll) : 0.0;
      const double il = pcc.il > 0 ? pcc.il : i1;
      out_.ieee519.push_back(CheckIeee519(supply.name, supply.vll, isc, il, pcc.il <= 0, pcc.pulses, worst_i, worst_v));
    }
  }

  const AnalysisInput& in_;
  CaseAnalysis& out_;
  CaseRecorder::Window window_;
  double period_ = 0, omega_ = 0, dt_ = 0;
  int cycles_ = 0;
  bool spectra_ok_ = false;
  std::vector<CommutatingCircuit> commutating_;
  std::vector<std::optional<WindowStats>> stats_;
  std::vector<std::optional<Spectrum>> spectra_;
  std::vector<double> cos_table_, sin_table_;  // e^(−j·2π·cycles·m/n)·2/n
};

// Fault figures from the recorder's accumulators, and the valve ratings.
void FaultAndRatings(const AnalysisInput& in, CaseAnalysis* a) {
  const auto& ch = in.recorder->channels();
  const auto& ex = in.recorder->extremes();
  const Circuit& c = *in.circuit;
  const double fault = in.recorder->fault_time();
  FaultFigures& f = a->fault;
  f.fault_time_s = fault;
  for (const auto& [t, text] : in.run->actions) f.actions.push_back(fmt::format("{:.6g} s: {}", t, text));
  auto zero = [&](int channel) { return ex[channel].first_zero_after_fault >= 0 ? ex[channel].first_zero_after_fault - fault : -1.0; };
  if (fault >= 0 && !ex.empty()) {
    for (const auto& b : ch.bridges) {
      const ValveGroup& g = c.valve_groups()[b.group];
      for (int k = 0; k < 6; ++k)
        f.valves.push_back({c.devices()[g.devices[k]]->name(), ex[b.valve_i[k]].peak_after_fault,
                            ex[b.valve_i[k]].square_integral_after_fault});
      f.dc_currents.push_back({g.name + " Id", zero(b.id)});
    }
    for (const auto& p : ch.ac_points) {
      for (int w : p.winding_i) f.windings.push_back({ch.channels[w].name, ex[w].peak_after_fault, 0.0});
      if (p.kind == AcPointChannels::Kind::kSupply)
        for (int k = 0; k < 3; ++k) f.line_currents.push_back({ch.channels[p.i[k]].name, zero(p.i[k])});
    }
  }
  // Ratings of bridge valves.
  for (std::size_t bi = 0; bi < ch.bridges.size() && bi < a->bridges.size(); ++bi) {
    const auto& b = ch.bridges[bi];
    const ValveGroup& g = c.valve_groups()[b.group];
    for (int k = 0; k < 6; ++k) {
      const Device& d = *c.devices()[g.devices[k]];
      const ValveParams& p = static_cast<const Valve&>(d).params();
      const ValveFigures& vf = a->bridges[bi].valves[k];
      if (ex.empty()) break;
      const auto& ei = ex[b.valve_i[k]];
      const auto& ev = ex[b.valve_v[k]];
      auto check = [&](const char* rating, double value, double limit, const char* unit) {
        if (limit > 0) a->ratings.push_back({d.name(), rating, value, limit, unit, value > limit});
      };
      check("Irms_max", vf.i_rms_A, p.irms_max, "A");
      check("Ipk_max", std::max(std::abs(ei.min), std::abs(ei.max)), p.ipk_max, "A");
      check("I2t_max", fault >= 0 ? ei.square_integral_after_fault : vf.i2t_A2s, p.i2t_max, "A2s");
      check("Vrrm", -std::min(ev.min, 0.0), p.vrrm, "V");
    }
  }
}

}  // namespace

Stats StatsOf(const WindowStats& w, std::string unit) {
  return {std::move(unit), w.mean,      w.rms,        w.peak(),         w.min,
          w.max,           w.ripple_pp(), w.ripple_rms(), w.ripple_factor(), w.form_factor()};
}

namespace {

// The probes' figures over the window, and each firing element's final
// delay angle and, for a regulator, its mean and settling time: one pass
// over the recorded rows (which may come back from the spool, see
// results/recorder.h).
void ProbeAndFiringFigures(const AnalysisInput& in, CaseAnalysis* a) {
  const ProbeRecorder& rec = in.recorder->probes();
  const RunSummary& s = in.run->summary;
  const std::size_t n = rec.probes().size();
  const auto& firings = in.circuit->firings();
  std::vector<WindowAccumulator> window(n);
  std::vector<SettlingTracker> settling;
  std::vector<int> regulated;  // probe index per firing, -1: none
  const auto per_period =
      s.period > 0 && s.sample_used > 0 ? static_cast<std::size_t>(std::llround(s.period / s.sample_used)) : 0;
  for (const Firing& fr : firings) {
    const bool tracked = fr.regulate_probe >= 0 && static_cast<std::size_t>(fr.regulate_probe) < n;
    regulated.push_back(tracked ? fr.regulate_probe : -1);
    settling.emplace_back(fr.target, 0.01, tracked ? per_period : 0);
  }
  rec.ForEachRow([&](const double* row) {
    if (InWindow(row[0], s.window_begin, s.window_end, s.sample_used))
      for (std::size_t k = 0; k < n; ++k) window[k].Add(row[k + 1]);
    for (std::size_t f = 0; f < regulated.size(); ++f)
      if (regulated[f] >= 0) settling[f].Add(row[0], row[regulated[f] + 1]);
  });
  for (std::size_t k = 0; k < n; ++k)
    a->probes.push_back({rec.probes()[k].name, StatsOf(window[k].Result(), rec.probes()[k].unit())});
  for (std::size_t f = 0; f < firings.size(); ++f) {
    FiringFigures ff;
    ff.name = firings[f].name;
    ff.alpha_end_deg = (f < in.run->final_alpha.size() ? in.run->final_alpha[f] : firings[f].alpha) * kDeg;
    if (regulated[f] >= 0) {
      ff.regulates = firings[f].regulate;
      ff.target_A = firings[f].target;
      ff.mean_A = window[regulated[f]].Result().mean;
      ff.error_pct = ff.target_A != 0 ? 100.0 * (ff.mean_A - ff.target_A) / ff.target_A : 0.0;
      ff.settling_skipped = s.shooting_converged;
      ff.settling_s = s.period > 0 && !ff.settling_skipped ? settling[f].Result() : -1.0;
    }
    a->firings.push_back(ff);
  }
}

}  // namespace

CaseAnalysis Analyse(const AnalysisInput& in) {
  const auto start = std::chrono::steady_clock::now();
  CaseAnalysis a;
  a.case_name = in.case_name;
  a.netlist = in.netlist;
  a.case_index = in.case_index;
  a.folder = in.folder;
  a.notes = in.notes;
  const RunSummary& s = in.run->summary;
  a.run = RunFiguresOf(s);
  a.window_begin_s = s.window_begin;
  a.window_end_s = s.window_end;
  a.frequency_Hz = s.period > 0 ? 1.0 / s.period : 0.0;
  a.window_cycles = s.period > 0 ? static_cast<int>(std::floor((s.window_end - s.window_begin) / s.period + 1e-6)) : 0;

  WindowAnalysis(in, &a).Run();
  ProbeAndFiringFigures(in, &a);
  FaultAndRatings(in, &a);
  a.analysis_wall_s = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  return a;
}

}  // namespace lcc
