#include "results/report.h"

#include <fmt/format.h>

#include <cmath>

namespace lcc {
namespace {

std::string Opt(double v, const char* fmtspec = "{:.3f}") {
  return v < 0 ? std::string("-") : fmt::format(fmt::runtime(fmtspec), v);
}

void Probes(const CaseAnalysis& a, std::string& out) {
  if (a.probes.empty()) return;
  out += fmt::format("Probes over {:.6g} s .. {:.6g} s", a.window_begin_s, a.window_end_s);
  if (a.window_cycles > 0) out += fmt::format(" ({} cycles)", a.window_cycles);
  out += "\n";
  out += fmt::format("  {:<14} {:>5} {:>12} {:>12} {:>12} {:>12} {:>12} {:>12} {:>9} {:>9}\n", "probe", "unit",
                     "mean", "rms", "peak", "min", "max", "ripple p-p", "ripple f", "form f");
  for (const auto& p : a.probes) {
    const Stats& s = p.stats;
    // Ripple and form factors are DC figures: shown where the mean is more
    // than a thousandth of the rms.
    const bool dc = std::abs(s.mean) > 1e-3 * s.rms;
    out += fmt::format("  {:<14} {:>5} {:>12.6g} {:>12.6g} {:>12.6g} {:>12.6g} {:>12.6g} {:>12.6g} {:>9} {:>9}\n",
                       p.name, s.unit, s.mean, s.rms, s.peak, s.min, s.max, s.ripple_pp,
                       dc ? fmt::format("{:.5f}", s.ripple_factor) : "-", dc ? fmt::format("{:.5f}", s.form_factor) : "-");
  }
  out += "\n";
}

void Bridges(const CaseAnalysis& a, std::string& out) {
  for (const auto& b : a.bridges) {
    out += fmt::format("Bridge {} ({}s)\n", b.name, b.valve);
    out += fmt::format("  Vd {:.6g} V   Id {:.6g} A   Pd {:.6g} W\n", b.vd.mean, b.id.mean, b.pd_W);
    out += fmt::format("  Vd ripple {:.6g} V p-p ({:.3f} % of Vd), {:.6g} V rms; largest component: order {} "
                       "({:.6g} V rms)\n",
                       b.vd.ripple_pp, b.vd.mean != 0 ? 100.0 * b.vd.ripple_pp / std::abs(b.vd.mean) : 0.0,
                       b.vd.ripple_rms, b.ripple_order, b.ripple_order_rms_V);
    out += fmt::format("  Id ripple {:.6g} A p-p\n", b.id.ripple_pp);
    if (b.vll_V > 0) {
      out += fmt::format("  At the AC terminals: VLL {:.6g} V (open circuit), Ls {:.6g} H and Rs {:.6g} ohm per "
                         "phase (supply and transformers), alpha {:.3f} deg\n",
                         b.vll_V, b.ls_H, b.rs_ohm, b.alpha_deg);
      out += "                          simulated   closed form   difference\n";
      out += fmt::format("  Vdo                                  {:>12.6g} V\n", b.vdo_V);
      out += fmt::format("  Vd                     {:>12.6g} {:>12.6g} V  {:>+8.3f} %\n", b.vd.mean, b.vd_closed_form_V,
                         b.vd_difference_pct);
      const bool both = b.overlap_deg >= 0 && b.overlap_closed_form_deg >= 0;
      out += fmt::format("  overlap                {:>12} {:>12} deg {:>8}\n", Opt(b.overlap_deg),
                         Opt(b.overlap_closed_form_deg),
                         both ? fmt::format("{:+.3f}", b.overlap_deg - b.overlap_closed_form_deg) : "-");
      out += "  (closed forms: Vd = Vdo cos(alpha) - 3 w Ls Id / pi, cos(alpha + mu) = cos(alpha) - 2 w Ls Id /\n"
             "   (sqrt(2) VLL); they assume constant Id, a stiff sinusoidal EMF, no resistance, mu < 60 deg)\n";
    }
    out += fmt::format("  {:<10} {:>10} {:>10} {:>10} {:>11} {:>11} {:>9} {:>9} {:>9} {:>10} {:>12}\n", "valve",
                       "I mean A", "I rms A", "I peak A", "V rev pk V", "V fwd pk V", "cond deg", "ovl deg",
                       "gamma deg", "di/dt A/us", "I2t A2s");
    for (const auto& v : b.valves)
      out += fmt::format("  {:<10} {:>10.5g} {:>10.5g} {:>10.5g} {:>11.5g} {:>11.5g} {:>9.2f} {:>9} {:>9} {:>10.4g} "
                         "{:>12.5g}\n",
                         v.name, v.i_mean_A, v.i_rms_A, v.i_peak_A, v.v_reverse_peak_V, v.v_forward_peak_V,
                         v.conduction_deg, Opt(v.overlap_deg, "{:.2f}"), Opt(v.extinction_min_deg, "{:.2f}"),
                         v.didt_max_A_per_s * 1e-6, v.i2t_A2s);
    out += "\n";
  }
}

void AcPoints(const CaseAnalysis& a, std::string& out) {
  for (const auto& p : a.ac_points) {
    out += fmt::format("AC side: {} ({})\n", p.name, p.kind);
    out += fmt::format("  phase voltage rms  {:.6g} / {:.6g} / {:.6g} V\n", p.v_rms_V[0], p.v_rms_V[1], p.v_rms_V[2]);
    out += fmt::format("  line current rms   {:.6g} / {:.6g} / {:.6g} A\n", p.i_rms_A[0], p.i_rms_A[1], p.i_rms_A[2]);
    out += fmt::format("  P {:.6g} W   Q1 {:.6g} var   S {:.6g} VA   displacement factor {:.5f}   power factor "
                       "{:.5f}\n",
                       p.p_W, p.q1_var, p.s_VA, p.displacement_factor, p.power_factor);
    if (p.winding_VA > 0)
      out += fmt::format("  winding VA {:.6g}   utilisation factor {:.5f}\n", p.winding_VA, p.utilisation);
    if (!p.current_harmonics.empty()) {
      out += fmt::format("  phase a: I1 {:.6g} A   THD {:.3f} % (h <= 50), {:.3f} % (all orders)   TDD {:.3f} % of "
                         "IL {:.6g} A   voltage THD {:.3f} %\n",
                         p.i1_A, p.thd_pct, p.thd_all_orders_pct, p.tdd_pct, p.il_A, p.voltage_thd_pct);
      out += "  harmonics of the phase-a current above 0.1 % of I1:\n";
      out += fmt::format("    {:>4} {:>12} {:>9} {:>9}\n", "h", "rms A", "% of I1", "angle");
      for (const auto& h : p.current_harmonics)
        if (h.h == 1 || h.percent >= 0.1)
          out += fmt::format("    {:>4} {:>12.6g} {:>9.3f} {:>9.2f}\n", h.h, h.rms, h.percent, h.angle_deg);
    }
    out += "\n";
  }
}

void Ieee519(const CaseAnalysis& a, std::string& out) {
  for (const auto& c : a.ieee519) {
    out += fmt::format("IEEE Std 519-2014 check at {}: {}\n", c.pcc, c.pass ? "PASS" : "FAIL");
    out += fmt::format("  VLL {:.6g} V, Isc {} A, IL {:.6g} A{}, Isc/IL {} -> Table {}\n", c.vll_V,
                       c.isc_A > 0 ? fmt::format("{:.6g}", c.isc_A) : "infinite (ideal source)", c.il_A,
                       c.il_from_case ? " (this case's fundamental; give pcc IL = ... for the maximum demand)" : "",
                       c.isc_over_il >= 0 ? fmt::format("{:.4g}", c.isc_over_il) : "infinite", c.table);
    if (c.pulses > 6)
      out += fmt::format("  pulse number {}: the allowance sqrt(p/6) = {:.3f} on characteristic orders {} (section "
                         "5.5)\n",
                         c.pulses, c.allowance, c.allowance_applied ? "is applied" : "is NOT applied: a "
                                                                                    "non-characteristic harmonic "
                                                                                    "exceeds 25 % of its limit");
    out += fmt::format("  {:<26} {:>10} {:>10}  {}\n", "item", "value %", "limit %", "result");
    for (const auto& r : c.rows) {
      // Harmonics are listed when they carry something or fail.
      if (r.h > 0 && r.item[0] == 'h' && r.value_percent < 0.05 && r.pass) continue;
      std::string item = r.item;
      if (r.item == "voltage, largest harmonic") item = fmt::format("voltage h{}", r.h);
      out += fmt::format("  {:<26} {:>10.3f} {:>10.3f}  {}\n", item, r.value_percent, r.limit_percent,
                         r.pass ? "pass" : "FAIL");
    }
    out += "  (current limits in % of IL, voltage limits in % of the nominal phase voltage; harmonics below\n"
           "   0.05 % that pass are not listed)\n\n";
  }
}

void Fault(const CaseAnalysis& a, std::string& out) {
  const FaultFigures& f = a.fault;
  if (!f.actions.empty()) {
    out += "Case actions\n";
    for (const auto& line : f.actions) out += "  " + line + "\n";
    out += "\n";
  }
  if (f.fault_time_s >= 0) {
    out += fmt::format("After the first action (t = {:.6g} s)\n", f.fault_time_s);
    out += fmt::format("  {:<22} {:>14} {:>16}\n", "valve", "peak |i| A", "I2t A2s");
    for (const auto& v : f.valves) out += fmt::format("  {:<22} {:>14.6g} {:>16.6g}\n", v.name, v.peak_A, v.i2t_A2s);
    if (!f.windings.empty()) {
      out += fmt::format("  {:<22} {:>14}\n", "winding", "peak |i| A");
      for (const auto& w : f.windings) out += fmt::format("  {:<22} {:>14.6g}\n", w.name, w.peak_A);
    }
    out += "  first current zero after the action:\n";
    for (const auto& z : f.dc_currents)
      out += fmt::format("    {:<20} {}\n", z.name, z.after_s >= 0 ? fmt::format("{:.6g} s", z.after_s) : "none in the run");
    for (const auto& z : f.line_currents)
      out += fmt::format("    {:<20} {}\n", z.name, z.after_s >= 0 ? fmt::format("{:.6g} s", z.after_s) : "none in the run");
    out += "\n";
  }
  if (!a.ratings.empty()) {
    out += "Valve ratings\n";
    for (const auto& r : a.ratings)
      out += fmt::format("  {:<10} {:<9} {:>12.6g} of {:>12.6g} {:<3}  {}\n", r.valve, r.rating, r.value, r.limit,
                         r.unit, r.exceeded ? "EXCEEDED" : "within");
    out += "  (Irms over the analysis window, Ipk and the reverse voltage over the whole run, I2t from the\n"
           "   first action, or over the window without one)\n\n";
  }
}

void Firings(const CaseAnalysis& a, std::string& out) {
  if (a.firings.empty()) return;
  out += "Firing\n";
  for (const auto& f : a.firings) {
    out += fmt::format("  {:<16} alpha at the end {:.3f} deg", f.name, f.alpha_end_deg);
    if (!f.regulates.empty()) {
      out += fmt::format("; regulates {} to {:.6g} A: mean {:.6g} A ({:+.3f} %), ", f.regulates, f.target_A, f.mean_A,
                         f.error_pct);
      out += f.settling_skipped ? std::string("settling not simulated (the steady state was found by shooting)")
             : f.settling_s >= 0  ? fmt::format("within 1 % from {:.4g} s", f.settling_s)
                                  : std::string("not settled within 1 %");
      if (f.settling_s >= 0 && a.fault.fault_time_s >= 0 && f.settling_s >= a.fault.fault_time_s)
        out += fmt::format(" ({:.4g} s after the first action)", f.settling_s - a.fault.fault_time_s);
    }
    out += "\n";
  }
  out += "\n";
}

}  // namespace

const char* EngineeringCaution() {
  return "Results are engineering estimates from a circuit model. Check them against the\n"
         "applicable codes, the manufacturers' data and a licensed engineer's review before\n"
         "they inform a decision about equipment or safety.";
}

std::string FormatReport(const CaseAnalysis& a) {
  std::string out;
  out += fmt::format("lccsim report: case '{}'\n", a.case_name);
  out += fmt::format("netlist: {}\n\n", a.netlist);
  out += "CAUTION\n";
  out += EngineeringCaution();
  out += "\n\n";
  if (a.run.status == "failed") {
    out += fmt::format("THE SIMULATION FAILED: {}\n", a.run.message);
    out += "The waveforms were kept up to that time and are partial.\n\n";
  }
  if (a.run.steady_requested && !a.run.steady_reached)
    out += "Steady state was NOT reached; the figures below are over the last cycles simulated.\n\n";
  for (const auto& note : a.notes) out += "note: " + note + "\n";
  if (!a.notes.empty()) out += "\n";
  out += fmt::format("Analysis window {:.6g} s .. {:.6g} s", a.window_begin_s, a.window_end_s);
  if (a.frequency_Hz > 0) out += fmt::format(", {} whole cycles of {:.6g} Hz", a.window_cycles, a.frequency_Hz);
  out += "\n\n";
  Probes(a, out);
  Bridges(a, out);
  AcPoints(a, out);
  Ieee519(a, out);
  Fault(a, out);
  Firings(a, out);
  out += "Run statistics\n";
  out += a.run.statistics;
  return out;
}

}  // namespace lcc
