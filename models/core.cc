#include "models/core.h"

namespace lcc {

void Core::Stamp(StampSink& sink, bool) const {
  const int e = emf_unknown(), m = magnetising_unknown();
  sink.G(e, m, -ref_turns_);
  sink.G(e, e, -ref_turns_ * ref_turns_ / rc_);
  sink.G(m, e, ref_turns_);
  sink.C(m, m, -lm_);
}

bool Core::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  if (what == "i") {  // the magnetising current, referred to the reference winding
    form->AddY(magnetising_unknown(), 1.0);
    *dim = dims::kCurrent;
    return true;
  }
  return false;
}

}  // namespace lcc
