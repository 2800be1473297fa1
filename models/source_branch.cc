#include "models/source_branch.h"

namespace lcc {

void SourceBranch::Stamp(StampSink& sink, bool) const {
  const int a = NodeUnknown(nodes()[0]), b = NodeUnknown(nodes()[1]), k = branch();
  sink.G(a, k, 1.0);
  sink.G(b, k, -1.0);
  sink.G(k, b, 1.0);
  sink.G(k, a, -1.0);
  sink.G(k, k, r_);
  sink.C(k, k, l_);
}

void SourceBranch::AddSources(double t, bool, double* b) const { b[branch()] += e_.Value(t); }

bool SourceBranch::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  if (what == "i") {
    BranchCurrentForm(form);
    *dim = dims::kCurrent;
    return true;
  }
  if (what == "v") {
    form->AddY(NodeUnknown(nodes()[1]), 1.0);
    form->AddY(NodeUnknown(nodes()[0]), -1.0);
    *dim = dims::kVoltage;
    return true;
  }
  return false;
}

}  // namespace lcc
