#include "models/winding.h"

namespace lcc {

void Winding::Stamp(StampSink& sink, bool) const {
  const int a = NodeUnknown(nodes()[0]), b = NodeUnknown(nodes()[1]), k = branch();
  const int e = core_->emf_unknown();
  sink.G(a, k, 1.0);
  sink.G(b, k, -1.0);
  sink.G(k, a, 1.0);
  sink.G(k, b, -1.0);
  sink.G(k, k, -r_);
  sink.C(k, k, -l_);
  sink.G(k, e, -n_);
  sink.G(e, k, n_);
}

bool Winding::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  return BranchSignal(what, form, dim);
}

}  // namespace lcc
