// The readable report of one case (OUT/CASE/report.txt), formatted from its
// CaseAnalysis alone, so `lccsim report` can print it again from the saved
// analysis.json without simulating. Closed-form values stand beside the
// simulated ones with the difference; the engineering cautions come first.
#pragma once

#include <string>

#include "results/analysis.h"

namespace lcc {

std::string FormatReport(const CaseAnalysis& a);

// The caution printed at the top of every report (and in the README).
const char* EngineeringCaution();

}  // namespace lcc
