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
  // Tables by name, rows by id: the order of the canonical JSON object's keys and of its arrays.
  struct Named {
    std::string_view name;
    std::int64_t id;
    FactTable table;
  };
  std::vector<Named> named;
  named.reserve(rows.size());
  for (const auto& [table, id] : rows) named.push_back({table_name(table), id, table});
  std::sort(named.begin(), named.end(), [](const Named& a, const Named& b) {
    return a.name != b.name ? a.name < b.name : a.id < b.id;
  });
  std::string out = "{";
  for (std::size_t i = 0; i < named.size();) {
    const std::string_view name = named[i].name;
    const FactTable table = named[i].table;
    const TableForm& form = form_of(table);
    auto& select = by_id_[table];
    if (!select) {
      select = std::make_unique<Scan>(*db_.db, select_of(form, " WHERE id = :id"));
    }
    if (out.size() > 1) out += ',';
    out += '"';
    out += name;
    out += "\":[";
    for (bool first = true; i < named.size() && named[i].name == name; ++i, first = false) {
      select->reset();
      select->bind(1, named[i].id);
      if (!select->step()) {
        throw std::logic_error("row " + std::string(name) + "/" + std::to_string(named[i].id) +
                               " vanished before audit");
      }
      if (!first) out += ',';
      append_canonical_row_text(out, select->row(), form, db_.path);
    }
    select->reset();
    out += ']';
  }
  out += '}';
  return out;
}

}  // namespace cw::store::sqlite
