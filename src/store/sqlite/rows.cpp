// SPDX-License-Identifier: Apache-2.0
// Canonical rows read from SQLite.
#include "store/sqlite/rows.h"

#include <sqlite3.h>

#include <algorithm>
#include <array>
#include <cstring>
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

/// A column of a form, and its key as the canonical text writes it ("name":).
struct Key {
  std::size_t index;
  std::string text;
};

/// The columns of each form in key order (nlohmann's objects sort their keys), computed once.
const std::vector<Key>& key_order(const TableForm& form) {
  static const auto orders = [] {
    std::array<std::vector<Key>, kAllFactTables.size()> out;
    for (const FactTable t : kAllFactTables) {
      const TableForm& f = form_of(t);
      auto& order = out[static_cast<std::size_t>(t)];
      for (std::size_t i = 0; i < f.columns.size(); ++i) {
        order.push_back({i, '"' + std::string(f.columns[i].name) + "\":"});
      }
      std::sort(order.begin(), order.end(), [&](const Key& a, const Key& b) {
        return f.columns[a.index].name < f.columns[b.index].name;
      });
    }
    return out;
  }();
  return orders[static_cast<std::size_t>(form.table)];
}

/// The columns of a row as SQLite gives them, by index in the form's order.
class StatementRow {
 public:
  explicit StatementRow(sqlite3_stmt* s) : s_(s) {}
  int type(int i) const { return sqlite3_column_type(s_, i); }
  std::int64_t integer(int i) const { return sqlite3_column_int64(s_, i); }
  void append_real(std::string& out, int i) const {
    audit::append_json_real(out, sqlite3_column_double(s_, i));
  }
  std::string_view text(int i) const {
    const auto* data = reinterpret_cast<const char*>(sqlite3_column_text(s_, i));
    return {data, static_cast<std::size_t>(sqlite3_column_bytes(s_, i))};
  }

 private:
  sqlite3_stmt* s_;
};

/// The columns of a copied row, as StatementRow gives those of the row it was copied from.
class CopiedColumns {
 public:
  CopiedColumns(const CopiedRow& row, audit::RealWriter& reals) : row_(row), reals_(reals) {}
  int type(int i) const { return cell(i).type; }
  std::int64_t integer(int i) const { return cell(i).integer; }
  void append_real(std::string& out, int i) const { reals_.append(out, cell(i).real); }
  std::string_view text(int i) const { return cell(i).text; }

 private:
  const CopiedRow::Cell& cell(int i) const { return row_.cells[static_cast<std::size_t>(i)]; }
  const CopiedRow& row_;
  audit::RealWriter& reals_;
};

/// The canonical JSON text of one row, from either source: one writer, so that what an entry
/// records and what `verify` recomputes cannot drift apart.
template <class Row>
void write_row_text(std::string& out, const Row& row, const TableForm& form,
                    const std::string& path) {
  out += '{';
  bool first = true;
  for (const Key& key : key_order(form)) {
    const Column& column = form.columns[key.index];
    const int index = static_cast<int>(key.index);
    const int type = row.type(index);
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
    out += key.text;
    if (type == SQLITE_NULL) {
      out += "null";
      continue;
    }
    switch (column.type) {
      case ColumnType::Integer:
      case ColumnType::Boolean:
        if (type != SQLITE_INTEGER) wrong_kind();
        audit::append_json_integer(out, row.integer(index));
        break;
      case ColumnType::Real:
        if (type != SQLITE_FLOAT) wrong_kind();
        row.append_real(out, index);
        break;
      case ColumnType::Text:
      case ColumnType::Instant:
      case ColumnType::Date:
      case ColumnType::Json:
        if (type != SQLITE_TEXT) wrong_kind();
        audit::append_json_string(out, row.text(index));
        break;
    }
  }
  out += '}';
}

template <class T>
void append_bytes(std::string& out, const T& value) {
  out.append(reinterpret_cast<const char*>(&value), sizeof value);
}

template <class T>
T read_bytes(std::string_view& in) {
  if (in.size() < sizeof(T)) throw std::logic_error("a copied row cut short");
  T value;
  std::memcpy(&value, in.data(), sizeof value);
  in.remove_prefix(sizeof value);
  return value;
}

}  // namespace

void append_canonical_row_text(std::string& out, sqlite3_stmt* row, const TableForm& form,
                               const std::string& path) {
  write_row_text(out, StatementRow(row), form, path);
}

void copy_row(std::string& out, sqlite3_stmt* s, const TableForm& form) {
  out += static_cast<char>(form.table);
  const int columns = static_cast<int>(form.columns.size());
  for (int i = 0; i < columns; ++i) {
    // One look-up of the column, its value then read as it is.
    sqlite3_value* value = sqlite3_column_value(s, i);
    const int type = sqlite3_value_type(value);
    out += static_cast<char>(type);
    switch (type) {
      case SQLITE_INTEGER:
        append_bytes(out, static_cast<std::int64_t>(sqlite3_value_int64(value)));
        break;
      case SQLITE_FLOAT:
        append_bytes(out, sqlite3_value_double(value));
        break;
      case SQLITE_TEXT: {
        const auto* data = reinterpret_cast<const char*>(sqlite3_value_text(value));
        const auto bytes = static_cast<std::uint32_t>(sqlite3_value_bytes(value));
        append_bytes(out, bytes);
        out.append(data, bytes);
        break;
      }
      default:  // NULL; a blob, refused when its text is written
        break;
    }
  }
}

void read_copied_row(std::string_view& in, CopiedRow& row) {
  const auto table = static_cast<std::size_t>(read_bytes<unsigned char>(in));
  if (table >= kAllFactTables.size()) throw std::logic_error("a copied row of no table");
  row.table = static_cast<FactTable>(table);
  const TableForm& form = form_of(row.table);
  if (form.columns.size() > CopiedRow::kMaxColumns) {
    throw std::logic_error("a copied row with too many columns");
  }
  for (std::size_t i = 0; i < form.columns.size(); ++i) {
    CopiedRow::Cell& cell = row.cells[i];
    cell.type = read_bytes<unsigned char>(in);
    switch (cell.type) {
      case SQLITE_INTEGER:
        cell.integer = read_bytes<std::int64_t>(in);
        break;
      case SQLITE_FLOAT:
        cell.real = read_bytes<double>(in);
        break;
      case SQLITE_TEXT: {
        const auto bytes = read_bytes<std::uint32_t>(in);
        if (in.size() < bytes) throw std::logic_error("a copied row cut short");
        cell.text = in.substr(0, bytes);
        in.remove_prefix(bytes);
        break;
      }
      default:
        break;
    }
  }
}

void append_canonical_row_text(std::string& out, const CopiedRow& row, audit::RealWriter& reals,
                               const std::string& path) {
  write_row_text(out, CopiedColumns(row, reals), form_of(row.table), path);
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
