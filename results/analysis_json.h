// CaseAnalysis to and from JSON (nlohmann::json). The field names are the
// struct's, units in the names; a file written by one version and read by a
// later one takes defaults for fields it lacks.
#pragma once

#include <nlohmann/json.hpp>
#include <string>

#include "results/analysis.h"

namespace lcc {

nlohmann::json ToJson(const CaseAnalysis& a);
// Throws std::runtime_error (with the reason) on a malformed document.
CaseAnalysis CaseAnalysisFromJson(const nlohmann::json& j);

}  // namespace lcc
