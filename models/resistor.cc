#include "models/resistor.h"

namespace lcc {

void Resistor::Stamp(StampSink& sink, bool) const {
  const int a = NodeUnknown(nodes()[0]), b = NodeUnknown(nodes()[1]);
  const double g = 1.0 / r_;
  sink.G(a, a, g);
  sink.G(a, b, -g);
  sink.G(b, a, -g);
  sink.G(b, b, g);
}

bool Resistor::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  if (what == "i") {
    form->AddY(NodeUnknown(nodes()[0]), 1.0 / r_);
    form->AddY(NodeUnknown(nodes()[1]), -1.0 / r_);
    *dim = dims::kCurrent;
    return true;
  }
  return Device::Signal(what, form, dim);
}

}  // namespace lcc
