// SPDX-License-Identifier: Apache-2.0
// Canonical rows read from SQLite.
#include "store/sqlite/rows.h"

#include <algorithm>
#include <stdexcept>

namespace cw::store::sqlite {

std::string select_of(const TableForm& form, const std::string& tail) {
  std::string sql = "SELECT ";
  for (std::size_t i = 0; i < form.columns.size(); ++i) {
    sql += (i ? ", " : "") + std::string(form.columns[i].name);
  }
  return sql + " FROM " + std::string(form.name) + tail;
}

nlohmann::json canonical_row(SQLite::Statement& s, const TableForm& form, const std::string& path) {
  nlohmann::json row = nlohmann::json::object();
  for (std::size_t i = 0; i < form.columns.size(); ++i) {
    const Column& column = form.columns[i];
    const SQLite::Column c = s.getColumn(static_cast<int>(i));
    CellValue value;
    if (c.isInteger()) {
      value = c.getInt64();
    } else if (c.isFloat()) {
      value = c.getDouble();
    } else if (c.isText()) {
      value = c.getString();
    } else if (!c.isNull()) {
      damaged(path, std::string(form.name) + "." + std::string(column.name) + " holds a blob");
    }
    if (column.added_later && std::holds_alternative<std::monostate>(value)) continue;
    try {
      row[std::string(column.name)] = canonical_value(column, value);
    } catch (const std::logic_error& e) {
      damaged(path, std::string(form.name) + ": " + e.what());
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
    auto& select = by_id_[table];
    if (!select) {
      select = std::make_unique<SQLite::Statement>(*db_.db, select_of(form, " WHERE id = :id"));
    }
    nlohmann::json list = nlohmann::json::array();
    for (auto id : ids) {
      select->reset();
      select->bind(":id", id);
      if (!select->executeStep()) {
        throw std::logic_error("row " + name + "/" + std::to_string(id) + " vanished before audit");
      }
      list.push_back(canonical_row(*select, form, db_.path));
    }
    select->reset();
    payload[name] = std::move(list);
  }
  return payload.dump();
}

}  // namespace cw::store::sqlite
