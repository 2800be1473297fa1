// Harmonic content of a periodic waveform, from samples over whole cycles.
//
// In a simulation the fundamental is known exactly, so a window of whole
// cycles sampled uniformly has no leakage: the DFT bin `cycles·h` is exactly
// harmonic h, and no window function is needed (unlike a measurement, where
// IEC 61000-4-7 prescribes 5 Hz bins and grouping). The transform is FFTW's
// real-to-complex DFT.
//
// Sampling must resolve the highest order asked for: at least 2·max_order
// samples per cycle; the default output interval (period/1024) gives 512.
#pragma once

#include <complex>
#include <vector>

namespace lcc {

struct Spectrum {
  double dc = 0.0;                          // mean value
  // Index h = 0..max_order: the peak-value phasor of harmonic h, so that
  // x(t) ≈ dc + Σ Re(phasor[h]·e^(j·h·ω·t')) with t' from the window start.
  std::vector<std::complex<double>> phasor;
  double total_rms = 0.0;                   // rms of the whole waveform, all orders
  int cycles = 0;
  int samples_per_cycle = 0;

  int max_order() const { return static_cast<int>(phasor.size()) - 1; }
  double rms(int h) const { return std::abs(phasor[h]) / 1.4142135623730951; }
  // sqrt(Σ_{h=2..max_order} I_h²): the harmonic content up to max_order.
  double HarmonicRms() const;
  // THD = HarmonicRms / I_1 (IEEE 519 and IEC 61000-2-2 use orders up to 50).
  double Thd() const;
  // THD over all orders, from the rms value: sqrt(Irms² − dc² − I_1²)/I_1.
  double ThdAllOrders() const;
  // TDD = HarmonicRms / IL (IEEE 519-2014 §3: IL is the maximum demand
  // load current, fundamental).
  double Tdd(double il) const { return il > 0 ? HarmonicRms() / il : 0.0; }
};

// The spectrum of x[0..n) taken as `cycles` whole cycles sampled uniformly
// (n must be a multiple of cycles, and n/cycles ≥ 2·max_order + 1; orders
// beyond what the sampling resolves are left out, so phasor may be shorter).
// Throws std::invalid_argument if n or cycles do not allow an analysis.
Spectrum AnalyseHarmonics(const double* x, int n, int cycles, int max_order = 50);

}  // namespace lcc
