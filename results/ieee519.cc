#include "results/ieee519.h"

#include <cmath>
#include <limits>

namespace lcc {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

// IEEE Std 519-2014 Table 2 (120 V < V ≤ 69 kV), Table 3 (69 kV < V ≤
// 161 kV) and Table 4 (V > 161 kV), as transcribed in the check values
// (§5.3, §5.6, §5.7).
const std::vector<CurrentLimitRow> kTable2 = {
    {20, {4.0, 2.0, 1.5, 0.6, 0.3}, 5.0},
    {50, {7.0, 3.5, 2.5, 1.0, 0.5}, 8.0},
    {100, {10.0, 4.5, 4.0, 1.5, 0.7}, 12.0},
    {1000, {12.0, 5.5, 5.0, 2.0, 1.0}, 15.0},
    {kInf, {15.0, 7.0, 6.0, 2.5, 1.4}, 20.0},
};
const std::vector<CurrentLimitRow> kTable3 = {
    {20, {2.0, 1.0, 0.75, 0.3, 0.15}, 2.5},
    {50, {3.5, 1.75, 1.25, 0.5, 0.25}, 4.0},
    {100, {5.0, 2.25, 2.0, 0.75, 0.35}, 6.0},
    {1000, {6.0, 2.75, 2.5, 1.0, 0.5}, 7.5},
    {kInf, {7.5, 3.5, 3.0, 1.25, 0.7}, 10.0},
};
const std::vector<CurrentLimitRow> kTable4 = {
    {25, {1.0, 0.5, 0.38, 0.15, 0.1}, 1.5},
    {50, {2.0, 1.0, 0.75, 0.3, 0.15}, 2.5},
    {kInf, {3.0, 1.5, 1.15, 0.45, 0.22}, 3.75},
};

int RangeOf(int h) {
  if (h < 11) return 0;
  if (h < 17) return 1;
  if (h < 23) return 2;
  if (h < 35) return 3;
  return 4;
}

}  // namespace

int CurrentTableNumber(double vll) { return vll <= 69e3 ? 2 : vll <= 161e3 ? 3 : 4; }

const std::vector<CurrentLimitRow>& CurrentTable(double vll) {
  switch (CurrentTableNumber(vll)) {
    case 2: return kTable2;
    case 3: return kTable3;
    default: return kTable4;
  }
}

const CurrentLimitRow& CurrentLimits(double vll, double isc_over_il) {
  const auto& table = CurrentTable(vll);
  for (const auto& row : table)
    if (isc_over_il < row.ratio_below) return row;
  return table.back();
}

double HarmonicLimitPercent(const CurrentLimitRow& row, int h) {
  const double odd = row.odd[RangeOf(h)];
  return h % 2 == 0 ? 0.25 * odd : odd;
}

VoltageLimits VoltageDistortionLimits(double vll) {
  if (vll <= 1e3) return {5.0, 8.0};
  if (vll <= 69e3) return {3.0, 5.0};
  if (vll <= 161e3) return {1.5, 2.5};
  return {1.0, 1.5};
}

Ieee519Check CheckIeee519(const std::string& pcc, double vll, double isc, double il, bool il_from_case, int pulses,
                          const std::vector<double>& current_rms, const std::vector<double>& voltage_rms) {
  Ieee519Check c;
  c.pcc = pcc;
  c.vll_V = vll;
  c.isc_A = isc;
  c.il_A = il;
  c.il_from_case = il_from_case;
  c.pulses = pulses;
  c.isc_over_il = isc > 0 && il > 0 ? isc / il : -1.0;  // −1: an ideal source, infinitely strong
  c.table = CurrentTableNumber(vll);
  const CurrentLimitRow& row = CurrentLimits(vll, c.isc_over_il < 0 ? kInf : c.isc_over_il);
  const int top = std::min<int>(50, static_cast<int>(current_rms.size()) - 1);
  auto percent = [&](int h) { return il > 0 ? 100.0 * current_rms[h] / il : 0.0; };
  auto characteristic = [&](int h) { return (h - 1) % pulses == 0 || (h + 1) % pulses == 0; };

  // §5.5: for p > 6 the characteristic limits rise by √(p/6) if every
  // non-characteristic harmonic stays below a quarter of its limit.
  if (pulses > 6) {
    bool quiet = true;
    for (int h = 2; h <= top; ++h)
      if (!characteristic(h) && percent(h) > 0.25 * HarmonicLimitPercent(row, h)) quiet = false;
    c.allowance_applied = quiet;
    c.allowance = quiet ? std::sqrt(pulses / 6.0) : 1.0;
  }
  double sum2 = 0.0;
  for (int h = 2; h <= top; ++h) {
    double limit = HarmonicLimitPercent(row, h);
    if (c.allowance_applied && characteristic(h)) limit *= c.allowance;
    Ieee519Row r{"h" + std::to_string(h), h, percent(h), limit, percent(h) <= limit};
    c.pass &= r.pass;
    c.rows.push_back(r);
    sum2 += current_rms[h] * current_rms[h];
  }
  const double tdd = il > 0 ? 100.0 * std::sqrt(sum2) / il : 0.0;
  c.rows.push_back({"TDD", 0, tdd, row.tdd, tdd <= row.tdd});
  c.pass &= c.rows.back().pass;

  const VoltageLimits vl = VoltageDistortionLimits(vll);
  const double vnom = vll / std::sqrt(3.0);
  double vmax = 0.0, v2 = 0.0;
  int hmax = 0;
  for (int h = 2; h < static_cast<int>(voltage_rms.size()) && h <= 50; ++h) {
    if (voltage_rms[h] > vmax) {
      vmax = voltage_rms[h];
      hmax = h;
    }
    v2 += voltage_rms[h] * voltage_rms[h];
  }
  const double vind = 100.0 * vmax / vnom, vthd = 100.0 * std::sqrt(v2) / vnom;
  c.rows.push_back({"voltage, largest harmonic", hmax, vind, vl.individual, vind <= vl.individual});
  c.pass &= c.rows.back().pass;
  c.rows.push_back({"voltage THD", 0, vthd, vl.thd, vthd <= vl.thd});
  c.pass &= c.rows.back().pass;
  return c;
}

}  // namespace lcc
