// SPDX-License-Identifier: Apache-2.0
// Canonical rows read from PostgreSQL. The column's logical type (row_form.h) says how to read
// its text; the server has already checked that the value has the column's type.
#include "store/postgresql/rows.h"

#include <algorithm>
#include <mutex>
#include <stdexcept>
#include <string_view>

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

const char* returning_canonical(const char* insert_sql, FactTable table) {
  static std::mutex guard;
  static std::map<std::pair<const char*, FactTable>, std::string> made;
  const std::lock_guard<std::mutex> lock(guard);
  auto& text = made[{insert_sql, table}];
  if (text.empty()) {
    constexpr std::string_view kTail = " RETURNING id";
    const std::string_view sql(insert_sql);
    if (sql.size() < kTail.size() || sql.substr(sql.size() - kTail.size()) != kTail) {
      throw std::logic_error(std::string("not an INSERT ... RETURNING id: ") + insert_sql);
    }
    const std::string select = select_of(form_of(table), "");
    const std::string columns = select.substr(7, select.find(" FROM ") - 7);  // after "SELECT "
    text = std::string(sql.substr(0, sql.size() - kTail.size())) + " RETURNING " + columns;
  }
  return text.c_str();
}

std::string PayloadBuilder::payload(const std::vector<std::pair<FactTable, std::int64_t>>& rows,
                                    const ReturnedRows& returned) {
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
    std::map<std::int64_t, nlohmann::json> found;
    std::string list_text = "{";
    for (auto id : ids) {
      if (auto known = returned.find({table, id}); known != returned.end()) {
        found.emplace(id, known->second);
        continue;
      }
      if (list_text.size() > 1) list_text += ',';
      list_text += std::to_string(id);
    }
    if (list_text.size() > 1) {
      const TableForm& form = form_of(table);
      auto& select = by_ids_[table];
      if (!select) {
        select = std::make_unique<Statement>(
            db_, select_of(form, " WHERE id = ANY(:ids::bigint[]) ORDER BY id"));
      }
      select->reset();
      select->bind(":ids", list_text + "}");
      while (select->executeStep()) {
        nlohmann::json row = canonical_row(*select, form, db_.path);
        const std::int64_t id = row.at("id").get<std::int64_t>();
        found.emplace(id, std::move(row));
      }
      select->reset();
    }
    if (found.size() != ids.size()) {
      throw std::logic_error("rows of " + name + " vanished before audit");
    }
    nlohmann::json list = nlohmann::json::array();
    for (auto& [id, row] : found) list.push_back(std::move(row));
    payload[name] = std::move(list);
  }
  return payload.dump();
}

}  // namespace cw::store::postgresql
