#include "results/analysis_json.h"

#include <stdexcept>

namespace lcc {

NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(Stats, unit, mean, rms, peak, min, max, ripple_pp, ripple_rms,
                                                ripple_factor, form_factor)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(ProbeFigures, name, stats)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(ValveFigures, name, i_mean_A, i_rms_A, i_peak_A, v_reverse_peak_V,
                                                v_forward_peak_V, conduction_deg, overlap_deg, extinction_min_deg,
                                                didt_max_A_per_s, i2t_A2s)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(BridgeFigures, name, valve, vd, id, pd_W, ripple_order,
                                                ripple_order_rms_V, alpha_deg, vll_V, ls_H, rs_ohm, vdo_V,
                                                vd_closed_form_V, vd_difference_pct, overlap_deg,
                                                overlap_closed_form_deg, valves)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(HarmonicFigure, h, rms, percent, angle_deg)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(AcPointFigures, name, kind, v_rms_V, i_rms_A, i1_A,
                                                current_harmonics, thd_pct, thd_all_orders_pct, tdd_pct, il_A,
                                                voltage_thd_pct, p_W, q1_var, s_VA, displacement_factor,
                                                power_factor, winding_VA, utilisation)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(FiringFigures, name, alpha_end_deg, regulates, target_A, mean_A,
                                                error_pct, settling_s, settling_skipped)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(RunFigures, status, message, steady_requested, steady_reached,
                                                steady_time_s, t_reached_s, period_s, steps, events, switchings,
                                                samples, statistics)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(Ieee519Row, item, h, value_percent, limit_percent, pass)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(Ieee519Check, pcc, vll_V, isc_A, il_A, il_from_case, isc_over_il, table,
                                                pulses, allowance_applied, allowance, rows, pass)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(FaultFigures::Peak, name, peak_A, i2t_A2s)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(FaultFigures::Zero, name, after_s)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(FaultFigures, fault_time_s, actions, valves, windings, dc_currents,
                                                line_currents)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(RatingCheck, valve, rating, value, limit, unit, exceeded)
NLOHMANN_DEFINE_TYPE_NON_INTRUSIVE_WITH_DEFAULT(CaseAnalysis, case_name, netlist, case_index, folder, notes,
                                                window_begin_s, window_end_s, frequency_Hz, window_cycles, run,
                                                probes, bridges, ac_points, firings, ieee519, fault, ratings)

nlohmann::json ToJson(const CaseAnalysis& a) { return a; }

CaseAnalysis CaseAnalysisFromJson(const nlohmann::json& j) {
  try {
    return j.get<CaseAnalysis>();
  } catch (const nlohmann::json::exception& e) {
    throw std::runtime_error(std::string("not a case analysis: ") + e.what());
  }
}

}  // namespace lcc
