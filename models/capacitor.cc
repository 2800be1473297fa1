#include "models/capacitor.h"

namespace lcc {

void Capacitor::Stamp(StampSink& sink, bool) const {
  const int a = NodeUnknown(nodes()[0]), b = NodeUnknown(nodes()[1]), k = branch();
  sink.C(a, k, c_);
  sink.C(b, k, -c_);
  sink.G(k, a, 1.0);
  sink.G(k, b, -1.0);
  sink.G(k, k, -1.0);
}

bool Capacitor::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  if (what == "i") {
    form->AddYp(branch(), c_);
    *dim = dims::kCurrent;
    return true;
  }
  if (what == "v") {
    form->AddY(branch(), 1.0);
    *dim = dims::kVoltage;
    return true;
  }
  return false;
}

}  // namespace lcc
