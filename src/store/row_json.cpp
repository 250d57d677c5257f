// SPDX-License-Identifier: Apache-2.0
// Canonical JSON of fact rows.
#include "store/row_json.h"

#include <algorithm>
#include <map>

#include "core/error.h"

namespace cw::store {

std::string_view table_name(FactTable t) {
  switch (t) {
    case FactTable::LabSettings:
      return "lab_settings";
    case FactTable::Instruments:
      return "instruments";
    case FactTable::InstrumentServiceEvents:
      return "instrument_service_events";
    case FactTable::Methods:
      return "methods";
    case FactTable::MethodVersions:
      return "method_versions";
    case FactTable::Lots:
      return "lots";
    case FactTable::LotValues:
      return "lot_values";
    case FactTable::LotWithdrawals:
      return "lot_withdrawals";
    case FactTable::Calibrations:
      return "calibrations";
    case FactTable::CalibrationLots:
      return "calibration_lots";
    case FactTable::Curves:
      return "curves";
    case FactTable::CurvePoints:
      return "curve_points";
    case FactTable::CurveReviews:
      return "curve_reviews";
    case FactTable::CurveRetirements:
      return "curve_retirements";
    case FactTable::Refusals:
      return "refusals";
    case FactTable::Checks:
      return "checks";
    case FactTable::Results:
      return "results";
  }
  return "";
}

nlohmann::json row_to_json(SQLite::Statement& s) {
  nlohmann::json row = nlohmann::json::object();
  const int n = s.getColumnCount();
  for (int i = 0; i < n; ++i) {
    SQLite::Column c = s.getColumn(i);
    const std::string name = s.getColumnName(i);
    if (c.isInteger()) {
      row[name] = c.getInt64();
    } else if (c.isFloat()) {
      row[name] = c.getDouble();
    } else if (c.isText()) {
      row[name] = c.getString();
    } else if (c.isNull()) {
      row[name] = nullptr;
    } else {
      row[name] = "<blob>";  // no fact column holds a BLOB
    }
  }
  return row;
}

std::string payload_of_rows(Connection::Impl& impl,
                            const std::vector<std::pair<FactTable, std::int64_t>>& rows) {
  std::map<std::string, std::vector<std::int64_t>> by_table;
  for (const auto& [table, id] : rows) by_table[std::string(table_name(table))].push_back(id);
  nlohmann::json payload = nlohmann::json::object();
  for (auto& [name, ids] : by_table) {
    std::sort(ids.begin(), ids.end());
    // One statement per table; the name is one of the fixed identifiers above.
    SQLite::Statement select(*impl.db, "SELECT * FROM " + name + " WHERE id = :id");
    nlohmann::json list = nlohmann::json::array();
    for (auto id : ids) {
      select.reset();
      select.bind(":id", id);
      if (!select.executeStep()) {
        throw std::logic_error("row " + name + "/" + std::to_string(id) + " vanished before audit");
      }
      list.push_back(row_to_json(select));
    }
    payload[name] = std::move(list);
  }
  return payload.dump();
}

}  // namespace cw::store
