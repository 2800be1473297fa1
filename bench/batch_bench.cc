// Benchmark: batch throughput and per-case overhead.
//
// Runs a batch of 60 short cases (a six-pulse rectifier, 40 ms each, swept
// over supply strength) with one job and with two, and prints cases per
// second for each, their ratio (target on a 2-core machine: at least 1.8),
// and the overhead per case outside the simulation itself: (wall time of
// the batch per case) − (mean simulation time per case), measured with one
// job (target: below 10 ms). Writes into a temporary folder (TMPDIR).
//
// The ratio depends on the disk as much as on the program: each case
// creates and renames about eight files, and where creating one costs
// 0.2 ms of kernel time (this VM's ext4, measured with strace -c: 70 % of
// the batch's system time in openat) the two jobs queue for it: 1.6-1.7x
// there, 1.9x with TMPDIR=/dev/shm (tmpfs) on the same machine.
#include <fmt/format.h>
#include <unistd.h>

#include <chrono>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <thread>

#include "app/commands.h"
#include "bench/bench_run.h"

namespace fs = std::filesystem;

namespace {

const char* kBatch = R"(
supply Grid (a, b, c) Vll = 400 V f = 50 Hz Ssc = 2 MVA xr = 8
bridge B ac = (a, b, c) dc = (p, n)
inductor Ld (p, q) L = 2 mH
resistor Rl (q, n) R = 5 ohm
simulate stop = 40 ms
probe Id = Ld.i
sweep Grid.Ssc = 1 MVA .. 6.9 MVA step 0.1 MVA
)";

double RunBatch(const fs::path& netlist, const fs::path& out, int jobs) {
  fs::remove_all(out);
  lcc::RunCommandOptions o;
  o.netlist = netlist.string();
  o.out_dir = out.string();
  o.jobs = jobs;
  std::ostringstream s, e;
  const auto t0 = std::chrono::steady_clock::now();
  if (lcc::RunCommand(o, s, e) != lcc::kExitOk) {
    fmt::print(stderr, "batch failed: {}\n", e.str());
    std::exit(1);
  }
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

}  // namespace

int main() {
  const fs::path dir = fs::temp_directory_path() / ("lccsim-batch-bench-" + std::to_string(getpid()));
  fs::create_directories(dir);
  std::ofstream(dir / "batch.lcc") << kBatch;
  const int cases = 60;
  double one = 1e300, two = 1e300;
  for (int k = 0; k < 3; ++k) {
    one = std::min(one, RunBatch(dir / "batch.lcc", dir / "one", 1));
    two = std::min(two, RunBatch(dir / "batch.lcc", dir / "two", 2));
  }
  // Simulation time per case, from the one-job run's timing.csv.
  const double sim = lcc::bench::ReadBatchTiming((dir / "one").string()).simulation_seconds;
  fmt::print("{} cases of 40 ms (six-pulse rectifier), {} hardware threads, output under {}\n", cases,
             std::thread::hardware_concurrency(), fs::temp_directory_path().string());
  fmt::print("{:>12} {:>14} {:>14}\n", "jobs", "wall [s]", "cases/s");
  fmt::print("{:>12} {:>14.3f} {:>14.1f}\n", 1, one, cases / one);
  fmt::print("{:>12} {:>14.3f} {:>14.1f}\n", 2, two, cases / two);
  fmt::print("throughput ratio 2 jobs / 1 job: {:.2f}\n", one / two);
  fmt::print("per case (one job): {:.2f} ms in all, {:.2f} ms simulating; overhead outside the simulation "
             "(elaboration, analysis, five files written) {:.2f} ms\n",
             one / cases * 1e3, sim / cases * 1e3, (one - sim) / cases * 1e3);
  fs::remove_all(dir);
  lcc::bench::PrintTarget("batch: 2 jobs >= 1.8x the throughput of 1 on 2 cores",
                          fmt::format("{:.2f}x", one / two), one / two >= 1.8);
  lcc::bench::PrintTarget("batch: overhead per case outside the simulation < 10 ms",
                          fmt::format("{:.2f} ms", (one - sim) / cases * 1e3), (one - sim) / cases < 10e-3);
  return 0;
}
