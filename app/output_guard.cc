#include "app/output_guard.h"

#include <fmt/format.h>

#include <cctype>
#include <cerrno>
#include <cstring>
#include <cmath>
#include <filesystem>
#include <fstream>

#include "engine/simulator.h"

namespace lcc {

namespace fs = std::filesystem;

std::string PrepareOutputFolder(const std::string& dir, bool overwrite) {
  std::error_code ec;
  const fs::path path(dir);
  if (fs::exists(path, ec) && !fs::is_directory(path, ec))
    return fmt::format("'{}' exists and is not a folder; choose another --out", dir);
  const bool ours = fs::exists(path / kOutputMarker, ec);
  if (fs::is_directory(path, ec) && !ours && !overwrite && !fs::is_empty(path, ec))
    return fmt::format(
        "'{}' is not empty and was not written by lccsim; choose another --out, empty it, or pass "
        "--overwrite to write into it anyway (files of the same names are replaced)",
        dir);
  fs::create_directories(path, ec);
  if (ec) return fmt::format("cannot create '{}': {}", dir, ec.message());
  if (!ours) {
    std::ofstream marker(path / kOutputMarker);
    marker << "This folder holds results written by lccsim; it may write here again.\n";
    if (!marker) return fmt::format("cannot write in '{}': {}", dir, std::strerror(errno));
  }
  return {};
}

WaveformEstimate EstimateWaveformBytes(const Study& study, const std::set<std::string>& formats, std::size_t cases) {
  WaveformEstimate e;
  e.cases = cases;
  e.columns = study.probes.size();
  if (!study.simulate || e.columns == 0) return e;
  const double dt = OutputInterval(study);
  if (!(dt > 0)) return e;
  const double samples = std::ceil(study.simulate->stop / dt) + 1;  // cast only once known to fit
  e.samples = samples >= 1.8e19 ? UINT64_MAX : static_cast<std::uint64_t>(samples);
  double per_value = 0.0;
  if (formats.count("csv")) per_value += 16.0;
  if (formats.count("comtrade")) per_value += 12.0;
  const double bytes = per_value * static_cast<double>(e.samples) * static_cast<double>(e.columns + 1) *
                       static_cast<double>(cases);
  e.bytes = bytes >= 1.8e19 ? UINT64_MAX : static_cast<std::uint64_t>(bytes);
  return e;
}

bool ParseByteSize(const std::string& text, std::uint64_t* bytes) {
  std::size_t used = 0;
  double value = 0.0;
  try {
    value = std::stod(text, &used);
  } catch (...) {
    return false;
  }
  std::string unit = text.substr(used);
  while (!unit.empty() && std::isspace(static_cast<unsigned char>(unit.front()))) unit.erase(0, 1);
  double scale = 1.0;
  if (unit == "" || unit == "B") scale = 1.0;
  else if (unit == "kB" || unit == "KB") scale = 1e3;
  else if (unit == "MB") scale = 1e6;
  else if (unit == "GB") scale = 1e9;
  else if (unit == "TB") scale = 1e12;
  else return false;
  if (!(value >= 0) || !std::isfinite(value * scale) || value * scale >= 1.8e19) return false;
  *bytes = static_cast<std::uint64_t>(value * scale);
  return true;
}

std::string FormatBytes(double bytes) {
  if (bytes >= 1e9) return fmt::format("{:.3g} GB", bytes / 1e9);
  if (bytes >= 1e6) return fmt::format("{:.3g} MB", bytes / 1e6);
  if (bytes >= 1e3) return fmt::format("{:.3g} kB", bytes / 1e3);
  return fmt::format("{:.0f} B", bytes);
}

}  // namespace lcc
