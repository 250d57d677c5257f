// SPDX-License-Identifier: Apache-2.0
// Internal to the store: fact rows as canonical JSON, for audit payloads and verification.
#pragma once

#include <SQLiteCpp/SQLiteCpp.h>

#include <cstdint>
#include <nlohmann/json.hpp>
#include <string>
#include <utility>
#include <vector>

#include "store/connection_impl.h"
#include "store/fact_table.h"

namespace cw::store {

/// The current row of `s` as a JSON object {column: value}; INTEGER → integer, REAL → number,
/// TEXT → string, NULL → null.
nlohmann::json row_to_json(SQLite::Statement& s);

/// The payload of an audit entry: {"table": [row, ...], ...}, tables sorted by name, rows by
/// id, serialised compactly. This text is what the entry's hash covers.
std::string payload_of_rows(Connection::Impl& impl,
                            const std::vector<std::pair<FactTable, std::int64_t>>& rows);

}  // namespace cw::store
