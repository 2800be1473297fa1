#include "models/inductor.h"

namespace lcc {

void Inductor::Stamp(StampSink& sink, bool) const {
  const int k = branch();
  StampBranchIncidence(sink);
  sink.G(k, k, -r_);
  sink.C(k, k, -l_);
}

bool Inductor::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  return BranchSignal(what, form, dim);
}

}  // namespace lcc
