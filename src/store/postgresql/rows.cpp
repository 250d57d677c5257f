// SPDX-License-Identifier: Apache-2.0
// Canonical rows read from PostgreSQL. The column's logical type (row_form.h) says how to read
// its text; the server has already checked that the value has the column's type.
#include "store/postgresql/rows.h"

#include <algorithm>
#include <stdexcept>

namespace cw::store::postgresql {

std::string select_of(const TableForm& form, const std::string& tail) {
  std::string sql = "SELECT ";
  for (std::size_t i = 0; i < form.columns.size(); ++i) {
    sql += (i ? ", " : "") + std::string(form.columns[i].name);
  }
  return sql + " FROM " + std::string(form.name) + tail;
}

nlohmann::json canonical_row(Statement& s, const TableForm& form, const std::string& path) {
  nlohmann::json row = nlohmann::json::object();
  for (std::size_t i = 0; i < form.columns.size(); ++i) {
    const store::Column& column = form.columns[i];
    const postgresql::Column c = s.getColumn(static_cast<int>(i));
    CellValue value;
    try {
      if (!c.isNull()) {
        switch (column.type) {
          case ColumnType::Integer:
          case ColumnType::Boolean:
            value = c.getInt64();
            break;
          case ColumnType::Real:
            value = c.getDouble();
            break;
          case ColumnType::Text:
          case ColumnType::Instant:
          case ColumnType::Date:
          case ColumnType::Json:
            value = c.getString();
            break;
        }
      }
      if (column.added_later && std::holds_alternative<std::monostate>(value)) continue;
      row[std::string(column.name)] = canonical_value(column, value);
    } catch (const std::logic_error& e) {
      // A value of the wrong kind (pqxx::conversion_error is one too).
      damaged(path, std::string(form.name) + "." + std::string(column.name) + ": " + e.what());
    }
  }
  return row;
}

std::string PayloadBuilder::payload(const std::vector<std::pair<FactTable, std::int64_t>>& rows) {
  std::map<std::string, std::pair<FactTable, std::vector<std::int64_t>>> by_table;
  for (const auto& [table, id] : rows) {
    auto& slot = by_table[std::string(table_name(table))];
    slot.first = table;
    slot.second.push_back(id);
  }
  nlohmann::json payload = nlohmann::json::object();
  for (auto& [name, entry] : by_table) {
    auto& [table, ids] = entry;
    std::sort(ids.begin(), ids.end());
    const TableForm& form = form_of(table);
    auto& select = by_ids_[table];
    if (!select) {
      select = std::make_unique<Statement>(
          db_, select_of(form, " WHERE id = ANY(:ids::bigint[]) ORDER BY id"));
    }
    std::string list_text = "{";
    for (auto id : ids) {
      if (list_text.size() > 1) list_text += ',';
      list_text += std::to_string(id);
    }
    select->reset();
    select->bind(":ids", list_text + "}");
    nlohmann::json list = nlohmann::json::array();
    while (select->executeStep()) list.push_back(canonical_row(*select, form, db_.path));
    select->reset();
    if (list.size() != ids.size()) {
      throw std::logic_error("rows of " + name + " vanished before audit");
    }
    payload[name] = std::move(list);
  }
  return payload.dump();
}

}  // namespace cw::store::postgresql
