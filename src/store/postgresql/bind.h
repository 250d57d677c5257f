// SPDX-License-Identifier: Apache-2.0
// Internal to the PostgreSQL backend: binding values to named parameters and reading columns,
// with the names and guards of the SQLite backend's bind.h. A non-finite real never reaches a
// statement: the boundary refuses it as bad input, and this last guard refuses it as a fault.
// Lists are bound as one array parameter, read with `= ANY(:ids::bigint[])`.
#pragma once

#include <charconv>
#include <cmath>
#include <cstdint>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

#include "core/time.h"
#include "domain/ids.h"
#include "store/postgresql/database.h"
#include "store/sqlite/codec.h"

namespace cw::store::postgresql {

// The JSON forms of stored values are the same on both backends (store/sqlite/codec.h holds no
// SQL); their errors name the store's masked location.
using sqlite::acceptance_from_json;
using sqlite::acceptance_to_json;
using sqlite::column_mapping_from_json;
using sqlite::column_mapping_to_json;
using sqlite::fit_from_json;
using sqlite::fit_to_json;
using sqlite::method_definition_from_json;
using sqlite::method_definition_to_json;
using sqlite::parse_stored_json;
using sqlite::stored_date;
using sqlite::stored_enum;
using sqlite::stored_enum_list;
using sqlite::stored_instant;
using sqlite::throw_unknown_token;
using sqlite::tokens_json;

inline void bind_text(Statement& s, const char* name, const std::string& v) {
  s.bind(name, v);
}
inline void bind_opt_text(Statement& s, const char* name, const std::optional<std::string>& v) {
  if (v) {
    s.bind(name, *v);
  } else {
    s.bind(name);
  }
}
inline void bind_int(Statement& s, const char* name, std::int64_t v) {
  s.bind(name, v);
}
inline void bind_opt_int(Statement& s, const char* name, const std::optional<std::int64_t>& v) {
  if (v) {
    s.bind(name, *v);
  } else {
    s.bind(name);
  }
}
inline void bind_real(Statement& s, const char* name, double v) {
  if (!std::isfinite(v)) {
    throw std::logic_error(std::string("a non-finite value was about to be stored in ") + name);
  }
  s.bind(name, v);
}
inline void bind_opt_real(Statement& s, const char* name, const std::optional<double>& v) {
  if (v) {
    bind_real(s, name, *v);
  } else {
    s.bind(name);
  }
}
inline void bind_instant(Statement& s, const char* name, Instant t) {
  if (!in_supported_range(t)) {
    throw std::logic_error(
        std::string("a time outside the years 1-9999 was about to be stored in ") + name);
  }
  s.bind(name, format_utc(t));
}
/// One array literal ({1,"a b",NULL,2.5}) built element by element and bound as one parameter:
/// a list read with `= ANY(:ids::bigint[])`, or a column of many rows inserted by one statement
/// with `unnest(:a::bigint[], :b::text[], ...)` (one round trip instead of one per row). Each
/// element's text is what binding the value alone would send, so the stored values are the same.
class ArrayLiteral {
 public:
  void add(std::int64_t v) {
    separate();
    text_ += std::to_string(v);
  }
  void add(int v) { add(static_cast<std::int64_t>(v)); }
  void add(double v) {
    if (!std::isfinite(v)) {
      throw std::logic_error("a non-finite value was about to be stored in an array parameter");
    }
    separate();
    char buffer[64];  // the shortest text that reads back as the same double, as Statement::bind
    text_.append(buffer, std::to_chars(buffer, buffer + sizeof buffer, v).ptr);
  }
  void add(const std::string& v) {
    separate();
    text_ += '"';
    for (const char c : v) {
      if (c == '"' || c == '\\') text_ += '\\';
      text_ += c;
    }
    text_ += '"';
  }
  template <class T>
  void add(const std::optional<T>& v) {
    if (v) {
      add(*v);
    } else {
      separate();
      text_ += "NULL";
    }
  }
  void bind(Statement& s, const char* name) const { s.bind(name, text_ + "}"); }

 private:
  void separate() {
    if (text_.size() > 1) text_ += ',';
  }
  std::string text_ = "{";
};

/// A list of ids as one array literal ({1,2,3}), for `= ANY(:ids::bigint[])`.
template <class Tag>
void bind_ids(Statement& s, const char* name, const std::vector<Id<Tag>>& ids) {
  ArrayLiteral list;
  for (const auto& id : ids) list.add(id.value);
  list.bind(s, name);
}
/// A list of texts as one array literal, each element quoted, for `= ANY(:ids::text[])`.
inline void bind_texts(Statement& s, const char* name, const std::vector<std::string>& texts) {
  ArrayLiteral list;
  for (const auto& t : texts) list.add(t);
  list.bind(s, name);
}
template <class Tag>
std::optional<std::int64_t> opt_id(const std::optional<Id<Tag>>& id) {
  if (!id) return std::nullopt;
  return id->value;
}

inline std::optional<std::string> opt_text(const Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getString();
}
inline std::optional<double> opt_real(const Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getDouble();
}
inline std::optional<std::int64_t> opt_int(const Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getInt64();
}

}  // namespace cw::store::postgresql
