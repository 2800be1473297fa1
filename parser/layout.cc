#include "parser/layout.h"

#include <fmt/format.h>

#include <memory>
#include <string_view>

namespace lcc {
namespace {

struct Opener {
  char bracket;
  std::size_t offset;
};

char Closing(char open) { return open == '(' ? ')' : open == '[' ? ']' : '}'; }

// Indentation width of the line that starts at `begin` (tab stops of 8).
int IndentOf(const std::string& text, std::size_t begin) {
  int width = 0;
  for (std::size_t i = begin; i < text.size(); ++i) {
    if (text[i] == ' ') ++width;
    else if (text[i] == '\t') width = (width / 8 + 1) * 8;
    else break;
  }
  return width;
}

// First significant character of the line starting at `begin`: 0 for a blank
// or comment-only line.
char FirstSignificant(const std::string& text, std::size_t begin) {
  for (std::size_t i = begin; i < text.size(); ++i) {
    char c = text[i];
    if (c == ' ' || c == '\t' || c == '\r') continue;
    if (c == '\n' || c == '#') return 0;
    return c;
  }
  return 0;
}

// Returns the offset of the first byte that is not valid UTF-8 text (NUL,
// a stray continuation byte or a truncated sequence), or npos.
std::size_t FirstNonText(const std::string& text) {
  for (std::size_t i = 0; i < text.size();) {
    unsigned char c = static_cast<unsigned char>(text[i]);
    if (c == 0) return i;
    int extra = c < 0x80 ? 0 : (c >> 5) == 0x6 ? 1 : (c >> 4) == 0xE ? 2 : (c >> 3) == 0x1E ? 3 : -1;
    if (extra < 0) return i;
    for (int k = 1; k <= extra; ++k) {
      if (i + k >= text.size() ||
          (static_cast<unsigned char>(text[i + k]) & 0xC0) != 0x80)
        return i;
    }
    i += extra + 1;
  }
  return std::string::npos;
}

}  // namespace

Layout LayOut(const std::shared_ptr<const SourceFile>& file_ptr, Diagnostics& diags) {
  const SourceFile& file = *file_ptr;
  const std::string& text = file.text();
  Layout out;
  out.clean = text;
  auto loc = [&](std::size_t offset) { return SourceLoc{file_ptr, offset}; };

  if (std::size_t bad = FirstNonText(text); bad != std::string::npos) {
    diags.Error(loc(bad),
                fmt::format("this is not a text file (byte 0x{:02X} is not UTF-8 text)",
                            static_cast<unsigned char>(text[bad])),
                "a netlist is plain UTF-8 text");
    return out;
  }

  std::vector<Opener> open;       // brackets and braces not yet closed
  bool in_statement = false;      // inside a statement (at any block depth)
  int statement_indent = 0;       // indentation of the current statement
  bool last_was_brace = false;    // last significant char was '{'
  std::size_t top_begin = 0;      // start of the current top-level statement
  bool top_open = false;          // a top-level statement has begun
  std::size_t line_begin = 0;
  std::size_t last_significant = 0;  // one past the last significant byte
  char previous = '\n';             // previous significant character
  int nesting_ops = 0;               // '^' and unary signs in this statement

  auto brace_depth = [&] {
    int d = 0;
    for (const auto& o : open) d += o.bracket == '{';
    return d;
  };
  bool failed = false;
  auto close_top = [&](std::size_t end) {
    if (top_open && end - top_begin > kMaxStatementBytes) {
      diags.Error(loc(top_begin), fmt::format("statement is longer than {} bytes", kMaxStatementBytes),
                  "split it, or use param statements for long expressions");
    } else if (top_open && !failed) {
      out.statements.push_back({top_begin, end});
    }
    top_open = false;
    failed = false;
    nesting_ops = 0;
  };

  for (std::size_t i = 0; i < text.size(); ++i) {
    char c = text[i];
    if (c == '#') {
      while (i < text.size() && text[i] != '\n') out.clean[i++] = ' ';
      --i;
      continue;
    }
    if (c == '\n') {
      const bool in_bracket = !open.empty() && open.back().bracket != '{';
      std::size_t next = i + 1;
      char next_char = FirstSignificant(text, next);
      // Inside brackets a statement always goes on; otherwise a line
      // indented deeper than the statement's first continues it.
      const bool continues = in_bracket || (in_statement && !last_was_brace && next_char != 0 && next_char != '}' &&
                                            IndentOf(text, next) > statement_indent);
      if (continues) {
        out.clean[i] = ' ';
      } else {
        in_statement = false;
        if (brace_depth() == 0) close_top(last_significant);
      }
      line_begin = next;
      continue;
    }
    if (c == ' ' || c == '\t' || c == '\r') continue;
    if (static_cast<unsigned char>(c) < 0x20 || c == 0x7F) {
      diags.Error(loc(i), fmt::format("unexpected control character 0x{:02X}",
                                      static_cast<unsigned char>(c)));
      out.clean[i] = ' ';
      continue;
    }

    // A significant character. Unary signs and '^' nest in the grammar just
    // like brackets do, so they count against the same limit.
    const bool unary_sign = (c == '-' || c == '+') &&
                            std::string_view("=(,*/^+-[").find(previous) != std::string_view::npos;
    if ((c == '^' || unary_sign) && ++nesting_ops > kMaxBracketNesting && !failed) {
      diags.Error(loc(i), fmt::format("expression nested deeper than {} levels", kMaxBracketNesting),
                  "simplify the expression");
      failed = true;
    }
    previous = c;
    if (!in_statement) {
      in_statement = true;
      statement_indent = IndentOf(text, line_begin);
    }
    if (!top_open) {
      top_open = true;
      top_begin = i;
    }
    last_was_brace = false;

    if (c == '"') {
      std::size_t start = i++;
      while (i < text.size() && text[i] != '"' && text[i] != '\n') ++i;
      if (i >= text.size() || text[i] != '"') {
        diags.Error(loc(start), "unterminated string", "close it with '\"' on the same line");
        return out;
      }
      last_significant = i + 1;
      continue;
    }
    if (c == '(' || c == '[' || c == '{') {
      open.push_back({c, i});
      if (static_cast<int>(open.size()) > kMaxBracketNesting) {
        diags.Error(loc(i), fmt::format("brackets nested deeper than {} levels",
                                        kMaxBracketNesting),
                    "simplify the expression");
        return out;
      }
      if (c == '{') {
        last_was_brace = true;
        in_statement = false;  // the block's first statement starts afresh
      }
    } else if (c == ')' || c == ']' || c == '}') {
      if (open.empty()) {
        diags.Error(loc(i), fmt::format("'{}' closes nothing", c));
        return out;
      }
      if (Closing(open.back().bracket) != c) {
        const auto& o = open.back();
        diags.Error(loc(i), fmt::format("'{}' does not match '{}' opened at line {}, column {}",
                                        c, o.bracket, file.LineOf(o.offset), file.ColumnOf(o.offset)));
        return out;
      }
      open.pop_back();
      if (c == '}') in_statement = true;  // the block statement ends on this line
    }
    last_significant = i + 1;
  }
  if (!open.empty()) {
    const auto& o = open.back();
    diags.Error(loc(o.offset), fmt::format("'{}' is never closed", o.bracket),
                fmt::format("add '{}'", Closing(o.bracket)));
    return out;
  }
  close_top(last_significant);
  return out;
}

}  // namespace lcc
