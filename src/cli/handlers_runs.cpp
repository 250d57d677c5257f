// SPDX-License-Identifier: Apache-2.0
// Handlers of run import and show, the listings of runs, results and checks, and trend.
#include "app/runs.h"
#include "app/trend.h"
#include "cli/error_output.h"
#include "cli/handlers.h"
#include "cli/progress.h"
#include "core/clean_text.h"
#include "core/error.h"
#include "core/text.h"
#include "import/run_file.h"
#include "plot/control_chart.h"
#include "plot/module.h"
#include "report/control_chart_view.h"
#include "report/run_views.h"

namespace cw::cli::handlers {
namespace {

/// The run-file columns --columns may name.
std::set<std::string> run_columns() {
  std::set<std::string> names = import::run_file_required_columns();
  names.insert(import::run_file_optional_columns().begin(),
               import::run_file_optional_columns().end());
  return names;
}

std::optional<ResultStatus> optional_status(const Invocation& in, std::string_view option) {
  const auto text = in.optional_text(option, kMaxLabelChars);
  if (!text) return std::nullopt;
  const auto status = parse_result_status(*text);
  if (!status) {
    UsageError e(std::string(option) + " " + quote(*text) + " is not a result status",
                 "statuses are reported, refused, rerun-required");
    e.set_option(std::string(option));
    throw e;
  }
  return status;
}

}  // namespace

int run_import(Invocation& in) {
  app::RunImportRequest r;
  r.file = in.path("file");
  r.method = in.code("--method", "method code");
  r.instrument = in.code("--instrument", "instrument code");
  r.again = in.flag("--again");
  r.reason = in.optional_text("--reason", kMaxReasonChars);
  r.columns = in.optional_columns("--columns", run_columns());
  auto s = in.open_session();
  TerminalProgress progress(in.err());
  r.progress = progress.callback();
  const app::RunImportOutcome o = app::import_run(s, r);

  long refused = 0, rerun = 0, failed = 0;
  for (const auto& a : o.summary) {
    refused += a.refused;
    rerun += a.rerun_required;
    failed += a.checks_failed + a.blanks_failed;
  }
  std::optional<RefusedError> attention;
  if (refused + rerun + failed > 0) {
    attention =
        RefusedError("run " + std::to_string(o.run.id.value) + ": " + std::to_string(rerun) +
                     " result(s) must be re-run, " + std::to_string(refused) + " refused, " +
                     std::to_string(failed) + " check(s) or blank(s) failed (all recorded)");
  }
  if (in.json()) {
    // The document is the run as stored, read back row by row.
    report::RunJsonWriter writer(
        in.out(), report::run_import_extra_json(o),
        attention ? std::optional<report::Json>(error_object(*attention)) : std::nullopt);
    app::show_run(s, o.run.id, writer);
    in.document_printed();
  } else {
    report::print_run_import(in.out(), o, s.zone());
  }
  if (attention) return in.fail(*attention);
  return 0;
}

int run_list(Invocation& in) {
  auto s = in.open_session();
  const auto runs = app::list_runs(s);
  if (in.json()) {
    report::Json items = report::Json::array();
    for (const auto& v : runs) items.push_back(report::run_list_item_json(v));
    in.emit(report::Json{{"runs", items}});
  } else {
    report::print_run_list(in.out(), runs, s.zone());
  }
  return 0;
}

int run_show(Invocation& in) {
  const RunId id = in.run_id("id");
  auto s = in.open_session();
  if (in.json()) {
    report::RunJsonWriter writer(in.out());
    app::show_run(s, id, writer);
    in.document_printed();
  } else {
    report::RunTextWriter writer(in.out(), s.zone());
    app::show_run(s, id, writer);
  }
  return 0;
}

int result_list(Invocation& in) {
  app::ResultListRequest r;
  r.sample = in.optional_text("--sample", kMaxNameChars);
  r.status = optional_status(in, "--status");
  r.since = in.optional_instant("--since");
  r.run = in.optional_run_id("--run");
  auto s = in.open_session();
  using Format = report::ResultListWriter::Format;
  report::ResultListWriter writer(
      in.out(), in.csv() ? Format::Csv : (in.json() ? Format::Json : Format::Text), s.zone());
  bool begun = false;
  app::list_results(s, r, [&](const Result& result, const std::string& unit) {
    if (!begun) writer.begin();
    begun = true;
    writer.add(result, unit);
  });
  if (!begun) writer.begin();
  writer.end();
  if (in.json()) in.document_printed();
  return 0;
}

int result_show(Invocation& in) {
  const ResultId id = in.result_id("id");
  auto s = in.open_session();
  const auto d = app::show_result(s, id);
  if (in.json()) {
    in.emit(report::result_detail_json(d));
  } else {
    report::print_result_detail(in.out(), d, s.zone());
  }
  return 0;
}

int check_list(Invocation& in) {
  app::CheckListRequest r;
  r.curve = in.optional_curve_id("--curve");
  r.since = in.optional_instant("--since");
  auto s = in.open_session();
  const auto checks = app::list_checks(s, r);
  if (in.json()) {
    in.emit(report::check_list_json(checks));
  } else {
    report::print_check_list(in.out(), checks, s.zone());
  }
  return 0;
}

int trend(Invocation& in) {
  app::TrendRequest r;
  r.method = in.code("--method", "method code");
  r.instrument = in.code("--instrument", "instrument code");
  r.analyte = *in.optional_analyte("--analyte");
  r.last = in.optional_whole("--last", 1, 100000);
  const auto plot_path = in.optional_output_path("--plot");
  if (plot_path) {
    plot::output_format_for(*plot_path);  // a bad extension fails before anything
    plot::require_drawing();
  }
  auto s = in.open_session();
  const auto t = app::trend(s, r);
  if (plot_path) {
    plot::render_control_chart(report::control_chart_of(t, s.zone(), s.now()), *plot_path);
  }
  if (in.json()) {
    report::Json j = report::trend_json(t);
    if (plot_path) j["plot"] = *plot_path;
    in.emit(j);
  } else {
    report::print_trend(in.out(), t, s.zone());
    if (plot_path) in.out() << "\nControl chart written to " << *plot_path << "\n";
  }
  return 0;
}

}  // namespace cw::cli::handlers
