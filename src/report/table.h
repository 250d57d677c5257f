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

/// A table printed row by row, with column widths fixed in advance, for listings too long to
/// hold in memory: a cell wider than its column pushes the rest of its row to the right.
class StreamTable {
 public:
  StreamTable(std::ostream& out, std::vector<Table::Column> columns,
              std::vector<std::size_t> widths, int indent = 0)
      : out_(out), columns_(std::move(columns)), widths_(std::move(widths)), indent_(indent) {}
  void header();
  void row(const std::vector<std::string>& cells);

 private:
  std::ostream& out_;
  std::vector<Table::Column> columns_;
  std::vector<std::size_t> widths_;
  int indent_;
};

/// Display width of UTF-8 text (code points; good enough for the symbols we print).
std::size_t display_width(const std::string& s);

}  // namespace cw::report
