// Benchmark: 1 s of a six-pulse thyristor bridge under its current
// regulator (400 V, 50 Hz, Ls = 1 mH per phase with no resistance; a DC
// motor's armature, 200 mH and 0.1 ohm, against a back-EMF of 428 V; the
// sampled PI holds 100 A, which puts the delay angle near 30 deg), at rtol
// 1e-6, with three probes at T/1024.
//
// Prints wall time, the real-time factor, steps and events per cycle, peak
// RSS, the delay angle over the last cycle and the regulator's settling
// time, and Vd and the overlap angle over the last cycle against the closed
// forms
// Vd = Vdo·cos α − 3ωLs·Id/π and cos α − cos(α + μ) = 2ωLs·Id/(√2·VLL)
// (Mohan, Undeland & Robbins, Power Electronics, 3rd ed., §6-4), with that
// delay angle and the mean Id. The closed forms take Id free of ripple; the
// armature's ripple here (about 0.5 % peak to peak) bounds how close the two
// can be. The fastest of three runs.
//
// Usage: bench_six_pulse_thyristor [simulated-seconds]
#include <fmt/format.h>

#include <cstdlib>
#include <string>

#include "bench/bench_run.h"

int main(int argc, char** argv) {
  const double seconds = argc > 1 ? std::atof(argv[1]) : 1.0;
  const std::string text = fmt::format(R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz R = 0 ohm L = 1 mH
probe Id = La.i
firing F sync = Grid alpha = 35 deg alpha_min = 5 deg alpha_max = 150 deg
         regulate = Id target = 100 A kp = 2e-2 rad / 1 A ki = 1 rad / (1 A * 1 s)
bridge B ac = (a, b, c) dc = (p, n) valve = thyristor firing = F Ron = 1 uohm
inductor La (p, q) L = 200 mH R = 0.1 ohm
voltage_source Eb (q, n) dc = 428 V
simulate stop = {} s reltol = 1e-6
probe Vd = p - n
probe Ia = Grid.a.i
)",
                                       seconds);
  const auto design = lcc::bench::ElaborateOrExit(text);
  const auto analysed = lcc::bench::FastestAnalysedOfThree(*design);
  const lcc::RunSummary& best = analysed.summary;
  const auto& bridge = analysed.analysis.bridges.at(0);
  const auto& firing = analysed.analysis.firings.at(0);
  const auto errors = lcc::bench::WorstClosedFormErrors(analysed.analysis);
  const double cycles = seconds * 50.0;
  fmt::print("six-pulse thyristor bridge under its current regulator, {} s simulated, rtol 1e-6\n", seconds);
  fmt::print("{:>10} {:>10} {:>12} {:>13} {:>9} {:>10} {:>11} {:>11} {:>12}\n", "wall [ms]", "real-time",
             "steps/cycle", "events/cycle", "RSS [MB]", "alpha [deg]", "settle [ms]", "Vd err [%]", "mu err [deg]");
  fmt::print("{:>10.2f} {:>9.1f}x {:>12.0f} {:>13.1f} {:>9.1f} {:>11.2f} {:>11.1f} {:>11.4f} {:>12.4f}\n",
             best.wall_seconds * 1e3, seconds / best.wall_seconds, best.steps / cycles, best.events / cycles,
             lcc::bench::PeakRssMegabytes(), bridge.alpha_deg, firing.settling_s * 1e3, errors.vd_pct,
             errors.overlap_deg);
  fmt::print("Id {:.3f} A (target 100 A), ripple {:.2f} A peak to peak; Vd {:.3f} V, closed form {:.3f} V; "
             "overlap {:.3f} deg, closed form {:.3f} deg\n",
             bridge.id.mean, bridge.id.ripple_pp, bridge.vd.mean, bridge.vd_closed_form_V, bridge.overlap_deg,
             bridge.overlap_closed_form_deg);
  return 0;
}
