#include "models/study.h"

namespace lcc {

double EvaluateProbe(const Probe& probe, const double* y, const double* yp) {
  // Probes have a handful of slots; a small fixed buffer avoids allocation
  // in the per-sample path.
  double slots[32];
  const std::size_t n = probe.slots.size() < 32 ? probe.slots.size() : 32;
  for (std::size_t k = 0; k < n; ++k) slots[k] = probe.slots[k].Evaluate(y, yp);
  return *EvaluateProgram(probe.program, slots, nullptr, nullptr);
}

}  // namespace lcc
