// SPDX-License-Identifier: Apache-2.0
// Handlers of check, quantify, expiring, status and trace commands.
#include "cli/commands.h"
#include "core/error.h"
#include "report/quantitation_views.h"

namespace cw::cli {
namespace {

void emit(Ctx& ctx, const report::Json& j) {
  ctx.out << j.dump(2) << '\n';
}

}  // namespace

int cmd_check_log(Ctx& ctx, const app::CheckRequest& request) {
  auto s = app::Session::open(ctx.global);
  const auto o = app::log_check(s, request);
  if (ctx.global.json) {
    emit(ctx, report::check_outcome_json(o));
  } else {
    report::print_check_outcome(ctx.out, o, s.zone());
  }
  if (!o.check.passed) {
    ctx.err << "curvewarden: error: " << to_string(o.check.kind) << " " << o.check.id.value
            << " failed; curve " << o.check.curve_id.value << " is "
            << to_string(o.curve.status.state) << "\n";
    return to_int(ExitCode::Refused);
  }
  return 0;
}

int cmd_quantify(Ctx& ctx, const app::QuantifyRequest& request) {
  auto s = app::Session::open(ctx.global);
  const auto o = app::quantify(s, request);
  if (ctx.global.json) {
    emit(ctx, report::quantify_json(o));
  } else {
    report::print_quantify(ctx.out, o, s.zone());
  }
  if (o.result.status == ResultStatus::Refused) {
    ctx.err << "curvewarden: error: quantitation of sample " << o.result.sample
            << " refused (result " << o.result.id.value << "):";
    for (const auto& r : o.result.reasons) ctx.err << " " << r;
    ctx.err << "\n";
    return to_int(ExitCode::Refused);
  }
  return 0;
}

int cmd_expiring(Ctx& ctx, const app::ExpiringRequest& request) {
  auto s = app::Session::open(ctx.global);
  const auto o = app::expiring(s, request);
  if (ctx.global.json) {
    emit(ctx, report::expiring_json(o));
  } else {
    report::print_expiring(ctx.out, o, s.zone());
  }
  return 0;
}

int cmd_status(Ctx& ctx) {
  auto s = app::Session::open(ctx.global);
  const auto board = app::status_board(s);
  if (ctx.global.json) {
    emit(ctx, report::status_json(board, s.at()));
  } else {
    report::print_status_board(ctx.out, board, s.zone(), s.at());
  }
  return 0;
}

int cmd_trace_result(Ctx& ctx, const std::string& id) {
  const ResultId result = app::parse_result_id(id);
  auto s = app::Session::open(ctx.global);
  const auto t = app::trace_result(s, result);
  if (ctx.global.json) {
    emit(ctx, report::trace_result_json(t, s.zone()));
  } else {
    report::print_trace_result(ctx.out, t, s.zone());
  }
  return 0;
}

int cmd_trace_curve(Ctx& ctx, const std::string& id) {
  const CurveId curve = app::parse_curve_id(id);
  auto s = app::Session::open(ctx.global);
  const auto t = app::trace_curve(s, curve);
  if (ctx.global.json) {
    emit(ctx, report::trace_curve_json(t, s.zone()));
  } else {
    report::print_trace_curve(ctx.out, t, s.zone());
  }
  return 0;
}

int cmd_trace_lot(Ctx& ctx, const std::string& code, bool csv) {
  if (csv && ctx.global.json) throw UsageError("give --csv or --json, not both");
  auto s = app::Session::open(ctx.global);
  const auto t = app::trace_lot(s, code);
  if (ctx.global.json) {
    emit(ctx, report::trace_lot_json(t, s.zone()));
  } else if (csv) {
    report::print_trace_lot_csv(ctx.out, t);
  } else {
    report::print_trace_lot(ctx.out, t, s.zone());
  }
  return 0;
}

}  // namespace cw::cli
