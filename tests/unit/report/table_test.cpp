// SPDX-License-Identifier: Apache-2.0
// print_table() prints what Table::print prints, holding all rows or reading its source twice.
#include "report/table.h"

#include <catch2/catch.hpp>
#include <sstream>

namespace {

using cw::report::Table;

const std::vector<Table::Column> kColumns{
    {"id", Table::Align::Right}, {"name"}, {"state"}, {"reasons"}};

const std::vector<std::vector<std::string>> kRows{
    {"7", "nitrate", "active", ""},
    {"12345", "µg-chloride", "awaiting-review", "superseded, expired"},
    {"88", "x", "stale", "expired"},
};

std::string whole(const std::vector<std::vector<std::string>>& rows) {
  Table t(kColumns);
  for (const auto& r : rows) t.add_row(r);
  std::ostringstream out;
  t.print(out);
  return out.str();
}

}  // namespace

TEST_CASE("print_table: the text of Table::print, whether the rows are held or read twice",
          "[report]") {
  const auto max_held =
      GENERATE(std::size_t{0}, std::size_t{1}, std::size_t{2}, std::size_t{3}, std::size_t{100});
  INFO("max_held " << max_held);
  int readings = 0;
  const cw::report::RowSource source = [&](const cw::report::RowSink& sink) {
    ++readings;
    for (const auto& r : kRows) sink(r);
  };
  std::ostringstream out;
  CHECK(cw::report::print_table(out, kColumns, source, max_held) == kRows.size());
  CHECK(out.str() == whole(kRows));
  CHECK(readings == (max_held >= kRows.size() ? 1 : 2));
}

TEST_CASE("print_table: nothing at all without rows", "[report]") {
  std::ostringstream out;
  const cw::report::RowSource none = [](const cw::report::RowSink&) {};
  CHECK(cw::report::print_table(out, kColumns, none, 10) == 0);
  CHECK(out.str().empty());
}
