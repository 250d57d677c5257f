// SPDX-License-Identifier: Apache-2.0
// The canonical row form the audit chain hashes, defined once for every backend: per fact table,
// its columns with logical types. A row becomes a JSON object {column: value} with keys sorted,
// integers and booleans as integers, reals as shortest round-trip numbers, text, instants, dates
// and JSON documents as strings, NULL as null (DEVELOPERS.md, "The audit trail"). The form is
// the one every store written so far was hashed with, so existing trails verify unchanged. A
// column added to a table by a later migration (`added_later`) is part of a row's canonical form
// only when it holds a value: rows written before it existed keep their bytes and their hash.
#pragma once

#include <cstdint>
#include <nlohmann/json.hpp>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <variant>

#include "store/fact_table.h"

namespace cw::store {

/// What a column holds, independent of how a backend stores it.
enum class ColumnType {
  Integer,  ///< 64-bit integer (ids, counts)
  Boolean,  ///< 0 or 1 in the canonical form
  Real,     ///< finite double
  Text,     ///< UTF-8 text
  Instant,  ///< UTC instant as YYYY-MM-DDTHH:MM:SSZ
  Date,     ///< calendar date as YYYY-MM-DD
  Json,     ///< a JSON document kept as text
};

struct Column {
  std::string_view name;
  ColumnType type;
  bool nullable = false;
  /// Added by a migration after the table was created: nullable, and left out of the canonical
  /// row when NULL.
  bool added_later = false;
};

struct TableForm {
  FactTable table;
  std::string_view name;
  std::span<const Column> columns;  ///< in the table's column order
};

/// The form of one fact table.
const TableForm& form_of(FactTable table);

/// One value read from a backend, before it becomes canonical JSON.
using CellValue = std::variant<std::monostate, std::int64_t, double, std::string>;

/// The canonical JSON of a value of `column` (throws std::logic_error when the value's kind does
/// not fit the column, e.g. text in an integer column: a damaged store).
nlohmann::json canonical_value(const Column& column, const CellValue& value);

}  // namespace cw::store
