// SPDX-License-Identifier: Apache-2.0
// Reading a calibration points file (CSV, product.md §7) for one method version. Everything
// is checked before anything is written; errors name the file, line and column.
#pragma once

#include <optional>
#include <set>
#include <string>
#include <vector>

#include "domain/method.h"
#include "import/csv.h"

namespace cw::import {

struct PointRow {
  long line = 0;
  std::string analyte;
  std::string level;
  int replicate = 1;
  double nominal = 0;
  double response = 0;
  std::optional<double> is_response;
  double y = 0;  ///< response, or response / is_response with an internal standard
  std::optional<std::string> exclude_reason;
};

struct PointsFile {
  std::string file_name;
  std::string sha256;
  std::vector<PointRow> rows;                ///< in file order
  std::vector<std::string> analytes;         ///< in the method's order, those present in the file
  std::vector<std::string> ignored_columns;  ///< headers a mapping left unused
};

/// The logical columns of a points file.
const std::set<std::string>& points_file_required_columns();
const std::set<std::string>& points_file_optional_columns();

/// Reads and checks `path` against `method`: known columns, finite numbers, non-negative
/// nominals, known analytes, the method's unit, consistent levels, no duplicate
/// (analyte, level, replicate), internal-standard responses when the method uses one, and
/// enough distinct levels per analyte to fit the method's model at all.
/// With `mapping`, the file's headers are read through it (CsvHeader::read).
PointsFile read_points_file(const std::string& path, const MethodDefinition& method,
                            const HeaderMapping* mapping = nullptr);
PointsFile parse_points_text(const std::string& file_name, const std::string& text,
                             const MethodDefinition& method,
                             const HeaderMapping* mapping = nullptr);

}  // namespace cw::import
