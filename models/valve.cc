#include "models/valve.h"

namespace lcc {

void Valve::Stamp(StampSink& sink, bool on) const {
  StampBranchIncidence(sink);
  sink.G(branch(), branch(), on ? -p_.r_on : -p_.r_off);
}

void Valve::AddSources(double, bool on, double* b) const {
  if (on) b[branch()] += p_.v_f;
}

bool Valve::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  return BranchSignal(what, form, dim);
}

}  // namespace lcc
