#include "models/sources.h"

namespace lcc {

void VoltageSource::Stamp(StampSink& sink, bool) const {
  StampBranchIncidence(sink);
}

void VoltageSource::AddSources(double t, bool, double* b) const { b[branch()] += e_.Value(t); }

bool VoltageSource::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  if (what == "i") {
    BranchCurrentForm(form, -1.0);
    *dim = dims::kCurrent;
    return true;
  }
  return Device::Signal(what, form, dim);
}

void CurrentSource::AddSources(double t, bool, double* b) const {
  // F = C·y' + G·y − b: the current leaving node p through the source is −i.
  const double i = i_.Value(t);
  const int p = NodeUnknown(nodes()[0]), n = NodeUnknown(nodes()[1]);
  if (p >= 0) b[p] += i;
  if (n >= 0) b[n] -= i;
}

bool CurrentSource::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  // Its current is a time function, not a linear form of the unknowns, so
  // only its voltage v_p − v_n can be probed.
  return what == "v" && Device::Signal(what, form, dim);
}

}  // namespace lcc
