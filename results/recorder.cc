#include "results/recorder.h"

#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <cmath>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <stdexcept>

namespace lcc {
namespace {

// An unnamed file in `folder` for reading and writing, or -1 with errno.
// O_TMPFILE makes a file that never has a name; where the file system does
// not offer it, a named one is made and its name removed at once.
int OpenUnnamedFile(const std::string& folder) {
  const std::string dir = folder.empty() ? std::filesystem::temp_directory_path().string() : folder;
#ifdef O_TMPFILE
  const int fd = ::open(dir.c_str(), O_TMPFILE | O_RDWR | O_CLOEXEC, 0600);
  if (fd >= 0) return fd;
#endif
  std::string name = dir + "/.lccsim-spool-XXXXXX";
  const int named = ::mkstemp(name.data());
  if (named >= 0) ::unlink(name.c_str());
  return named;
}

// Writes all of `bytes`; false with errno on failure.
bool WriteAll(int fd, const char* data, std::size_t bytes) {
  while (bytes > 0) {
    const ssize_t n = ::write(fd, data, bytes);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) {
      if (n == 0) errno = EIO;
      return false;
    }
    data += n;
    bytes -= static_cast<std::size_t>(n);
  }
  return true;
}

// Reads exactly `bytes` at `offset`; false with errno on failure.
bool ReadAll(int fd, char* data, std::size_t bytes, off_t offset) {
  while (bytes > 0) {
    const ssize_t n = ::pread(fd, data, bytes, offset);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) {
      if (n == 0) errno = EIO;  // the file is shorter than what was written
      return false;
    }
    data += n;
    bytes -= static_cast<std::size_t>(n);
    offset += n;
  }
  return true;
}

}  // namespace

ProbeRecorder::ProbeRecorder(const std::vector<Probe>& probes, RecorderOptions options)
    : probes_(&probes), options_(std::move(options)), width_(probes.size() + 1), ranges_(probes.size()) {
  for (const auto& p : probes)
    for (const auto& slot : p.slots) derivatives_ |= !slot.yp.empty();
  if (options_.memory_bytes > 0) memory_.reserve(options_.memory_bytes / sizeof(double) + width_);
}

ProbeRecorder::~ProbeRecorder() {
  if (spool_fd_ >= 0) ::close(spool_fd_);
}

std::optional<std::vector<int>> ProbeRecorder::unknowns_read() const {
  std::vector<int> read;
  for (const auto& probe : *probes_)
    for (const auto& slot : probe.slots) slot.AppendUnknowns(&read);
  return read;
}

void ProbeRecorder::OnSample(double t, const double* y, const double* yp) {
  memory_.push_back(t);
  for (std::size_t k = 0; k + 1 < width_; ++k) {
    const double x = EvaluateProbe((*probes_)[k], y, yp);
    memory_.push_back(x);
    Range& r = ranges_[k];
    if (!std::isfinite(x)) continue;
    if (!r.any) r.min = r.max = x, r.any = true;
    if (x < r.min) r.min = x;
    if (x > r.max) r.max = x;
  }
  ++rows_;
  if (options_.memory_bytes > 0 && spool_error_.empty() && memory_.size() * sizeof(double) >= options_.memory_bytes)
    Spill();
}

void ProbeRecorder::Spill() {
  if (spool_fd_ < 0) {
    spool_fd_ = OpenUnnamedFile(options_.spool_folder);
    if (spool_fd_ < 0) {
      spool_error_ = std::string("cannot make a spool file for the waveforms: ") + std::strerror(errno);
      return;
    }
  }
  // A failed write leaves the block in memory; the rows counted as spooled
  // are those of whole blocks written, and reading stops there.
  if (!WriteAll(spool_fd_, reinterpret_cast<const char*>(memory_.data()), memory_.size() * sizeof(double))) {
    spool_error_ = std::string("cannot write the waveform spool: ") + std::strerror(errno) +
                   "; the rest of the run is kept in memory";
    return;
  }
  spooled_rows_ += memory_.size() / width_;
  memory_.clear();
}

void ProbeRecorder::ForEachRow(const std::function<void(const double* row)>& f) const {
  if (spooled_rows_ > 0) {
    // Blocks of whole rows, about 1 MB each.
    const std::size_t block_rows = std::max<std::size_t>(1, (1u << 17) / width_);
    std::vector<double> block(block_rows * width_);
    for (std::size_t first = 0; first < spooled_rows_; first += block_rows) {
      const std::size_t n = std::min(block_rows, spooled_rows_ - first);
      const auto offset = static_cast<off_t>(first * width_ * sizeof(double));
      if (!ReadAll(spool_fd_, reinterpret_cast<char*>(block.data()), n * width_ * sizeof(double), offset))
        throw std::runtime_error(std::string("cannot read the waveform spool back: ") + std::strerror(errno));
      for (std::size_t r = 0; r < n; ++r) f(block.data() + r * width_);
    }
  }
  for (std::size_t r = 0; r + width_ <= memory_.size(); r += width_) f(memory_.data() + r);
}

std::vector<double> ProbeRecorder::Column(int k) const {
  std::vector<double> x;
  x.reserve(rows_);
  ForEachRow([&](const double* row) { x.push_back(row[k + 1]); });
  return x;
}

}  // namespace lcc
