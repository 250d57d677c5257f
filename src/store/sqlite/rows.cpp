// SPDX-License-Identifier: Apache-2.0
// Canonical rows read from SQLite.
#include "store/sqlite/rows.h"

#include <sqlite3.h>

#include <algorithm>
#include <array>
#include <charconv>
#include <cmath>
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

/// The columns of a form in key order (nlohmann's objects sort their keys), computed once.
const std::vector<std::size_t>& key_order(const TableForm& form) {
  static std::map<FactTable, std::vector<std::size_t>> orders;
  auto [it, inserted] = orders.try_emplace(form.table);
  if (inserted) {
    for (std::size_t i = 0; i < form.columns.size(); ++i) it->second.push_back(i);
    std::sort(it->second.begin(), it->second.end(), [&](std::size_t a, std::size_t b) {
      return form.columns[a].name < form.columns[b].name;
    });
  }
  return it->second;
}

}  // namespace

void append_canonical_row_text(std::string& out, SQLite::Statement& s, const TableForm& form,
                               const std::string& path) {
  // One type query per column (the hot path of `audit verify` and of every audit entry
  // written).
  out += '{';
  bool first = true;
  for (const std::size_t i : key_order(form)) {
    const Column& column = form.columns[i];
    const SQLite::Column c = s.getColumn(static_cast<int>(i));
    const int type = c.getType();
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
      case ColumnType::Boolean: {
        if (type != SQLITE_INTEGER) wrong_kind();
        std::array<char, 24> buffer{};
        const auto [end, ec] =
            std::to_chars(buffer.data(), buffer.data() + buffer.size(), c.getInt64());
        out.append(buffer.data(), static_cast<std::size_t>(end - buffer.data()));
        break;
      }
      case ColumnType::Real: {
        if (type != SQLITE_FLOAT) wrong_kind();
        audit::append_json_number(out, c.getDouble());
        break;
      }
      case ColumnType::Text:
      case ColumnType::Instant:
      case ColumnType::Date:
      case ColumnType::Json: {
        if (type != SQLITE_TEXT) wrong_kind();
        audit::append_json_string(
            out, std::string_view(c.getText(), static_cast<std::size_t>(c.getBytes())));
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
      select = std::make_unique<SQLite::Statement>(*db_.db, select_of(form, " WHERE id = :id"));
    }
    if (out.size() > 1) out += ',';
    out += '"';
    out += name;
    out += "\":[";
    for (bool first = true; i < named.size() && named[i].name == name; ++i, first = false) {
      select->reset();
      select->bind(1, named[i].id);
      if (!select->executeStep()) {
        throw std::logic_error("row " + std::string(name) + "/" + std::to_string(named[i].id) +
                               " vanished before audit");
      }
      if (!first) out += ',';
      append_canonical_row_text(out, *select, form, db_.path);
    }
    select->reset();
    out += ']';
  }
  out += '}';
  return out;
}

}  // namespace cw::store::sqlite
