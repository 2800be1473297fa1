#include "models/winding.h"

namespace lcc {

void Winding::Stamp(StampSink& sink, bool) const {
  const int k = branch();
  const int e = core_->emf_unknown();
  StampBranchIncidence(sink);
  sink.G(k, k, -r_);
  sink.C(k, k, -l_);
  sink.G(k, e, -n_);
  sink.G(e, k, n_);
}

bool Winding::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  return BranchSignal(what, form, dim);
}

}  // namespace lcc
