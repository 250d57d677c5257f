// SPDX-License-Identifier: Apache-2.0
// Plain-text tables for terminal output: a header row, aligned columns, no borders.
#pragma once

#include <ostream>
#include <string>
#include <vector>

namespace cw::report {

class Table {
 public:
  enum class Align { Left, Right };
  struct Column {
    std::string header;
    Align align = Align::Left;
  };

  explicit Table(std::vector<Column> columns) : columns_(std::move(columns)) {}
  void add_row(std::vector<std::string> cells) { rows_.push_back(std::move(cells)); }
  bool empty() const { return rows_.empty(); }
  /// Writes the table indented by `indent` spaces.
  void print(std::ostream& out, int indent = 0) const;

 private:
  std::vector<Column> columns_;
  std::vector<std::vector<std::string>> rows_;
};

/// Display width of UTF-8 text (code points; good enough for the symbols we print).
std::size_t display_width(const std::string& s);

}  // namespace cw::report
