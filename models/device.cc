#include "models/device.h"

namespace lcc {

bool Device::Signal(std::string_view what, LinearForm* form, Dim* dim) const {
  if (what == "v" && nodes_.size() == 2) {
    VoltageForm(form);
    *dim = dims::kVoltage;
    return true;
  }
  return false;
}

}  // namespace lcc
