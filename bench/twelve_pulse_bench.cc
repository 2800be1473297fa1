// Benchmark: 1 s of a twelve-pulse diode rectifier with transformers
// (Yy0 + Yd11 from one 11 kV supply, bridges in series, constant Id), at
// rtol 1e-6, with three probes sampled at T/1024. Prints wall time, steps,
// events (also per cycle), unknowns, the real-time factor, peak RSS, and the
// worst bridge's Vd and overlap against the per-bridge closed forms (each
// bridge alone behind its Thevenin commutating inductance; the coupling of
// the two bridges through the shared supply is outside them); the fastest
// of three runs.
//
// Usage: bench_twelve_pulse [simulated-seconds]
// With LCC_BENCH_VERBOSE set in the environment it also prints the run's full
// solver summary (factorisations, kept pivot plans reused, root evaluations).
#include <fmt/format.h>

#include <cstdlib>
#include <string>

#include "bench/bench_run.h"

int main(int argc, char** argv) {
  const double seconds = argc > 1 ? std::atof(argv[1]) : 1.0;
  const std::string text = lcc::bench::TwelvePulseNetlist(seconds) +
                           "probe Vd = p - n\nprobe IA = G.a.i\nprobe Iv1 = B1[1].i\n";
  const auto design = lcc::bench::ElaborateOrExit(text);
  const auto analysed = lcc::bench::FastestAnalysedOfThree(*design);
  const lcc::RunSummary& best = analysed.summary;
  const auto errors = lcc::bench::WorstClosedFormErrors(analysed.analysis);
  const double cycles = seconds * 50.0;
  fmt::print("twelve-pulse rectifier with transformers, {} s simulated, rtol 1e-6, {} unknowns\n", seconds,
             design->circuit.num_unknowns());
  fmt::print("{:>10} {:>9} {:>8} {:>10} {:>12} {:>13} {:>9} {:>11} {:>12}\n", "wall [ms]", "steps", "events",
             "real-time", "steps/cycle", "events/cycle", "RSS [MB]", "Vd err [%]", "mu err [deg]");
  fmt::print("{:>10.2f} {:>9} {:>8} {:>9.1f}x {:>12.0f} {:>13.1f} {:>9.1f} {:>11.4f} {:>12.4f}\n",
             best.wall_seconds * 1e3, best.steps, best.events, seconds / best.wall_seconds, best.steps / cycles,
             best.events / cycles, lcc::bench::PeakRssMegabytes(), errors.vd_pct, errors.overlap_deg);
  if (std::getenv("LCC_BENCH_VERBOSE")) fmt::print("{}\n", best.FullReport());
  const double realtime = seconds / best.wall_seconds;
  lcc::bench::PrintTarget("twelve-pulse with transformers: >= 30x real time",
                          fmt::format("{:.1f}x with 3 probes", realtime), realtime >= 30);
  return 0;
}
