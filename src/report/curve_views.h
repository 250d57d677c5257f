// SPDX-License-Identifier: Apache-2.0
// Text and JSON views of curves: the fit report, the list, and the state with its reasons.
#pragma once

#include <cstddef>
#include <functional>
#include <optional>
#include <ostream>
#include <vector>

#include "app/curves.h"
#include "report/json.h"

namespace cw::report {

/// The curve object of product.md §4.1 (with more fields).
Json curve_json(const app::CurveView& v, const LabZone& zone);
Json curve_list_item_json(const app::CurveView& v);
Json reasons_json(const CurveStatus& status);
Json reason_details_json(const std::vector<Finding>& findings);

/// The fit report a chemist reads after `curve log` and `curve show`.
void print_curve_report(std::ostream& out, const app::CurveView& v, const LabZone& zone);
void print_calibration_header(std::ostream& out, const app::CurveView& first, const LabZone& zone,
                              CalibrationId id);
void print_curve_list(std::ostream& out, const std::vector<app::CurveView>& list,
                      const LabZone& zone);

/// Hands every curve of a listing to the visitor, in order; called again, it hands the same
/// curves (app::CurveListing::each).
using CurveSource = std::function<void(const std::function<void(const app::CurveView&)>&)>;
/// `curve list` as text, written as the curves come rather than built whole: the table of
/// print_curve_list() (at most kCurveRowsHeld rows are held to size its columns; a longer
/// listing is read twice). Nothing is printed before the first reading has ended.
inline constexpr std::size_t kCurveRowsHeld = 10000;
void print_curve_list(std::ostream& out, const CurveSource& curves, const LabZone& zone);

/// `curve list --json` and `--csv`, written curve by curve: the document {as_of, curves:
/// [curve_list_item_json...]}, or its CSV rows. Nothing is written before the first curve or
/// end(), so that an error found before it leaves the output to the usual error report.
class CurveListWriter {
 public:
  enum class Format { Json, Csv };
  CurveListWriter(std::ostream& out, Format format, Instant as_of);
  void add(const app::CurveView& v);
  /// Ends the document; a JSON document ends with `error` as its last member when given.
  void end(const std::optional<Json>& error = std::nullopt);
  /// True once something has been written.
  bool begun() const { return begun_; }

 private:
  void begin();

  std::ostream& out_;
  Format format_;
  Instant as_of_;
  bool begun_ = false;
  std::size_t count_ = 0;
};
/// "stale: method-revised, check-failed" and one indented line per reason with its facts.
void print_status(std::ostream& out, const CurveStatus& status, const LabZone& zone,
                  int indent = 2);

/// The fitted function as text, e.g. "y = 0.0194547 + 0.100072·x" (six significant figures).
std::string equation_text(const fitting::FitResult& f);

/// The short caution printed under reports that lead to reported values.
extern const char* const kReviewCaution;

}  // namespace cw::report
