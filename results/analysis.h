// The figures of one finished case: what the report, summary.csv and
// summary.json show. Analyse() computes them from the recorded window; the
// struct is plain data, so a report can be printed again from the JSON it
// was saved as (`lccsim report`) without simulating.
//
// Field names carry their unit where they have one (_V, _A, _W, _var, _VA,
// _deg, _s, _pct, _A2s for I²t, _A_per_s); a Stats block carries its unit
// in `unit`.
#pragma once

#include <array>
#include <string>
#include <vector>

#include "engine/simulator.h"
#include "models/circuit.h"
#include "results/case_recorder.h"
#include "results/ieee519.h"
#include "results/measures.h"

namespace lcc {

struct Stats {
  std::string unit;
  double mean = 0, rms = 0, peak = 0, min = 0, max = 0;
  double ripple_pp = 0, ripple_rms = 0, ripple_factor = 0, form_factor = 0;
};
Stats StatsOf(const WindowStats& w, std::string unit);

struct ProbeFigures {
  std::string name;
  Stats stats;
};

struct ValveFigures {
  std::string name;
  double i_mean_A = 0, i_rms_A = 0, i_peak_A = 0;
  double v_reverse_peak_V = 0;      // largest cathode-to-anode voltage
  double v_forward_peak_V = 0;      // largest anode-to-cathode voltage while blocking
  double conduction_deg = 0;        // per cycle
  double overlap_deg = -1;          // mean over the commutations onto this valve (−1: none)
  double extinction_min_deg = -1;   // least γ in the window (−1: not measured)
  double didt_max_A_per_s = 0;      // steepest rise of current between samples
  double i2t_A2s = 0;               // ∫ i² dt over the window
};

struct BridgeFigures {
  std::string name;
  std::string valve;                // diode | thyristor
  Stats vd, id;
  double pd_W = 0;                  // mean of vd·id
  int ripple_order = 0;             // harmonic (of the fundamental) with the largest DC ripple
  double ripple_order_rms_V = 0;
  double alpha_deg = 0;             // delay angle: mean over the window's gate turn-ons (0 for diodes)
  // Closed forms (check values §1.1, §2.1, §2.2) with the commutating
  // inductance Ls taken from the elaborated circuit: half the
  // line-to-line Thevenin reactance at the AC terminals over ω.
  double vll_V = 0;                 // open-circuit line-to-line rms at the AC terminals
  double ls_H = 0, rs_ohm = 0;      // commutating inductance and resistance per phase
  double vdo_V = 0;                 // (3√2/π)·VLL
  double vd_closed_form_V = 0;      // Vdo·cos α − (3ωLs/π)·Id
  double vd_difference_pct = 0;     // (simulated − closed form)/closed form
  double overlap_deg = -1;          // simulated mean (−1: none complete)
  double overlap_closed_form_deg = -1;  // cos(α+μ) = cos α − 2ωLs·Id/(√2·VLL); −1 outside μ < 60°
  std::vector<ValveFigures> valves;
};

struct HarmonicFigure {
  int h = 0;
  double rms = 0;                   // A or V
  double percent = 0;               // of the fundamental
  double angle_deg = 0;
};

struct AcPointFigures {
  std::string name;
  std::string kind;                 // supply | transformer HV | transformer LV
  std::array<double, 3> v_rms_V{}, i_rms_A{};
  double i1_A = 0;                  // fundamental, phase a
  std::vector<HarmonicFigure> current_harmonics;  // phase a, h = 1..50
  double thd_pct = 0;               // phase a, h ≤ 50
  double thd_all_orders_pct = 0;    // phase a, from the rms value
  double tdd_pct = 0;               // over IL
  double il_A = 0;                  // IL used for the TDD
  double voltage_thd_pct = 0;       // phase a, h ≤ 50
  double p_W = 0, q1_var = 0, s_VA = 0;
  double displacement_factor = 0;   // cos φ1 = P1/|S1|
  double power_factor = 0;          // P/S
  double winding_VA = 0;            // transformers: Σ V_rms·I_rms over the side's windings
  double utilisation = 0;           // transformers: Pd of the bridge fed (LV) or P / winding VA
};

struct FiringFigures {
  std::string name;
  double alpha_end_deg = 0;
  std::string regulates;            // probe name; empty for constant alpha
  double target_A = 0, mean_A = 0, error_pct = 0;
  double settling_s = -1;           // within 1 % from then on (−1: never)
  // The steady state was found by shooting: the settling transient was
  // skipped, so there is no settling time to give (settling_s is −1).
  bool settling_skipped = false;
};

struct RunFigures {
  std::string status;               // completed | failed
  std::string message;
  bool steady_requested = false, steady_reached = false;
  double steady_time_s = -1, t_reached_s = 0, period_s = 0;
  long steps = 0, events = 0, switchings = 0, samples = 0;
  double wall_s = 0;
  std::string statistics;           // the engine's full run report, without the wall time
};

// After the first action of a case (the fault instant): what protection
// and fuse coordination need.
struct FaultFigures {
  double fault_time_s = -1;           // −1: the case has no action
  std::vector<std::string> actions;   // "0.3 s: at 300 ms close Sdc", in order
  struct Peak {
    std::string name;
    double peak_A = 0;                // largest |i| from the fault instant
    double i2t_A2s = 0;               // ∫ i² dt from the fault instant (valves)
  };
  std::vector<Peak> valves, windings;
  struct Zero {
    std::string name;
    double after_s = -1;              // from the fault to the first current zero (−1: none in the run)
  };
  std::vector<Zero> dc_currents;      // each bridge's Id
  std::vector<Zero> line_currents;    // each supply phase
};

// A valve rating given in the netlist against the simulated stress.
struct RatingCheck {
  std::string valve, rating;          // "B1[3]", "Ipk_max"
  double value = 0, limit = 0;
  std::string unit;
  bool exceeded = false;
};

struct CaseAnalysis {
  std::string case_name, netlist;
  int case_index = 0;
  std::string folder;
  std::vector<std::string> notes;
  double window_begin_s = 0, window_end_s = 0, frequency_Hz = 0;
  int window_cycles = 0;
  RunFigures run;
  std::vector<ProbeFigures> probes;
  std::vector<BridgeFigures> bridges;
  std::vector<AcPointFigures> ac_points;
  std::vector<FiringFigures> firings;
  std::vector<Ieee519Check> ieee519;
  FaultFigures fault;
  std::vector<RatingCheck> ratings;
  double analysis_wall_s = 0;         // not in the JSON: outputs stay identical from run to run
};

struct AnalysisInput {
  std::string case_name, netlist;
  int case_index = 0;
  std::string folder;
  std::vector<std::string> notes;
  const Circuit* circuit = nullptr;
  const Study* study = nullptr;
  CaseRecorder* recorder = nullptr;  // its window is put in time order
  const RunResult* run = nullptr;
};

CaseAnalysis Analyse(const AnalysisInput& in);

}  // namespace lcc
