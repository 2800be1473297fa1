#include "models/valve.h"

namespace lcc {

void Valve::Stamp(StampSink& sink, bool on) const {
  const int a = NodeUnknown(nodes()[0]), k = NodeUnknown(nodes()[1]), j = branch();
  sink.G(a, j, 1.0);
  sink.G(k, j, -1.0);
  sink.G(j, a, 1.0);
  sink.G(j, k, -1.0);
  sink.G(j, j, on ? -p_.r_on : -p_.r_off);
}

void Valve::AddSources(double, bool on, double* b) const {
  if (on) b[branch()] += p_.v_f;
}

bool Valve::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  return BranchSignal(what, form, dim);
}

}  // namespace lcc
