// SPDX-License-Identifier: Apache-2.0
// The report of one imported run: header, samples with their released values, checks with
// their recoveries, the bracketing outcome per analyte, the cautions and the audit entries.
#pragma once

#include <string>
#include <vector>

#include "plot/report.h"

namespace cw::plot {

/// What became of a sample's result.
enum class SampleStatus {
  Reported,       ///< a value (or "< limit") was released
  Refused,        ///< no value: the reasons say why
  RerunRequired,  ///< a bracketing check failed: the sample must be run again
};

/// One sample result as display text.
struct ReportSampleRow {
  int position = 0;  ///< position in the sequence
  std::string sample;
  std::string analyte;
  std::string result_id;  ///< may be empty
  /// What was released: "12.3 mg/L", "< 0.50 mg/L" for a censored result, "refused" when none.
  std::string value;
  bool censored = false;    ///< the value released is "< limit" (counted in the summary)
  std::string uncertainty;  ///< e.g. "± 0.42 (k = 2)"; may be empty
  std::string flags;        ///< e.g. "diluted ×10"; may be empty
  std::string reasons;      ///< why refused or flagged; may be empty
  SampleStatus status = SampleStatus::Reported;
};

/// One check standard or blank in the run.
struct ReportCheckRow {
  int position = 0;
  std::string analyte;
  std::string nominal;
  std::string measured;
  std::string recovery;  ///< e.g. "98.7 %"
  std::string limits;    ///< e.g. "90–110 %"; may be empty
  bool passed = true;
  bool blank = false;  ///< a blank (judged against its limit), not a check standard
};

/// The bracketing outcome of one analyte: counts and a sentence.
struct ReportBracketing {
  std::string analyte;
  int reported = 0;  ///< values released (censored ones included)
  int censored = 0;  ///< of which "< limit"
  int refused = 0;
  int rerun_required = 0;
  int checks_passed = 0;  ///< check standards
  int checks_failed = 0;
  int blanks_passed = 0;
  int blanks_failed = 0;
  std::string outcome;  ///< e.g. "positions 41–60 to re-run after the check at 61 failed"
};

/// Everything the run report shows.
struct RunReport {
  ReportFrame frame;
  std::string run_id;
  std::string file_name;
  std::string file_sha256;  ///< lowercase hex
  std::string method_code;
  std::string method_version;
  std::string method_title;
  std::string instrument_code;
  std::string instrument_name;  ///< may be empty
  std::string imported_at;      ///< lab-local display text
  std::string imported_by;
  std::vector<ReportSampleRow> samples;
  std::vector<ReportCheckRow> checks;
  std::vector<ReportBracketing> bracketing;
  AuditReference audit;
};

/// "reported", "refused", "rerun-required" (the JSON tokens of product.md §4.1).
const char* to_string(SampleStatus status);

/// Lays out `report` on A4 pages and writes it to `path` as PDF; returns the number of pages.
/// Throws ValidationError when `path` does not end in ".pdf" or when the file cannot be written
/// (no file is left behind then).
int render_run_report(const RunReport& report, const std::string& path);

}  // namespace cw::plot
