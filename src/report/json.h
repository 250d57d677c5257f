// SPDX-License-Identifier: Apache-2.0
// JSON output conventions: fields in a stable order, instants as UTC ISO-8601 with Z,
// non-finite numbers as null.
#pragma once

#include <nlohmann/json.hpp>
#include <optional>
#include <ostream>
#include <string>
#include <vector>

#include "core/time.h"

namespace cw::report {

using Json = nlohmann::ordered_json;

inline Json json_instant(Instant t) {
  return format_utc(t);
}
inline Json json_number(double v) {
  return std::isfinite(v) ? Json(v) : Json(nullptr);
}
inline Json json_number(const std::optional<double>& v) {
  return v ? json_number(*v) : Json(nullptr);
}
template <class T>
Json json_optional(const std::optional<T>& v) {
  return v ? Json(*v) : Json(nullptr);
}
/// Writes `j` as pretty JSON (2-space indent, like every document) starting `indent` spaces in,
/// for documents written piece by piece (long listings).
void write_json(std::ostream& out, const Json& j, int indent);

/// A JSON array of the text forms of typed values (reasons, flags, criteria).
template <class E>
Json tokens(const std::vector<E>& values) {
  Json list = Json::array();
  for (const auto& v : values) list.push_back(std::string(to_string(v)));
  return list;
}

}  // namespace cw::report
