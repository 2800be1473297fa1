// A file that appears complete or not at all.
//
// Writes go to a temporary name in the same folder; Commit() flushes,
// closes and renames it over the final name. A file never committed is
// removed by the destructor, so an interrupted run never leaves a half file
// that looks whole. Move-only; Commit() throws on any write error, the
// destructor never throws.
#pragma once

#include <fstream>
#include <string>

namespace lcc {

class AtomicFile {
 public:
  explicit AtomicFile(std::string path);
  ~AtomicFile();
  AtomicFile(AtomicFile&&) = default;
  AtomicFile& operator=(AtomicFile&&) = delete;
  AtomicFile(const AtomicFile&) = delete;
  AtomicFile& operator=(const AtomicFile&) = delete;

  std::ostream& stream() { return out_; }
  void Commit();

 private:
  std::string path_;
  std::string temp_;
  std::ofstream out_;
  bool committed_ = false;
};

// Writes `text` to `path` atomically.
void WriteFileAtomically(const std::string& path, const std::string& text);

}  // namespace lcc
