// Time functions of independent sources: a DC value plus sinusoids,
//     x(t) = dc + Σ_k amplitude_k · sin(2π·f_k·t + phase_k).
// A three-phase supply is three of these, its harmonics and its negative-
// sequence unbalance being further terms of the same sum.
#pragma once

#include <cmath>
#include <numbers>
#include <vector>

namespace lcc {

struct Sinusoid {
  double amplitude = 0.0;  // peak, in V or A
  double frequency = 0.0;  // Hz
  double phase = 0.0;      // rad, at t = 0
};

struct Waveform {
  double dc = 0.0;
  std::vector<Sinusoid> sines;

  double Value(double t) const {
    double v = dc;
    for (const auto& s : sines)
      v += s.amplitude * std::sin(2.0 * std::numbers::pi * s.frequency * t + s.phase);
    return v;
  }
  double Peak() const {
    double p = std::abs(dc);
    for (const auto& s : sines) p += std::abs(s.amplitude);
    return p;
  }
};

}  // namespace lcc
