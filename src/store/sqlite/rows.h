// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: fact rows in the canonical form of row_form.h, for audit
// payloads (written) and verification (recomputed from the tables).
#pragma once

#include <SQLiteCpp/SQLiteCpp.h>
#include <sqlite3.h>

#include <array>
#include <cstdint>
#include <map>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "audit/json_text.h"
#include "store/fact_table.h"
#include "store/row_form.h"
#include "store/sqlite/database.h"
#include "store/sqlite/scan.h"

namespace cw::store::sqlite {

/// "SELECT <columns of the form> FROM <table>" + `tail` (the identifiers are fixed).
std::string select_of(const TableForm& form, const std::string& tail);

/// The current row of `s` (selected with select_of) as canonical JSON; a StoreError when a
/// value does not fit its column.
nlohmann::json canonical_row(SQLite::Statement& s, const TableForm& form, const std::string& path);

/// Appends the current row of `s` (selected with select_of) as canonical JSON text: exactly
/// canonical_row(...).dump(), written straight from the columns without building a JSON object
/// (the hot path of `audit verify`). Same checks and errors as canonical_row.
void append_canonical_row_text(std::string& out, sqlite3_stmt* s, const TableForm& form,
                               const std::string& path);

/// Appends the current row of `s` (selected with select_of(form, ...)) to `out` as it is stored:
/// its table, then each column's kind and value in the form's order, copied (`audit verify`
/// copies the rows on the thread that reads the store and writes their text on another).
void copy_row(std::string& out, sqlite3_stmt* s, const TableForm& form);

/// A row copied by copy_row, read back: its table and its columns, viewing the copy.
struct CopiedRow {
  struct Cell {
    int type =
        SQLITE_NULL;  ///< SQLITE_INTEGER, SQLITE_FLOAT, SQLITE_TEXT, SQLITE_BLOB, SQLITE_NULL
    std::int64_t integer = 0;
    double real = 0;
    std::string_view text;
  };
  static constexpr std::size_t kMaxColumns = 32;

  FactTable table{};
  std::array<Cell, kMaxColumns> cells;
};

/// Reads the row copy_row wrote at the start of `in` into `row`, and moves `in` past it.
void read_copied_row(std::string_view& in, CopiedRow& row);

/// Appends a copied row as canonical JSON text: the same bytes, checks and errors as
/// append_canonical_row_text on the statement it was copied from (its reals written by `reals`).
void append_canonical_row_text(std::string& out, const CopiedRow& row, audit::RealWriter& reals,
                               const std::string& path);

/// The payload of an audit entry: {"table": [row, ...], ...}, tables sorted by name, rows by id,
/// serialised compactly. This text is what the entry's hash covers.
class PayloadBuilder {
 public:
  explicit PayloadBuilder(Database& db) : db_(db) {}
  std::string payload(const std::vector<std::pair<FactTable, std::int64_t>>& rows);

 private:
  Database& db_;
  std::map<FactTable, std::unique_ptr<Scan>> by_id_;
};

}  // namespace cw::store::sqlite
