// SPDX-License-Identifier: Apache-2.0
// Points-file validation.
#include "import/points_file.h"

#include <map>
#include <set>

#include "audit/sha256.h"
#include "core/clean_text.h"
#include "core/error.h"
#include "core/number.h"
#include "core/text.h"
#include "fitting/fit.h"
#include "import/csv.h"
#include "import/input_file.h"

namespace cw::import {
namespace {

class RowReader {
 public:
  RowReader(const CsvTable& t, const CsvRecord& r) : t_(t), r_(r) {}

  [[noreturn]] void fail(const std::string& column, const std::string& message,
                         std::string hint = {}) const {
    SourceLocation where{
        t_.file(), r_.line,
        t_.has_column(column) ? std::optional<long>(t_.column_number(column)) : std::nullopt,
        t_.field_name(column)};
    throw ValidationError(where, message, std::move(hint));
  }

  const std::string& text(const std::string& column) const { return t_.field(r_, column); }

  /// The field as free text (clean_text), the error naming the line and column.
  std::string clean(const std::string& column, std::size_t max_chars) const {
    try {
      return clean_text(text(column), t_.label(column), max_chars);
    } catch (const ValidationError& e) {
      fail(column, e.what(), e.hint());
    }
  }

  double number(const std::string& column) const {
    const std::string& s = text(column);
    if (s.empty()) fail(column, t_.label(column) + " is empty", "give a number");
    try {
      return decimal_or_throw(s, t_.label(column));
    } catch (const ValidationError& e) {
      fail(column, e.what(), e.hint());
    }
  }

  std::optional<double> optional_number(const std::string& column) const {
    if (!t_.has_column(column) || text(column).empty()) return std::nullopt;
    return number(column);
  }

