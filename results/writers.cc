#include "results/writers.h"

#include <fmt/format.h>

#include <map>

#include "results/analysis_json.h"
#include "results/atomic_file.h"
#include "results/report.h"

namespace lcc {
namespace {

std::string Num(double v) { return fmt::format("{:.9g}", v); }

// Quotes a CSV field if it needs it (RFC 4180).
std::string CsvField(const std::string& s) {
  if (s.find_first_of(",\"\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) {
    if (c == '"') q += '"';
    q += c;
  }
  return q + "\"";
}

// One case's (column, value) pairs in their natural order.
std::vector<std::pair<std::string, std::string>> SummaryCells(const CaseAnalysis& a) {
  std::vector<std::pair<std::string, std::string>> c;
  c.emplace_back("case", a.case_name);
  c.emplace_back("status", a.run.status);
  c.emplace_back("reason", a.run.message);
  c.emplace_back("steady", a.run.steady_reached ? "yes" : "no");
  c.emplace_back("window begin [s]", Num(a.window_begin_s));
  c.emplace_back("window end [s]", Num(a.window_end_s));
  for (const auto& p : a.probes) {
    const std::string u = p.stats.unit;
    c.emplace_back(fmt::format("{} mean [{}]", p.name, u), Num(p.stats.mean));
    c.emplace_back(fmt::format("{} rms [{}]", p.name, u), Num(p.stats.rms));
    c.emplace_back(fmt::format("{} peak [{}]", p.name, u), Num(p.stats.peak));
    c.emplace_back(fmt::format("{} ripple p-p [{}]", p.name, u), Num(p.stats.ripple_pp));
  }
  for (const auto& b : a.bridges) {
    c.emplace_back(b.name + " Vd [V]", Num(b.vd.mean));
    c.emplace_back(b.name + " Id [A]", Num(b.id.mean));
    c.emplace_back(b.name + " Pd [W]", Num(b.pd_W));
    c.emplace_back(b.name + " Vd ripple p-p [V]", Num(b.vd.ripple_pp));
    c.emplace_back(b.name + " alpha [deg]", Num(b.alpha_deg));
    c.emplace_back(b.name + " Vd closed form [V]", Num(b.vd_closed_form_V));
    c.emplace_back(b.name + " Vd difference [%]", Num(b.vd_difference_pct));
    c.emplace_back(b.name + " overlap [deg]", b.overlap_deg >= 0 ? Num(b.overlap_deg) : "");
    c.emplace_back(b.name + " overlap closed form [deg]",
                   b.overlap_closed_form_deg >= 0 ? Num(b.overlap_closed_form_deg) : "");
    double ipk = 0;
    for (const auto& v : b.valves) ipk = std::max(ipk, v.i_peak_A);
    c.emplace_back(b.name + " valve peak current [A]", Num(ipk));
  }
  for (const auto& p : a.ac_points) {
    c.emplace_back(p.name + " I1 [A]", Num(p.i1_A));
    c.emplace_back(p.name + " THD [%]", Num(p.thd_pct));
    c.emplace_back(p.name + " TDD [%]", Num(p.tdd_pct));
    c.emplace_back(p.name + " voltage THD [%]", Num(p.voltage_thd_pct));
    c.emplace_back(p.name + " P [W]", Num(p.p_W));
    c.emplace_back(p.name + " Q1 [var]", Num(p.q1_var));
    c.emplace_back(p.name + " S [VA]", Num(p.s_VA));
    c.emplace_back(p.name + " displacement factor [1]", Num(p.displacement_factor));
    c.emplace_back(p.name + " power factor [1]", Num(p.power_factor));
  }
  for (const auto& k : a.ieee519) c.emplace_back(k.pcc + " IEEE 519 [pass/fail]", k.pass ? "pass" : "fail");
  if (a.fault.fault_time_s >= 0) {
    c.emplace_back("first action [s]", Num(a.fault.fault_time_s));
    for (const auto& v : a.fault.valves) {
      c.emplace_back(v.name + " peak after action [A]", Num(v.peak_A));
      c.emplace_back(v.name + " I2t after action [A2s]", Num(v.i2t_A2s));
    }
    for (const auto& w : a.fault.windings) c.emplace_back(w.name + " peak after action [A]", Num(w.peak_A));
    for (const auto& z : a.fault.dc_currents) c.emplace_back(z.name + " first zero after action [s]", z.after_s >= 0 ? Num(z.after_s) : "");
  }
  int exceeded = 0;
  for (const auto& r : a.ratings) exceeded += r.exceeded;
  if (!a.ratings.empty()) c.emplace_back("valve ratings exceeded [count]", std::to_string(exceeded));
  for (const auto& f : a.firings) c.emplace_back(f.name + " alpha [deg]", Num(f.alpha_end_deg));
  return c;
}

}  // namespace

void WriteWaveformsCsv(const std::string& path, const ProbeRecorder& recorder) {
  AtomicFile file(path);
  std::ostream& out = file.stream();
  out << "time [s]";
  for (const auto& p : recorder.probes()) out << ',' << p.name << " [" << p.unit() << ']';
  out << '\n';
  const std::size_t probes = recorder.probes().size();
  std::string line;
  recorder.ForEachRow([&](const double* row) {
    line.clear();
    fmt::format_to(std::back_inserter(line), "{:.9g}", row[0]);
    for (std::size_t k = 1; k <= probes; ++k) fmt::format_to(std::back_inserter(line), ",{:.9g}", row[k]);
    line.push_back('\n');
    out << line;
  });
  file.Commit();
}

SummaryTable BuildSummaryTable(const std::vector<CaseAnalysis>& cases) {
  SummaryTable t;
  std::map<std::string, std::size_t> index;
  std::vector<std::vector<std::pair<std::string, std::string>>> cells;
  for (const auto& a : cases) {
    cells.push_back(SummaryCells(a));
    for (const auto& [col, value] : cells.back())
      if (index.emplace(col, t.columns.size()).second) t.columns.push_back(col);
  }
  for (const auto& row_cells : cells) {
    std::vector<std::string> row(t.columns.size());
    for (const auto& [col, value] : row_cells) row[index[col]] = value;
    t.rows.push_back(std::move(row));
  }
  return t;
}

void WriteSummaryCsv(const std::string& path, const std::vector<CaseAnalysis>& cases) {
  const SummaryTable t = BuildSummaryTable(cases);
  std::string text;
  for (std::size_t k = 0; k < t.columns.size(); ++k) text += (k ? "," : "") + CsvField(t.columns[k]);
  text += '\n';
  for (const auto& row : t.rows) {
    for (std::size_t k = 0; k < row.size(); ++k) text += (k ? "," : "") + CsvField(row[k]);
    text += '\n';
  }
  WriteFileAtomically(path, text);
}

void WriteSummaryJson(const std::string& path, const std::vector<CaseAnalysis>& cases) {
  nlohmann::json j;
  j["format"] = "lccsim summary 1";
  j["caution"] = EngineeringCaution();
  j["cases"] = nlohmann::json::array();
  for (const auto& a : cases) j["cases"].push_back(ToJson(a));
  WriteFileAtomically(path, j.dump(1) + "\n");
}

}  // namespace lcc
