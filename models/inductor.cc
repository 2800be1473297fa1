#include "models/inductor.h"

namespace lcc {

void Inductor::Stamp(StampSink& sink, bool) const {
  const int a = NodeUnknown(nodes()[0]), b = NodeUnknown(nodes()[1]), k = branch();
  sink.G(a, k, 1.0);
  sink.G(b, k, -1.0);
  sink.G(k, a, 1.0);
  sink.G(k, b, -1.0);
  sink.G(k, k, -r_);
  sink.C(k, k, -l_);
}

bool Inductor::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  return BranchSignal(what, form, dim);
}

}  // namespace lcc
