// Benchmark: peak memory of `lccsim run` on a twelve-pulse case (Yy0 + Yd11
// from one 11 kV supply, bridges in series, constant Id) with 20 probes at
// the default T/1024, writing every output format. Each configuration runs
// in a child process of its own, so that its peak resident set size is its
// own (getrusage of the child).
//
// It prints peak RSS for 2 s and 10 s of simulated time with the default
// waveform memory (samples spooled to disk past 4 MB) and with the whole
// run held in memory (--waveform-memory 0), so the growth with duration is
// visible. Target: at most 64 MB for 10 s, and no growth with duration
// beyond the switching-event list (about 70 B per switching).
//
// Usage: bench_memory [longest-simulated-seconds]   (default 10)
#include <fmt/format.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "app/commands.h"
#include "bench/bench_run.h"

namespace {

namespace fs = std::filesystem;

std::string Netlist(double seconds) {
  std::string text = lcc::bench::TwelvePulseNetlist(seconds) + R"(probe Vd = p - n
probe Vd1 = mid - n
probe Vd2 = p - mid
probe IA = G.a.i
probe IB = G.b.i
probe IC = G.c.i
probe Vy12 = y1 - y2
probe Vd12 = d1 - d2
)";
  // Twelve valve currents: 8 + 12 = 20 probes.
  for (int b = 1; b <= 2; ++b)
    for (int v = 1; v <= 6; ++v) text += fmt::format("probe I{0}v{1} = B{0}[{1}].i\n", b, v);
  return text;
}

struct Measured {
  double rss_mb = 0;
  double wall_s = 0;
  int exit_code = -1;
};

// Runs the case in a child process; its peak RSS from wait4.
Measured RunChild(const fs::path& dir, double seconds, std::uint64_t waveform_memory) {
  const fs::path netlist = dir / fmt::format("twelve_{}s.lcc", seconds);
  std::ofstream(netlist) << Netlist(seconds);
  const fs::path out = dir / fmt::format("out_{}s_{}", seconds, waveform_memory);
  const auto start = std::chrono::steady_clock::now();
  const pid_t pid = fork();
  if (pid == 0) {
    lcc::RunCommandOptions o;
    o.netlist = netlist.string();
    o.out_dir = out.string();
    o.jobs = 1;
    o.waveform_memory_bytes = waveform_memory;
    std::ostringstream sink;
    std::_Exit(lcc::RunCommand(o, sink, sink));
  }
  int status = 0;
  rusage usage{};
  wait4(pid, &status, 0, &usage);
  Measured m;
  m.wall_s = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  m.rss_mb = usage.ru_maxrss / 1024.0;  // Linux reports kilobytes
  m.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  fs::remove_all(out);
  return m;
}

}  // namespace

int main(int argc, char** argv) {
  const double longest = argc > 1 ? std::atof(argv[1]) : 10.0;
  const fs::path dir = fs::temp_directory_path() / fmt::format("lccsim-bench-memory-{}", getpid());
  fs::create_directories(dir);
  fmt::print("twelve-pulse rectifier, 20 probes at T/1024, all output formats\n");
  fmt::print("{:>14} {:>22} {:>14} {:>10}\n", "simulated [s]", "waveform memory", "peak RSS [MB]", "wall [s]");
  int failures = 0;
  double spooled_longest_mb = 0.0;
  for (const std::uint64_t memory : {std::uint64_t{4'000'000}, std::uint64_t{0}})
    for (const double seconds : {longest / 5, longest}) {
      const Measured m = RunChild(dir, seconds, memory);
      failures += m.exit_code != 0;
      if (memory != 0 && seconds == longest) spooled_longest_mb = m.rss_mb;
      fmt::print("{:>14g} {:>22} {:>14.1f} {:>10.2f}{}\n", seconds,
                 memory ? "4 MB, then spooled" : "whole run (0)", m.rss_mb, m.wall_s,
                 m.exit_code != 0 ? fmt::format("  (exit code {})", m.exit_code) : "");
    }
  fs::remove_all(dir);
  lcc::bench::PrintTarget(fmt::format("peak RSS <= 64 MB for {:g} s of twelve-pulse with 20 probes", longest),
                          fmt::format("{:.1f} MB, waveforms spooled", spooled_longest_mb),
                          failures == 0 && spooled_longest_mb <= 64.0);
  return failures ? 1 : 0;
}
