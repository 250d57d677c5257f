// SPDX-License-Identifier: Apache-2.0
// A run: one instrument sequence (samples, check standards and blanks in injection order)
// imported from the instrument's export as one batch (product.md §5.4).
#pragma once

#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/time.h"
#include "domain/ids.h"

namespace cw {

/// What a row of a run file measured.
enum class RunRowKind { Sample, Check, Blank };
std::string_view to_string(RunRowKind k);  // "sample" | "check" | "blank"
std::optional<RunRowKind> parse_run_row_kind(std::string_view text);
std::vector<RunRowKind> all_run_row_kinds();

/// Logical column name -> the header an instrument export uses for it, in the order given.
using ColumnMapping = std::vector<std::pair<std::string, std::string>>;
/// `name=header,...`, the form --columns takes.
std::string column_mapping_text(const ColumnMapping& mapping);

struct Run {
  RunId id;
  MethodId method_id;
  MethodVersionId method_version_id;
  InstrumentId instrument_id;
  Instant acquired_at;
  std::string analyst;
  std::string file_name;
  std::string file_sha256;
  long rows = 0;
  ColumnMapping columns;                    ///< the header mapping used (empty: none)
  std::optional<std::string> again_reason;  ///< why the same file was imported again
};

/// Counts of one analyte of a run, by the current status of its results.
struct RunAnalyteSummary {
  std::string analyte;
  long samples = 0;
  long reported = 0;     ///< current status reported (below-range ones included)
  long below_range = 0;  ///< of the reported, released as "< limit"
  long refused = 0;
  long rerun_required = 0;
  long checks_passed = 0;
  long checks_failed = 0;
  long blanks_passed = 0;
  long blanks_failed = 0;
};

}  // namespace cw
