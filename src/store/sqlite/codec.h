// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: JSON forms of values kept in TEXT columns (method definitions,
// fit statistics, acceptance findings, lists of typed tokens). A stored form that does not parse
// is a damaged store: the readers throw StoreError (exit 4), never guess another value.
#pragma once

#include <nlohmann/json.hpp>

#include "domain/check.h"
#include "domain/method.h"
#include "domain/run.h"
#include "fitting/acceptance.h"
#include "fitting/fit.h"

#include <string>
#include <vector>

#include "audit/json_text.h"
#include "core/time.h"

namespace cw::store::sqlite {

nlohmann::json method_definition_to_json(const MethodDefinition& d);
MethodDefinition method_definition_from_json(const nlohmann::json& j);

/// Every number of the fit except the per-point table (kept in curve_points).
nlohmann::json fit_to_json(const fitting::FitResult& f);
fitting::FitResult fit_from_json(const nlohmann::json& j);

nlohmann::json acceptance_to_json(const fitting::Acceptance& a);
fitting::Acceptance acceptance_from_json(const nlohmann::json& j);

/// A column mapping as a JSON object {name: header}; read back, anything else is a damaged
/// store (StoreError naming `where`).
nlohmann::json column_mapping_to_json(const ColumnMapping& m);
ColumnMapping column_mapping_from_json(const nlohmann::json& j, const std::string& where,
                                       const std::string& path);

[[noreturn]] void throw_unknown_token(const std::string& text, const std::string& where,
                                      const std::string& path);

/// Parses stored JSON text; a StoreError naming `where` when it is not JSON.
nlohmann::json parse_stored_json(const std::string& text, const std::string& where,
                                 const std::string& path);

/// A JSON array of the text forms of `values`.
template <class E>
std::string tokens_json(const std::vector<E>& values) {
  std::string out = "[";
  for (const auto& v : values) {
    if (out.size() > 1) out += ',';
    audit::append_json_string(out, to_string(v));
  }
  return out + "]";
}

/// A result's uncertainty budget as stored: compact JSON, keys sorted.
std::string uncertainty_json(const ResultUncertainty& u);

/// Parses a stored enum token with `parse`; a StoreError naming `where` when it is unknown.
template <class Parse>
auto stored_enum(Parse parse, const std::string& text, const std::string& where,
                 const std::string& path) -> typename decltype(parse(text))::value_type {
  auto v = parse(text);
  if (!v) throw_unknown_token(text, where, path);
  return *v;
}

/// Parses a stored JSON array of tokens with `parse`.
template <class Parse>
auto stored_enum_list(Parse parse, const std::string& text, const std::string& where,
                      const std::string& path) {
  using E = typename decltype(parse(std::string_view{}))::value_type;
  std::vector<E> out;
  const nlohmann::json list = parse_stored_json(text, where, path);
  if (!list.is_array()) throw_unknown_token(text, where, path);
  for (const auto& item : list) {
    if (!item.is_string()) throw_unknown_token(item.dump(), where, path);
    out.push_back(stored_enum(parse, item.get<std::string>(), where, path));
  }
  return out;
}

/// Parses a stored instant or date; a StoreError naming `where` when it does not parse.
Instant stored_instant(const std::string& text, const std::string& where, const std::string& path);
CalendarDate stored_date(const std::string& text, const std::string& where,
                         const std::string& path);

}  // namespace cw::store::sqlite
