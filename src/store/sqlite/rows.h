// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: fact rows in the canonical form of row_form.h, for audit
// payloads (written) and verification (recomputed from the tables).
#pragma once

#include <SQLiteCpp/SQLiteCpp.h>

#include <cstdint>
#include <map>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>
#include <utility>
#include <vector>

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
