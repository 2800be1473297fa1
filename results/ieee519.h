// IEEE Std 519-2014 harmonic limits at a point of common coupling (PCC).
//
// Current limits (Tables 2, 3 and 4, by the PCC's nominal voltage), in % of
// IL, the maximum demand load current, for odd harmonics in the ranges
// 3 ≤ h < 11, 11 ≤ h < 17, 17 ≤ h < 23, 23 ≤ h < 35, 35 ≤ h ≤ 50, and for
// the TDD; the row is chosen by Isc/IL. Even harmonics are limited to 25 %
// of the odd limit of their range (Table 2, note). Converters with pulse
// number p > 6 may have the limits of their characteristic harmonics
// (h = kp ± 1) raised by √(p/6) when every non-characteristic harmonic is
// below 25 % of its limit (§5.5). Voltage limits (Table 1): individual
// harmonic and THD, in % of the nominal fundamental phase voltage.
//
// Choices where the standard is silent for a simulation: h = 2, below the
// first range, takes 25 % of the first range's limit; the §5.5 allowance is
// not applied to the TDD limit (the conservative reading); Isc/IL exactly
// on a row boundary takes the higher row, as the tables' "20 < 50" reads.
#pragma once

#include <string>
#include <vector>

namespace lcc {

struct CurrentLimitRow {
  double ratio_below = 0.0;  // the row applies for Isc/IL below this (last row: infinity)
  double odd[5] = {};        // % of IL, the five ranges of h
  double tdd = 0.0;          // % of IL
};

// The table for a nominal line-to-line voltage: its number (2, 3 or 4) and rows.
int CurrentTableNumber(double vll);
const std::vector<CurrentLimitRow>& CurrentTable(double vll);
const CurrentLimitRow& CurrentLimits(double vll, double isc_over_il);

// Limit of harmonic h (2..50) in % of IL, before any §5.5 allowance.
double HarmonicLimitPercent(const CurrentLimitRow& row, int h);

// Table 1: individual voltage harmonic and THD limits, % of nominal.
struct VoltageLimits {
  double individual = 0.0;
  double thd = 0.0;
};
VoltageLimits VoltageDistortionLimits(double vll);

struct Ieee519Row {
  std::string item;          // "h5", "TDD", "voltage THD", ...
  int h = 0;                 // harmonic order, 0 for a total
  double value_percent = 0.0;
  double limit_percent = 0.0;
  bool pass = true;
};

struct Ieee519Check {
  std::string pcc;           // the supply's name
  double vll_V = 0.0;        // nominal line-to-line
  double isc_A = 0.0;        // short-circuit current (0: ideal source, infinite)
  double il_A = 0.0;
  bool il_from_case = false; // IL taken as this case's fundamental current
  double isc_over_il = 0.0;  // −1: an ideal source (infinite Isc)
  int table = 2;
  int pulses = 6;
  bool allowance_applied = false;  // §5.5 √(p/6) on characteristic orders
  double allowance = 1.0;
  std::vector<Ieee519Row> rows;    // harmonics 2..50, TDD, voltage individual max, voltage THD
  bool pass = true;
};

// The check from the worst phase's harmonic currents (rms, A, index h = 0..50)
// and the worst phase's voltage harmonics (rms, V) at the PCC.
Ieee519Check CheckIeee519(const std::string& pcc, double vll, double isc, double il, bool il_from_case, int pulses,
                          const std::vector<double>& current_rms, const std::vector<double>& voltage_rms);

}  // namespace lcc
