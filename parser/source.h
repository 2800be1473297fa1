// Source text and positions in it.
//
// A SourceFile owns the text of one netlist file and answers "which line and
// column is byte offset k". Columns count UTF-8 code points, so a caret under
// a line that holds 'Ω' or 'µ' still lands on the right character.
// SourceLoc is what every AST node and every device keeps, so that a message
// about a device can always name the file and line it came from.
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

namespace lcc {

class SourceFile {
 public:
  SourceFile(std::string path, std::string text);

  const std::string& path() const { return path_; }
  const std::string& text() const { return text_; }

  // 1-based line of a byte offset (offsets past the end map to the last line).
  int LineOf(std::size_t offset) const;
  // 1-based column, counted in UTF-8 code points from the start of the line.
  int ColumnOf(std::size_t offset) const;
  // The text of a 1-based line, without its line break.
  std::string_view LineText(int line) const;

 private:
  std::string path_;
  std::string text_;
  std::vector<std::size_t> line_starts_;
};

struct SourceLoc {
  std::shared_ptr<const SourceFile> file;
  std::size_t offset = 0;

  bool valid() const { return file != nullptr; }
  int line() const { return file ? file->LineOf(offset) : 0; }
  int column() const { return file ? file->ColumnOf(offset) : 0; }
  // "path:line" or "<generated>" for things made by the program itself.
  std::string Where() const;
};

}  // namespace lcc
