// SPDX-License-Identifier: Apache-2.0
// Plain-text tables.
#include "report/table.h"

#include <algorithm>

namespace cw::report {

std::size_t display_width(const std::string& s) {
  std::size_t n = 0;
  for (unsigned char c : s) {
    if ((c & 0xC0) != 0x80) ++n;
  }
  return n;
}

void Table::print(std::ostream& out, int indent) const {
  std::vector<std::size_t> width(columns_.size(), 0);
  for (std::size_t i = 0; i < columns_.size(); ++i) width[i] = display_width(columns_[i].header);
  for (const auto& row : rows_) {
    for (std::size_t i = 0; i < row.size() && i < width.size(); ++i) {
      width[i] = std::max(width[i], display_width(row[i]));
    }
  }
  auto emit = [&](const std::vector<std::string>& cells) {
    std::string line(static_cast<std::size_t>(indent), ' ');
    for (std::size_t i = 0; i < columns_.size(); ++i) {
      const std::string cell = i < cells.size() ? cells[i] : "";
      const std::size_t pad = width[i] - display_width(cell);
      const bool last = i + 1 == columns_.size();
      if (columns_[i].align == Align::Right) {
        line += std::string(pad, ' ') + cell;
      } else {
        line += cell;
        if (!last) line += std::string(pad, ' ');
      }
      if (!last) line += "  ";
    }
    while (!line.empty() && line.back() == ' ') line.pop_back();
    out << line << '\n';
  };
  std::vector<std::string> header;
  for (const auto& c : columns_) header.push_back(c.header);
  emit(header);
  for (const auto& row : rows_) emit(row);
}

std::size_t print_table(std::ostream& out, std::vector<Table::Column> columns,
                        const RowSource& rows, std::size_t max_held, int indent) {
  std::vector<std::size_t> widths(columns.size(), 0);
  for (std::size_t i = 0; i < columns.size(); ++i) widths[i] = display_width(columns[i].header);
  std::vector<std::vector<std::string>> held;
  std::size_t count = 0;
  rows([&](std::vector<std::string> cells) {
    for (std::size_t i = 0; i < cells.size() && i < widths.size(); ++i) {
      widths[i] = std::max(widths[i], display_width(cells[i]));
    }
    if (count < max_held) held.push_back(std::move(cells));
    ++count;
  });
  if (count == 0) return 0;
  StreamTable table(out, std::move(columns), std::move(widths), indent);
  table.header();
  if (count <= max_held) {
    for (const auto& cells : held) table.row(cells);
  } else {
    std::vector<std::vector<std::string>>().swap(held);
    rows([&](std::vector<std::string> cells) { table.row(cells); });
  }
  return count;
}

void StreamTable::header() {
  std::vector<std::string> cells;
  for (const auto& c : columns_) cells.push_back(c.header);
  row(cells);
}

void StreamTable::row(const std::vector<std::string>& cells) {
  std::string line(static_cast<std::size_t>(indent_), ' ');
  for (std::size_t i = 0; i < columns_.size(); ++i) {
    const std::string cell = i < cells.size() ? cells[i] : "";
    const std::size_t width = i < widths_.size() ? widths_[i] : 0;
    const std::size_t w = display_width(cell);
    const std::size_t pad = w < width ? width - w : 0;
    const bool last = i + 1 == columns_.size();
    if (columns_[i].align == Table::Align::Right) {
      line += std::string(pad, ' ') + cell;
    } else {
      line += cell;
      if (!last) line += std::string(pad, ' ');
    }
    if (!last) line += "  ";
  }
  while (!line.empty() && line.back() == ' ') line.pop_back();
  out_ << line << '\n';
}

}  // namespace cw::report
