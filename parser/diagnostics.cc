#include "parser/diagnostics.h"

#include <fmt/format.h>

namespace lcc {
namespace {

// Lines longer than this are shown as a window around the column.
constexpr std::size_t kShownLineBytes = 100;

const char* SeverityWord(Severity s) {
  switch (s) {
    case Severity::kError: return "error";
    case Severity::kWarning: return "warning";
    case Severity::kNote: return "note";
  }
  return "error";
}

// Renders the offending line and a caret; unprintable bytes become '?' so
// binary input cannot upset the terminal.
std::string LineAndCaret(const SourceLoc& loc) {
  std::string_view line = loc.file->LineText(loc.line());
  // Byte index of the column within the line.
  std::size_t byte_col = 0;
  {
    // Counted once: column() walks the line from its start, and asked at
    // each step it made a long line's caret quadratic (a fuzzed 8 000-byte
    // line took two seconds for its 50 diagnostics).
    const int column = loc.column();
    int col = 1;
    while (byte_col < line.size() && col < column) {
      ++byte_col;
      while (byte_col < line.size() &&
             (static_cast<unsigned char>(line[byte_col]) & 0xC0) == 0x80)
        ++byte_col;
      ++col;
    }
  }
  std::size_t first = 0;
  std::string prefix;
  if (line.size() > kShownLineBytes) {
    first = byte_col > kShownLineBytes / 2 ? byte_col - kShownLineBytes / 2 : 0;
    while (first > 0 && (static_cast<unsigned char>(line[first]) & 0xC0) == 0x80) --first;
    if (first > 0) prefix = "...";
  }
  std::size_t last = std::min(line.size(), first + kShownLineBytes);
  while (last < line.size() && (static_cast<unsigned char>(line[last]) & 0xC0) == 0x80) ++last;
  std::string shown = prefix;
  std::string caret(prefix.size(), ' ');
  for (std::size_t i = first; i < last; ++i) {
    unsigned char c = static_cast<unsigned char>(line[i]);
    const bool printable = c == '\t' || c >= 0x20;
    shown.push_back(printable && c != 0x7F ? static_cast<char>(c) : '?');
    if (i < byte_col && (c & 0xC0) != 0x80) caret.push_back(c == '\t' ? '\t' : ' ');
  }
  if (last < line.size()) shown += "...";
  caret.push_back('^');
  return "    " + shown + "\n    " + caret + "\n";
}

}  // namespace

void Diagnostics::Add(Severity s, const SourceLoc& loc, std::string message,
                      std::string hint) {
  if (s == Severity::kError) {
    if (error_count_ >= max_errors_) return;
    ++error_count_;
  }
  items_.push_back({s, loc, std::move(message), std::move(hint)});
}

void Diagnostics::Error(const SourceLoc& loc, std::string message, std::string hint) {
  Add(Severity::kError, loc, std::move(message), std::move(hint));
}
void Diagnostics::Warning(const SourceLoc& loc, std::string message, std::string hint) {
  Add(Severity::kWarning, loc, std::move(message), std::move(hint));
}
void Diagnostics::Note(const SourceLoc& loc, std::string message, std::string hint) {
  Add(Severity::kNote, loc, std::move(message), std::move(hint));
}

std::string Diagnostics::Format(const Diagnostic& d) {
  std::string out;
  if (d.loc.valid()) {
    out = fmt::format("{}:{}:{}: {}: {}\n", d.loc.file->path(), d.loc.line(),
                      d.loc.column(), SeverityWord(d.severity), d.message);
    out += LineAndCaret(d.loc);
  } else {
    out = fmt::format("lccsim: {}: {}\n", SeverityWord(d.severity), d.message);
  }
  if (!d.hint.empty()) out += "    hint: " + d.hint + "\n";
  return out;
}

std::string Diagnostics::Format() const {
  std::string out;
  for (const auto& d : items_) out += Format(d);
  if (saturated()) out += fmt::format("lccsim: stopped after {} errors\n", max_errors_);
  return out;
}

}  // namespace lcc
