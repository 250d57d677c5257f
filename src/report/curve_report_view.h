// SPDX-License-Identifier: Apache-2.0
// The printable calibration report of one curve, filled from the facts the app read: every
// number formatted here, once, the same way the text views print it.
#pragma once

#include <string>

#include "app/reports.h"
#include "plot/curve_report.h"

namespace cw::report {

/// Who made the report and when (the PDF's creation date is `generated_at`, so the same store
/// and the same CURVEWARDEN_NOW give the same bytes).
struct ReportOrigin {
  Instant generated_at;
  std::string generated_by;
  std::string tool_version;
};

plot::CurveReport curve_report_of(const app::CurveReportFacts& facts, const LabZone& zone,
                                  const ReportOrigin& origin);

}  // namespace cw::report
