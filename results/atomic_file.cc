#include "results/atomic_file.h"

#include <fmt/format.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <stdexcept>

namespace lcc {

AtomicFile::AtomicFile(std::string path) : path_(std::move(path)) {
  temp_ = path_ + fmt::format(".partial-{}", static_cast<long>(::getpid()));
  out_.open(temp_, std::ios::binary | std::ios::trunc);
  if (!out_) throw std::runtime_error(fmt::format("cannot create '{}'", temp_));
  out_.exceptions(std::ios::goodbit);
}

AtomicFile::~AtomicFile() {
  if (!committed_) {
    out_.close();
    std::error_code ec;
    std::filesystem::remove(temp_, ec);
  }
}

void AtomicFile::Commit() {
  errno = 0;
  out_.flush();
  const bool good = static_cast<bool>(out_);
  out_.close();
  if (!good || out_.fail()) {
    // The stream keeps no error code; errno from the failed write or close
    // usually says which (ENOSPC: the disk is full).
    const std::string why = errno != 0 ? std::strerror(errno) : "disk full or no permission?";
    std::error_code ec;
    std::filesystem::remove(temp_, ec);
    committed_ = true;
    throw std::runtime_error(fmt::format("cannot write '{}': {}", path_, why));
  }
  if (std::rename(temp_.c_str(), path_.c_str()) != 0) {
    std::error_code ec;
    std::filesystem::remove(temp_, ec);
    committed_ = true;
    throw std::runtime_error(fmt::format("cannot rename '{}' to '{}'", temp_, path_));
  }
  committed_ = true;
}

void WriteFileAtomically(const std::string& path, const std::string& text) {
  AtomicFile f(path);
  f.stream() << text;
  f.Commit();
}

}  // namespace lcc
