// SPDX-License-Identifier: Apache-2.0
// Handlers of the printable reports.
#include "app/reports.h"
#include "app/runs.h"
#include "cli/handlers.h"
#include "core/error.h"
#include "plot/curve_report.h"
#include "plot/module.h"
#include "plot/run_report.h"
#include "report/curve_report_view.h"
#include "report/json.h"
#include "report/run_report_view.h"

namespace cw::cli::handlers {

namespace {

/// The --out path, which must name a PDF file (checked before the store is opened).
std::string pdf_path(const Invocation& in) {
  const auto path = in.optional_output_path("--out");
  if (!path) throw UsageError("give --out FILE.pdf", "the report is written as a PDF file");
  const std::string& p = *path;
  const auto dot = p.find_last_of('.');
  std::string ext = dot == std::string::npos ? "" : p.substr(dot);
  for (auto& ch : ext) ch = static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
  if (ext != ".pdf") {
    throw option_error("--out", "'" + p + "' does not end in .pdf",
                       "reports are PDF documents: name the file FILE.pdf");
  }
  return p;
}

report::ReportOrigin origin_of(app::Session& s) {
  return {s.now(), s.actor().name, app::tool_version()};
}

}  // namespace

int report_curve(Invocation& in) {
  const CurveId id = in.curve_id("id");
  const std::string out = pdf_path(in);
  plot::require_drawing();
  auto s = in.open_session();
  const auto facts = app::curve_report_facts(s, id);
  const int pages =
      plot::render_curve_report(report::curve_report_of(facts, s.zone(), origin_of(s)), out);
  if (in.json()) {
    in.emit({{"curve_id", id.value},
             {"file", out},
             {"pages", pages},
             {"state", std::string(to_string(facts.view.status.state))},
             {"audit_head",
              facts.head ? report::Json({{"seq", facts.head->seq}, {"hash", facts.head->hash}})
                         : report::Json(nullptr)}});
  } else {
    in.out() << "Report of curve " << id.value << " (" << facts.view.curve.analyte << ", "
             << to_string(facts.view.status.state) << ") written to " << out << ": " << pages
             << (pages == 1 ? " page" : " pages") << ".\n";
  }
  return 0;
}

int report_run(Invocation& in) {
  const RunId id = in.run_id("id");
  const std::string out = pdf_path(in);
  plot::require_drawing();
  auto s = in.open_session();
  report::RunReportBuilder builder(s.zone());
  const auto context = app::show_run_for_report(s, id, builder);
  const plot::RunReport r = builder.finish(context, origin_of(s));
  const int pages = plot::render_run_report(r, out);
  if (in.json()) {
    in.emit({{"run_id", id.value},
             {"file", out},
             {"pages", pages},
             {"samples", r.samples.size()},
             {"checks", r.checks.size()},
             {"audit_head", context.head ? report::Json({{"seq", context.head->seq},
                                                         {"hash", context.head->hash}})
                                         : report::Json(nullptr)}});
  } else {
    in.out() << "Report of run " << id.value << " (" << r.samples.size() << " sample row(s), "
             << r.checks.size() << " check and blank row(s)) written to " << out << ": " << pages
             << (pages == 1 ? " page" : " pages") << ".\n";
  }
  return 0;
}

}  // namespace cw::cli::handlers