 private:
  const CsvTable& t_;
  const CsvRecord& r_;
};

}  // namespace

const std::set<std::string>& points_file_required_columns() {
  static const std::set<std::string> names = {"analyte", "level", "nominal", "response"};
  return names;
}

const std::set<std::string>& points_file_optional_columns() {
  static const std::set<std::string> names = {"replicate", "is_response", "exclude", "unit"};
  return names;
}

PointsFile parse_points_text(const std::string& file_name, const std::string& text,
                             const MethodDefinition& method, const HeaderMapping* mapping) {
  const CsvTable table = CsvTable::parse(file_name, text, points_file_required_columns(),
                                         points_file_optional_columns(), mapping);
  const bool uses_is = method.internal_standard.has_value();
  if (uses_is && !table.has_column("is_response")) {
    throw ValidationError(SourceLocation{file_name, 1, std::nullopt, "is_response"},
                          "method " + quote(method.code) + " uses the internal standard " +
                              quote(*method.internal_standard) +
                              ", but the file has no 'is_response' column",
                          "add the internal-standard response of every calibrator");
  }
  PointsFile out;
  out.file_name = file_name;
  out.ignored_columns = table.header().ignored();
  out.sha256 = audit::sha256_hex(text);
  std::map<std::tuple<std::string, std::string, int>, long>
      seen;  // (analyte, level, replicate) -> line
  std::map<std::pair<std::string, std::string>, double>
      level_nominal;  // (analyte, level) -> nominal
  std::map<std::pair<std::string, double>, std::string>
      nominal_level;  // (analyte, nominal) -> level
  std::map<std::pair<std::string, std::string>, long> level_line;
  for (const auto& record : table.records()) {
    RowReader r(table, record);
    PointRow row;
    row.line = record.line;
    row.analyte = r.text("analyte");
    if (row.analyte.empty()) r.fail("analyte", table.label("analyte") + " is empty");
    if (!method.has_analyte(row.analyte)) {
      std::string list;
      for (const auto& a : method.analytes) list += (list.empty() ? "" : ", ") + a;
      r.fail("analyte",
             "unknown analyte " + quote(row.analyte) + " for method " + quote(method.code),
             "the method's analytes are: " + list);
    }
    if (r.text("level").empty())
      r.fail("level", table.label("level") + " is empty",
             "name the calibration level, e.g. 1, 2, 3 or L1");
    row.level = r.clean("level", kMaxLabelChars);
    if (table.has_column("replicate") && !r.text("replicate").empty()) {
      auto rep = parse_integer(r.text("replicate"));
      if (!rep || *rep < 1 || *rep > 1000) {
        r.fail("replicate", table.label("replicate") + " must be a whole number from 1, got " +
                                quote(r.text("replicate")));
      }
      row.replicate = static_cast<int>(*rep);
    }
    row.nominal = r.number("nominal");
    if (row.nominal < 0) {
      r.fail("nominal", table.label("nominal") + " is negative (" + r.text("nominal") + ")",
             "concentrations cannot be below zero");
    }
    row.response = r.number("response");
    row.is_response = r.optional_number("is_response");
    if (uses_is) {
      if (!row.is_response)
        r.fail("is_response",
               table.label("is_response") + " is empty; the method uses an internal standard");
      if (*row.is_response <= 0) {
        r.fail("is_response",
               table.label("is_response") + " must be above 0, got " + r.text("is_response"),
               "the internal-standard response divides the analyte response");
      }
      row.y = row.response / *row.is_response;
    } else {
      if (row.is_response) {
        r.fail("is_response",
               "method " + quote(method.code) + " has no internal standard, but " +
                   table.label("is_response") + " is given",
               "leave the column empty or remove it");
      }
      row.y = row.response;
    }
    if (table.has_column("unit") && !r.text("unit").empty() && r.text("unit") != method.unit) {
      r.fail("unit",
             "unit " + quote(r.text("unit")) + " is not the method's unit " + quote(method.unit),
             "convert the nominal concentrations to " + method.unit);
    }
    if (table.has_column("exclude") && !trim(r.text("exclude")).empty())
      row.exclude_reason = r.clean("exclude", kMaxReasonChars);
    // Weights that need a positive value at every fitted point (calibration-practice.md §1.3).
    const auto weighting = method.calibration.weighting;
    if (!row.exclude_reason) {
      if ((weighting == fitting::Weighting::InvX || weighting == fitting::Weighting::InvX2) &&
          row.nominal <= 0) {
        r.fail("nominal",
               "nominal 0 cannot be weighted by " + std::string(fitting::to_string(weighting)) +
                   " (method " + quote(method.code) + ")",
               "give the blank or zero level a reason in the " + table.label("exclude") +
                   " column: it is kept, not "
                   "fitted");
      }
      if ((weighting == fitting::Weighting::InvY || weighting == fitting::Weighting::InvY2) &&
          row.y <= 0) {
        r.fail("response",
               "a response of 0 or less cannot be weighted by " +
                   std::string(fitting::to_string(weighting)) + " (method " + quote(method.code) +
                   ")",
               "exclude the point with a reason in the " + table.label("exclude") + " column");
      }
    }

    const auto key = std::make_tuple(row.analyte, row.level, row.replicate);
    if (auto it = seen.find(key); it != seen.end()) {
      r.fail("level",
             "analyte " + quote(row.analyte) + " level " + quote(row.level) + " replicate " +
                 std::to_string(row.replicate) + " already appears on line " +
                 std::to_string(it->second),
             "number replicates with a " + table.label("replicate") + " column (1, 2, 3, ...)");
    }
    seen.emplace(key, row.line);
    const auto level_key = std::make_pair(row.analyte, row.level);
    if (auto it = level_nominal.find(level_key); it != level_nominal.end()) {
      if (it->second != row.nominal) {
        r.fail("nominal",
               "level " + quote(row.level) + " of " + quote(row.analyte) + " has nominal " +
                   format_plain(it->second) + " on line " + std::to_string(level_line[level_key]) +
                   " but " + format_plain(row.nominal) + " here",
               "all replicates of a level share one nominal concentration");
      }
    } else {
      level_nominal.emplace(level_key, row.nominal);
      level_line.emplace(level_key, row.line);
      const auto nominal_key = std::make_pair(row.analyte, row.nominal);
      if (auto other = nominal_level.find(nominal_key); other != nominal_level.end()) {
        r.fail("level",
               "levels " + quote(other->second) + " and " + quote(row.level) + " of " +
                   quote(row.analyte) + " have the same nominal " + format_plain(row.nominal),
               "give each level its own label only once; use " + table.label("replicate") +
                   " for repeats");
      }
      nominal_level.emplace(nominal_key, row.level);
    }
    out.rows.push_back(std::move(row));
  }

  // Enough distinct, fitted levels for the model to have a residual degree of freedom.
  const int needed = fitting::min_levels_to_fit(method.calibration.model);
  for (const auto& analyte : method.analytes) {
    std::set<double> levels;
    bool present = false;
    long first_line = 0;
    for (const auto& row : out.rows) {
      if (row.analyte != analyte) continue;
      if (!present) first_line = row.line;
      present = true;
      if (!row.exclude_reason) levels.insert(row.nominal);
    }
    if (!present) continue;
    out.analytes.push_back(analyte);
    if (static_cast<int>(levels.size()) < needed) {
      throw ValidationError(SourceLocation{file_name, first_line, std::nullopt, "level"},
                            "analyte " + quote(analyte) + " has " + std::to_string(levels.size()) +
                                " distinct level(s) that are not excluded; the " +
                                std::string(fitting::to_string(method.calibration.model)) +
                                " model needs at least " + std::to_string(needed) +
                                " to be fitted at all",
                            "add calibration levels (the method asks for " +
                                std::to_string(method.calibration.min_levels) + ")");
    }
  }
  return out;
}

PointsFile read_points_file(const std::string& path, const MethodDefinition& method,
                            const HeaderMapping* mapping) {
  return parse_points_text(recorded_name(path),
                           read_text_file(path, kMaxPointsFileBytes, "--points"), method, mapping);
}

}  // namespace cw::import
