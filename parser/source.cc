#include "parser/source.h"

#include <algorithm>

namespace lcc {

SourceFile::SourceFile(std::string path, std::string text)
    : path_(std::move(path)), text_(std::move(text)) {
  line_starts_.push_back(0);
  for (std::size_t i = 0; i < text_.size(); ++i) {
    if (text_[i] == '\n') line_starts_.push_back(i + 1);
  }
}

int SourceFile::LineOf(std::size_t offset) const {
  auto it = std::upper_bound(line_starts_.begin(), line_starts_.end(), offset);
  return static_cast<int>(it - line_starts_.begin());
}

int SourceFile::ColumnOf(std::size_t offset) const {
  const int line = LineOf(offset);
  std::size_t begin = line_starts_[line - 1];
  offset = std::min(offset, text_.size());
  int column = 1;
  for (std::size_t i = begin; i < offset; ++i) {
    // Continuation bytes of a multi-byte UTF-8 sequence do not start a column.
    if ((static_cast<unsigned char>(text_[i]) & 0xC0) != 0x80) ++column;
  }
  return column;
}

std::string_view SourceFile::LineText(int line) const {
  if (line < 1 || line > static_cast<int>(line_starts_.size())) return {};
  std::size_t begin = line_starts_[line - 1];
  std::size_t end = line < static_cast<int>(line_starts_.size())
                        ? line_starts_[line] - 1
                        : text_.size();
  std::string_view view(text_.data() + begin, end - begin);
  if (!view.empty() && view.back() == '\r') view.remove_suffix(1);
  return view;
}

std::string SourceLoc::Where() const {
  if (!file) return "<generated>";
  return file->path() + ":" + std::to_string(line());
}

}  // namespace lcc
