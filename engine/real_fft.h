// The forward DFT of real samples, by FFTW, for any caller on any thread.
//
// X_m = Σ_k x_k·e^(−j·2π·m·k/n), m = 0..n/2 (the rest is the conjugate
// mirror). One FFTW plan per length is made on first use (FFTW_ESTIMATE)
// and kept for the life of the process: planning computes the twiddle
// factors, which cost more than a transform. FFTW's planner is not
// thread-safe, so every plan in the program is made here, under one lock;
// executing a plan on new arrays is thread-safe, and the work arrays are
// per thread and aligned as FFTW requires.
#pragma once

#include <complex>
#include <vector>

namespace lcc {

// X_0 .. X_{n/2} of x[0..n) into *out (resized to n/2 + 1). n ≥ 1.
void RealForwardDft(const double* x, int n, std::vector<std::complex<double>>* out);

}  // namespace lcc
