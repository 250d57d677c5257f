// SPDX-License-Identifier: Apache-2.0
// Handlers of the curve commands.
#include "cli/commands.h"
#include "core/error.h"
#include "report/curve_views.h"

namespace cw::cli {
namespace {

void emit(Ctx& ctx, const report::Json& j) {
  ctx.out << j.dump(2) << '\n';
}

}  // namespace

int cmd_curve_log(Ctx& ctx, const app::CurveLogRequest& request) {
  auto s = app::Session::open(ctx.global);
  const auto outcome = app::log_calibration(s, request);
  for (const auto& w : outcome.warnings) ctx.err << "curvewarden: warning: " << w << "\n";
  if (ctx.global.json) {
    report::Json curves = report::Json::array();
    for (const auto& v : outcome.curves) curves.push_back(report::curve_json(v, s.zone()));
    emit(ctx, report::Json{{"calibration_id", outcome.calibration_id.value}, {"curves", curves}});
  } else {
    report::print_calibration_header(ctx.out, outcome.curves.front(), s.zone(),
                                     outcome.calibration_id);
    for (const auto& v : outcome.curves) report::print_curve_report(ctx.out, v, s.zone());
    int rejected = 0;
    for (const auto& v : outcome.curves) rejected += v.curve.verdict == Verdict::Rejected ? 1 : 0;
    ctx.out << "\n" << outcome.curves.size() << " curve(s) stored, " << rejected << " rejected.";
    if (outcome.curves.front().status.state == CurveState::AwaitingReview) {
      ctx.out << " Accepted curves wait for a second person: curvewarden curve review ID --approve "
                 "--reason ...";
    }
    ctx.out << "\n" << report::kReviewCaution << "\n";
  }
  if (outcome.any_rejected) {
    ctx.err << "curvewarden: error: calibration " << outcome.calibration_id.value
            << ": at least one curve was rejected by the method's acceptance criteria (stored as "
               "rejected)\n";
    return to_int(ExitCode::Refused);
  }
  return 0;
}

int cmd_curve_list(Ctx& ctx, const app::CurveListRequest& request) {
  auto s = app::Session::open(ctx.global);
  const auto list = app::list_curves(s, request);
  if (ctx.global.json) {
    report::Json items = report::Json::array();
    for (const auto& v : list) items.push_back(report::curve_list_item_json(v));
    emit(ctx, report::Json{{"as_of", report::json_instant(s.at())}, {"curves", items}});
  } else {
    report::print_curve_list(ctx.out, list, s.zone());
  }
  return 0;
}

int cmd_curve_show(Ctx& ctx, const std::string& id) {
  const CurveId curve = app::parse_curve_id(id);
  auto s = app::Session::open(ctx.global);
  const auto v = app::show_curve(s, curve);
  if (ctx.global.json) {
    emit(ctx, report::curve_json(v, s.zone()));
  } else {
    report::print_calibration_header(ctx.out, v, s.zone(), v.curve.calibration_id);
    report::print_curve_report(ctx.out, v, s.zone());
  }
  return 0;
}

int cmd_curve_review(Ctx& ctx, const std::string& id, ReviewDecision decision,
                     const std::string& reason) {
  const CurveId curve = app::parse_curve_id(id);
  auto s = app::Session::open(ctx.global);
  const auto v = app::review_curve(s, curve, decision, reason);
  if (ctx.global.json) {
    emit(ctx, report::curve_json(v, s.zone()));
  } else {
    ctx.out << "Curve " << v.curve.id.value << " (" << v.curve.analyte << ") "
            << (decision == ReviewDecision::Approve ? "approved" : "rejected") << " by "
            << s.actor().name << ".\n";
    report::print_status(ctx.out, v.status, s.zone());
  }
  return 0;
}

int cmd_curve_retire(Ctx& ctx, const std::string& id, const std::string& reason) {
  const CurveId curve = app::parse_curve_id(id);
  auto s = app::Session::open(ctx.global);
  const auto v = app::retire_curve(s, curve, reason);
  if (ctx.global.json) {
    emit(ctx, report::curve_json(v, s.zone()));
  } else {
    ctx.out << "Curve " << v.curve.id.value << " (" << v.curve.analyte
            << ") retired; it can no longer be used.\n";
  }
  return 0;
}

}  // namespace cw::cli
