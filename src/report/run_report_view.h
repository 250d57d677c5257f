// SPDX-License-Identifier: Apache-2.0
// The printable report of a run, filled row by row as the run is read.
#pragma once

#include <map>
#include <string>

#include "app/runs.h"
#include "plot/run_report.h"
#include "report/curve_report_view.h"

namespace cw::report {

/// Receives a run's rows (app::show_run_for_report) and builds its report; finish() adds the
/// frame and the audit reference.
class RunReportBuilder final : public app::RunVisitor {
 public:
  explicit RunReportBuilder(const LabZone& zone) : zone_(zone) {}
  void begin(const app::RunView& run) override;
  void result(const store::RunResultRow& row) override;
  void check(const store::RunCheckRow& row) override;
  void end(const app::RunView& run) override;

  plot::RunReport finish(const app::RunReportContext& context, const ReportOrigin& origin);

 private:
  struct Tally {
    std::vector<long> rerun_positions;
    std::map<std::string, long> rerun_reasons;  ///< rerun reason token → count
    std::vector<long> failed_positions;
    long reported = 0, censored = 0, refused = 0, rerun = 0, passed = 0, failed = 0;
    long blanks_passed = 0, blanks_failed = 0;
  };
  const LabZone& zone_;
  std::string unit_;
  plot::RunReport report_;
  std::map<std::string, Tally> tallies_;  ///< per analyte, in name order
};

}  // namespace cw::report
