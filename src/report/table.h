// SPDX-License-Identifier: Apache-2.0
// Plain-text tables for terminal output: a header row, aligned columns, no borders.
#pragma once

#include <cstddef>
#include <functional>
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

/// Takes the rows of a table one at a time.
using RowSink = std::function<void(std::vector<std::string> cells)>;
/// Hands every row of a table to the sink, in order; called again, it hands the same rows.
using RowSource = std::function<void(const RowSink&)>;

/// Prints the rows of `rows` exactly as Table::print would (the header, then column widths that
/// fit every row) while holding at most `max_held` rows: a longer table is read a second time
/// and each row printed as it comes, with the widths found by the first reading. Prints nothing
/// when there are no rows; returns how many there are.
std::size_t print_table(std::ostream& out, std::vector<Table::Column> columns,
                        const RowSource& rows, std::size_t max_held, int indent = 0);

/// Display width of UTF-8 text (code points; good enough for the symbols we print).
std::size_t display_width(const std::string& s);

}  // namespace cw::report
