// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: binding values to named parameters and reading columns.
// SQLiteCpp 3.2 has no optional or string_view binds. A non-finite real never reaches a
// statement: the boundary refuses it as bad input, and this last guard refuses it as a fault.
#pragma once

#include <SQLiteCpp/SQLiteCpp.h>

#include <cmath>
#include <cstdint>
#include <nlohmann/json.hpp>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

#include "core/time.h"
#include "domain/ids.h"
#include "store/sqlite/codec.h"

namespace cw::store::sqlite {

inline void bind_text(SQLite::Statement& s, const char* name, const std::string& v) {
  s.bind(name, v);
}
inline void bind_opt_text(SQLite::Statement& s, const char* name,
                          const std::optional<std::string>& v) {
  if (v) {
    s.bind(name, *v);
  } else {
    s.bind(name);
  }
}
inline void bind_int(SQLite::Statement& s, const char* name, std::int64_t v) {
  s.bind(name, v);
}
inline void bind_opt_int(SQLite::Statement& s, const char* name,
                         const std::optional<std::int64_t>& v) {
  if (v) {
    s.bind(name, *v);
  } else {
    s.bind(name);
  }
}
inline void bind_real(SQLite::Statement& s, const char* name, double v) {
  if (!std::isfinite(v)) {
    throw std::logic_error(std::string("a non-finite value was about to be stored in ") + name);
  }
  s.bind(name, v);
}
inline void bind_opt_real(SQLite::Statement& s, const char* name, const std::optional<double>& v) {
  if (v) {
    bind_real(s, name, *v);
  } else {
    s.bind(name);
  }
}
inline void bind_instant(SQLite::Statement& s, const char* name, Instant t) {
  if (!in_supported_range(t)) {
    throw std::logic_error(
        std::string("a time outside the years 1-9999 was about to be stored in ") + name);
  }
  s.bind(name, format_utc(t));
}
/// A list of ids as one JSON array, for `IN (SELECT value FROM json_each(:ids))`.
template <class Tag>
void bind_ids(SQLite::Statement& s, const char* name, const std::vector<Id<Tag>>& ids) {
  nlohmann::json list = nlohmann::json::array();
  for (const auto& id : ids) list.push_back(id.value);
  s.bind(name, list.dump());
}
template <class Tag>
std::optional<std::int64_t> opt_id(const std::optional<Id<Tag>>& id) {
  if (!id) return std::nullopt;
  return id->value;
}

inline std::optional<std::string> opt_text(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getString();
}
inline std::optional<double> opt_real(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getDouble();
}
inline std::optional<std::int64_t> opt_int(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getInt64();
}

}  // namespace cw::store::sqlite
