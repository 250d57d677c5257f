// SPDX-License-Identifier: Apache-2.0
// Handlers of the curve commands.
#include "app/curve_listing.h"
#include "app/curves.h"
#include "cli/error_output.h"
#include "cli/handlers.h"
#include "core/clean_text.h"
#include "core/error.h"
#include "core/text.h"
#include "import/points_file.h"
#include "plot/module.h"
#include "plot/plot.h"
#include "report/curve_plot_view.h"
#include "report/curve_views.h"

namespace cw::cli::handlers {

int curve_log(Invocation& in) {
  app::CurveLogRequest r;
  r.method = in.code("--method", "method code");
  r.instrument = in.code("--instrument", "instrument code");
  r.lots = in.codes("--lot", "lot code");
  if (r.lots.empty()) {
    throw UsageError("give at least one --lot CODE",
                     "the reference-material lot(s) the calibrators were made from");
  }
  r.points = in.path("--points");
  r.note = in.optional_text("--note", kMaxReasonChars);
  {
    std::set<std::string> names = import::points_file_required_columns();
    names.insert(import::points_file_optional_columns().begin(),
                 import::points_file_optional_columns().end());
    r.columns = in.optional_columns("--columns", names);
  }
  auto s = in.open_session();
  const auto outcome = app::log_calibration(s, r);
  for (const auto& w : outcome.warnings) in.warn(w);
  if (in.json()) {
    report::Json curves = report::Json::array();
    for (const auto& v : outcome.curves) curves.push_back(report::curve_json(v, s.zone()));
    in.emit(report::Json{{"calibration_id", outcome.calibration_id.value}, {"curves", curves}});
  } else {
    report::print_calibration_header(in.out(), outcome.curves.front(), s.zone(),
                                     outcome.calibration_id);
    for (const auto& v : outcome.curves) report::print_curve_report(in.out(), v, s.zone());
    int rejected = 0;
    for (const auto& v : outcome.curves) rejected += v.curve.verdict == Verdict::Rejected ? 1 : 0;
    in.out() << "\n" << outcome.curves.size() << " curve(s) stored, " << rejected << " rejected.";
    if (outcome.curves.front().status.state == CurveState::AwaitingReview) {
      in.out() << " Accepted curves wait for a second person: curvewarden curve review ID "
                  "--approve --reason ...";
    }
    in.out() << "\n" << report::kReviewCaution << "\n";
  }
  if (outcome.any_rejected) {
    return in.refused("calibration " + std::to_string(outcome.calibration_id.value) +
                      ": at least one curve was rejected by the method's acceptance criteria "
                      "(stored as rejected)");
  }
  return 0;
}

int curve_list(Invocation& in) {
  app::CurveListRequest r;
  if (auto state = in.optional_text("--state", kMaxLabelChars)) {
    r.state = parse_curve_state(*state);
    if (!r.state) {
      UsageError e("--state " + quote(*state) + " is not a state",
                   "states are rejected, awaiting-review, active, stale, retired");
      e.set_option("--state");
      throw e;
    }
  }
  r.method = in.optional_code("--method", "method code");
  r.instrument = in.optional_code("--instrument", "instrument code");
  r.analyte = in.optional_analyte("--analyte");
  auto s = in.open_session();
  // Written as the batches are evaluated: the listing is never held whole.
  app::CurveListing listing(s, r);
  if (!in.json()) {
    report::print_curve_list(
        in.out(), [&](const auto& visit) { listing.each(visit); }, s.zone());
    return 0;
  }
  using Format = report::CurveListWriter::Format;
  report::CurveListWriter writer(in.out(), in.csv() ? Format::Csv : Format::Json, s.at());
  try {
    listing.each([&](const app::CurveView& v) { writer.add(v); });
  } catch (const Error& e) {
    if (!writer.begun()) throw;  // nothing written yet: the usual error report
    // Curves were written: the document ends with the error as its last member.
    writer.end(error_object(e));
    in.document_printed();
    return in.fail(e);
  }
  writer.end();
  in.document_printed();
  return 0;
}

int curve_show(Invocation& in) {
  const CurveId id = in.curve_id("id");
  const auto plot_path = in.optional_output_path("--plot");
  if (plot_path) {
    plot::output_format_for(*plot_path);  // a bad extension fails before anything
    plot::require_drawing();
  }
  auto s = in.open_session();
  const auto v = app::show_curve(s, id);
  if (plot_path) plot::render_curve_plot(report::curve_plot_of(v, s.now()), *plot_path);
  if (in.json()) {
    report::Json j = report::curve_json(v, s.zone());
    if (plot_path) j["plot"] = *plot_path;
    in.emit(j);
  } else {
    report::print_calibration_header(in.out(), v, s.zone(), v.curve.calibration_id);
    report::print_curve_report(in.out(), v, s.zone());
    if (plot_path) in.out() << "\nPlot written to " << *plot_path << "\n";
  }
  return 0;
}

int curve_review(Invocation& in) {
  const CurveId id = in.curve_id("id");
  const CurveAction action =
      in.either("--approve", "--reject") ? CurveAction::Approve : CurveAction::Reject;
  const std::string reason = in.text("--reason", kMaxReasonChars);
  auto s = in.open_session();
  const auto v = app::change_curve(s, id, action, reason);
  if (in.json()) {
    in.emit(report::curve_json(v, s.zone()));
  } else {
    in.out() << "Curve " << v.curve.id.value << " (" << v.curve.analyte << ") "
             << (action == CurveAction::Approve ? "approved" : "rejected") << " by "
             << s.actor().name << ".\n";
    report::print_status(in.out(), v.status, s.zone());
  }
  return 0;
}

int curve_retire(Invocation& in) {
  const CurveId id = in.curve_id("id");
  const std::string reason = in.text("--reason", kMaxReasonChars);
  auto s = in.open_session();
  const auto v = app::change_curve(s, id, CurveAction::Retire, reason);
  if (in.json()) {
    in.emit(report::curve_json(v, s.zone()));
  } else {
    in.out() << "Curve " << v.curve.id.value << " (" << v.curve.analyte
             << ") retired; it can no longer be used.\n";
  }
  return 0;
}

}  // namespace cw::cli::handlers
