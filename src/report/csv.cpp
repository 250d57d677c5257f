// SPDX-License-Identifier: Apache-2.0
// CSV listings.
#include "report/csv.h"

#include <algorithm>

#include "core/text.h"

namespace cw::report {

const std::vector<CsvListing>& csv_listings() {
  static const std::vector<CsvListing> listings{
      {"instrument list", "instruments", {"code", "name", "registered_at", "in_service"}},
      {"method list",
       "methods",
       {"code", "title", "latest_version", "version_in_force", "registered_at"}},
      {"lot list",
       "lots",
       {"code", "material", "certificate", "coverage_factor", "expires_on", "opened_on",
        "in_use_days", "in_use_expires_on", "effective_expires_on", "usable_until", "status",
        "withdrawn_at", "withdrawal_reason", "registered_at", "values"}},
      {"curve list",
       "curves",
       {"id", "analyte", "method", "method_version", "instrument", "state", "reasons",
        "acquired_at", "expires_at", "verdict"}},
      {"expiring",
       "curves",
       {"id", "analyte", "method", "method_version", "instrument", "expires_at", "limited_by"}},
      {"status",
       "instruments",
       {"instrument", "in_service", "counts.rejected", "counts.awaiting-review", "counts.active",
        "counts.stale", "counts.retired", "expiring_7_days", "blocked", "recent_failed_checks"}},
      {"trace curve",
       "results",
       {"result_id",
        "status",
        "sample",
        "analyte",
        "curve_id",
        "response",
        "is_response",
        "replicates",
        "dilution",
        "concentration",
        "ci_low",
        "ci_high",
        "censored",
        "reporting_limit",
        "computed_concentration",
        "uncertainty.expanded",
        "uncertainty.k",
        "flags",
        "reasons",
        "analyst",
        "at"}},
      {"trace lot",
       "results",
       {"lot",
        "result_id",
        "status",
        "sample",
        "analyte",
        "released",
        "censored",
        "concentration",
        "reporting_limit",
        "ci_low",
        "ci_high",
        "uncertainty.expanded",
        "unit",
        "flags",
        "reasons",
        "curve_id",
        "method",
        "method_version",
        "instrument",
        "at"}},
      {"run list",
       "runs",
       {"run_id", "file_name", "file_sha256", "method", "method_version", "instrument",
        "acquired_at", "analyst", "rows", "again_reason", "unit", "summary"}},
      {"result list",
       "results",
       {"result_id",
        "status",
        "recorded_status",
        "rerun.reason",
        "run_id",
        "run_position",
        "sample",
        "analyte",
        "curve_id",
        "response",
        "is_response",
        "replicates",
        "dilution",
        "concentration",
        "ci_low",
        "ci_high",
        "censored",
        "reporting_limit",
        "computed_concentration",
        "uncertainty.expanded",
        "uncertainty.k",
        "unit",
        "flags",
        "reasons",
        "analyst",
        "at"}},
      {"check list",
       "checks",
       {"check_id", "curve_id", "run_id", "kind", "at", "nominal", "response", "is_response",
        "measured", "recovery_pct", "limit_low", "limit_high", "passed", "analyst"}},
      {"trend", "points", {"check_id", "at", "recovery_pct", "z", "passed", "curve_id", "run_id"}},
      {"audit log",
       "entries",
       {"seq", "recorded_at", "occurred_at", "actor", "action", "entity_kind", "entity_id",
        "reason", "back_dated", "clock_overridden", "tool_version", "values", "prev_hash", "hash",
        "os_login"}},
      {"user list",
       "users",
       {"code", "name", "role", "status", "permissions", "registered_at", "changed_at", "locked"}},
  };
  return listings;
}

const CsvListing* csv_listing(std::string_view command) {
  const auto& all = csv_listings();
  const auto it = std::find_if(all.begin(), all.end(),
                               [&](const CsvListing& l) { return l.command == command; });
  return it == all.end() ? nullptr : &*it;
}

namespace {

const Json* field(const Json& row, std::string_view path) {
  const Json* at = &row;
  while (true) {
    const auto dot = path.find('.');
    const std::string key(path.substr(0, dot));
    if (!at->is_object()) return nullptr;
    const auto it = at->find(key);
    if (it == at->end()) return nullptr;
    at = &*it;
    if (dot == std::string_view::npos) return at;
    path.remove_prefix(dot + 1);
  }
}

std::string scalar_text(const Json& v) {
  if (v.is_null()) return "";
  if (v.is_boolean()) return v.get<bool>() ? "true" : "false";
  if (v.is_number_integer()) return std::to_string(v.get<std::int64_t>());
  if (v.is_number_unsigned()) return std::to_string(v.get<std::uint64_t>());
  if (v.is_number_float()) return format_shortest(v.get<double>());
  if (v.is_string()) return v.get<std::string>();
  return v.dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
}

}  // namespace

std::string csv_cell(const Json& value) {
  if (value.is_array()) {
    const bool flat = std::all_of(value.begin(), value.end(), [](const Json& v) {
      return v.is_string() || v.is_number() || v.is_boolean();
    });
    if (!flat) return value.dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
    std::string out;
    for (const auto& v : value) out += (out.empty() ? "" : ";") + scalar_text(v);
    return out;
  }
  return scalar_text(value);
}

std::string csv_quote(std::string_view text, bool is_number) {
  std::string s(text);
  bool quote = false;
  if (!is_number && !s.empty() && (s[0] == '=' || s[0] == '+' || s[0] == '-' || s[0] == '@')) {
    s.insert(s.begin(), '\'');
    quote = true;
  }
  if (s.find_first_of(",\"\r\n") != std::string::npos) quote = true;
  if (!s.empty() && (s.front() == ' ' || s.back() == ' ' || s.front() == '\t')) quote = true;
  if (!quote) return s;
  std::string out = "\"";
  for (char c : s) {
    if (c == '"') out += '"';
    out += c;
  }
  return out + "\"";
}

void CsvWriter::header() {
  for (std::size_t i = 0; i < listing_.columns.size(); ++i) {
    out_ << (i ? "," : "") << csv_quote(listing_.columns[i]);
  }
  out_ << "\r\n";
}

void CsvWriter::row(const Json& row) {
  for (std::size_t i = 0; i < listing_.columns.size(); ++i) {
    const Json* v = field(row, listing_.columns[i]);
    out_ << (i ? "," : "") << (v ? csv_quote(csv_cell(*v), v->is_number()) : std::string());
  }
  out_ << "\r\n";
}

void write_csv(std::ostream& out, const Json& document, const CsvListing& listing) {
  CsvWriter writer(out, listing);
  writer.header();
  const Json* rows = field(document, listing.rows);
  if (rows == nullptr || !rows->is_array()) return;
  for (const auto& row : *rows) writer.row(row);
}

}  // namespace cw::report
