// SPDX-License-Identifier: Apache-2.0
// Views of runs, of result and check listings, and of a check standard's trend. Runs and result
// listings can be long: their JSON and text are written row by row as the rows are read, never
// built whole.
#pragma once

#include <optional>
#include <ostream>
#include <vector>

#include "app/runs.h"
#include "app/trend.h"
#include "report/csv.h"
#include "report/json.h"

namespace cw::report {

Json run_summary_json(const std::vector<RunAnalyteSummary>& summary);
Json run_list_item_json(const app::RunView& v);
void print_run_list(std::ostream& out, const std::vector<app::RunView>& runs, const LabZone& zone);

/// The run document of product.md §4.1, streamed: {run_id, file_sha256, ..., `extra` members,
/// results: [...], checks: [...], summary, and `error` when given}.
class RunJsonWriter final : public app::RunVisitor {
 public:
  RunJsonWriter(std::ostream& out, Json extra = Json::object(),
                std::optional<Json> error = std::nullopt)
      : out_(out), extra_(std::move(extra)), error_(std::move(error)) {}
  void begin(const app::RunView& run) override;
  void result(const store::RunResultRow& row) override;
  void check(const store::RunCheckRow& row) override;
  void end(const app::RunView& run) override;

 private:
  std::ostream& out_;
  Json extra_;
  std::optional<Json> error_;
  bool first_result_ = true;
  bool first_check_ = true;
  bool in_checks_ = false;
};

/// `run show` as text: the header, the counts per analyte, then every sample row and every
/// check and blank row in position order.
class RunTextWriter final : public app::RunVisitor {
 public:
  RunTextWriter(std::ostream& out, const LabZone& zone) : out_(out), zone_(zone) {}
  void begin(const app::RunView& run) override;
  void result(const store::RunResultRow& row) override;
  void check(const store::RunCheckRow& row) override;
  void end(const app::RunView& run) override;

 private:
  std::ostream& out_;
  const LabZone& zone_;
  std::string unit_;
  std::size_t analyte_width_ = 10;  ///< the longest analyte name of the run (rows are streamed)
  bool results_started_ = false;
  bool checks_started_ = false;
};

/// Members of `run import --json` besides the run document: the curves used, the columns
/// ignored, the status events written, the failed checks.
Json run_import_extra_json(const app::RunImportOutcome& o);
void print_run_import(std::ostream& out, const app::RunImportOutcome& o, const LabZone& zone);
/// The counts per analyte as a table.
void print_run_summary(std::ostream& out, const std::vector<RunAnalyteSummary>& summary);

/// `result list`: {results: [...]} streamed (begin, one call per result, end).
class ResultListWriter {
 public:
  enum class Format { Text, Json, Csv };
  ResultListWriter(std::ostream& out, Format format, const LabZone& zone);
  void begin();
  void add(const Result& r, const std::string& unit);
  void end();

 private:
  std::ostream& out_;
  Format format_;
  const LabZone& zone_;
  std::optional<CsvWriter> csv_;
  long count_ = 0;
};

Json result_detail_json(const app::ResultDetail& d);
void print_result_detail(std::ostream& out, const app::ResultDetail& d, const LabZone& zone);

Json check_list_json(const std::vector<Check>& checks);
void print_check_list(std::ostream& out, const std::vector<Check>& checks, const LabZone& zone);

Json trend_json(const app::TrendOutcome& t);
/// The trend as text: the limits, one line per check with its recovery placed on a chart of
/// mean ± 3s drawn in characters, and the violations.
void print_trend(std::ostream& out, const app::TrendOutcome& t, const LabZone& zone);

}  // namespace cw::report
