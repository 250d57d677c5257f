// SPDX-License-Identifier: Apache-2.0
// Canonical rows read from SQLite.
#include "store/sqlite/rows.h"

#include <sqlite3.h>

#include <algorithm>
#include <array>
#include <stdexcept>
#include <string_view>

#include "audit/json_text.h"

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

namespace {

/// The columns of each form in key order (nlohmann's objects sort their keys), computed once.
const std::vector<std::size_t>& key_order(const TableForm& form) {
  static const auto orders = [] {
    std::array<std::vector<std::size_t>, kAllFactTables.size()> out;
    for (const FactTable t : kAllFactTables) {
      const TableForm& f = form_of(t);
      auto& order = out[static_cast<std::size_t>(t)];
      for (std::size_t i = 0; i < f.columns.size(); ++i) order.push_back(i);
      std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
        return f.columns[a].name < f.columns[b].name;
      });
    }
    return out;
  }();
  return orders[static_cast<std::size_t>(form.table)];
}

}  // namespace

void append_canonical_row_text(std::string& out, sqlite3_stmt* row, const TableForm& form,
                               const std::string& path) {
  // One type look-up per column, no Column objects.
  out += '{';
  bool first = true;
  for (const std::size_t i : key_order(form)) {
    const Column& column = form.columns[i];
    const int index = static_cast<int>(i);
    const int type = sqlite3_column_type(row, index);
    const auto wrong_kind = [&] {
      damaged(path, std::string(form.name) + ": a value of the wrong kind in column " +
                        std::string(column.name));
    };
    if (type == SQLITE_NULL) {
      if (column.added_later) continue;
      if (!column.nullable) {
        damaged(path, std::string(form.name) + ": NULL in the non-null column " +
                          std::string(column.name));
      }
    } else if (type == SQLITE_BLOB) {
      damaged(path, std::string(form.name) + "." + std::string(column.name) + " holds a blob");
    }
    if (!first) out += ',';
    first = false;
    out += '"';
    out += column.name;
    out += "\":";
    if (type == SQLITE_NULL) {
      out += "null";
      continue;
    }
    switch (column.type) {
      case ColumnType::Integer:
      case ColumnType::Boolean:
        if (type != SQLITE_INTEGER) wrong_kind();
        audit::append_json_integer(out, sqlite3_column_int64(row, index));
        break;
      case ColumnType::Real:
        if (type != SQLITE_FLOAT) wrong_kind();
        audit::append_json_real(out, sqlite3_column_double(row, index));
        break;
      case ColumnType::Text:
      case ColumnType::Instant:
      case ColumnType::Date:
      case ColumnType::Json: {
        if (type != SQLITE_TEXT) wrong_kind();
        const auto* text = reinterpret_cast<const char*>(sqlite3_column_text(row, index));
        const auto bytes = static_cast<std::size_t>(sqlite3_column_bytes(row, index));
        audit::append_json_string(out, std::string_view(text, bytes));
        break;
      }
    }
  }
  out += '}';
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
