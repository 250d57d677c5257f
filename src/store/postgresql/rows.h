// SPDX-License-Identifier: Apache-2.0
// Internal to the PostgreSQL backend: fact rows in the canonical form of row_form.h, for audit
// payloads (written) and verification (recomputed from the tables), byte for byte the form the
// SQLite backend writes.
#pragma once

#include <cstdint>
#include <map>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>
#include <utility>
#include <vector>

#include "store/fact_table.h"
#include "store/postgresql/database.h"
#include "store/row_form.h"

namespace cw::store::postgresql {

/// "SELECT <columns of the form> FROM <table>" + `tail` (the identifiers are fixed).
std::string select_of(const TableForm& form, const std::string& tail);

/// The current row of `s` (selected with select_of) as canonical JSON; a StoreError when a
/// value does not fit its column.
nlohmann::json canonical_row(Statement& s, const TableForm& form, const std::string& path);

/// `insert_sql` (an INSERT ending in "RETURNING id") returning instead every column of `table`'s
/// canonical form, in select_of()'s order, so that canonical_row() reads the row as stored
/// without a second statement. The text lives as long as the process (statements are cached by
/// its address).
const char* returning_canonical(const char* insert_sql, FactTable table);

/// Rows already in canonical form, by table and id.
using ReturnedRows = std::map<std::pair<FactTable, std::int64_t>, nlohmann::json>;

/// The payload of an audit entry: {"table": [row, ...], ...}, tables sorted by name, rows by id,
/// serialised compactly. This text is what the entry's hash covers. Rows in `returned` are taken
/// from there; the others are read back from their tables.
class PayloadBuilder {
 public:
  explicit PayloadBuilder(Database& db) : db_(db) {}
  std::string payload(const std::vector<std::pair<FactTable, std::int64_t>>& rows,
                      const ReturnedRows& returned = {});

 private:
  Database& db_;
  std::map<FactTable, std::unique_ptr<Statement>> by_ids_;
};

}  // namespace cw::store::postgresql
