// SPDX-License-Identifier: Apache-2.0
// Command handlers: each takes the parsed arguments, calls the use case and prints the text
// or JSON view. They return the exit code; errors propagate as typed exceptions to run_cli.
// Nothing here knows CLI11 (cli_app.cpp does the parsing).
#pragma once

#include <optional>
#include <ostream>
#include <string>
#include <vector>

#include "app/curves.h"
#include "app/quantitation.h"
#include "app/queries.h"
#include "app/registry.h"
#include "app/session.h"

namespace cw::cli {

struct Ctx {
  app::GlobalOptions global;
  std::ostream& out;
  std::ostream& err;
};

// lab, instruments, methods, lots, audit
int cmd_init(Ctx& ctx, const app::InitRequest& request);
int cmd_instrument_add(Ctx& ctx, const std::string& code, const std::optional<std::string>& name);
int cmd_instrument_list(Ctx& ctx);
int cmd_instrument_show(Ctx& ctx, const std::string& code);
int cmd_instrument_service(Ctx& ctx, const app::ServiceRequest& request);
int cmd_method_add(Ctx& ctx, const std::string& file);
int cmd_method_revise(Ctx& ctx, const std::string& file, const std::string& reason);
int cmd_method_list(Ctx& ctx);
int cmd_method_show(Ctx& ctx, const std::string& code, std::optional<int> version);
int cmd_lot_add(Ctx& ctx, const app::LotRequest& request);
int cmd_lot_list(Ctx& ctx);
int cmd_lot_show(Ctx& ctx, const std::string& code);
int cmd_lot_withdraw(Ctx& ctx, const std::string& code, const std::string& reason);
struct AuditLogArgs {
  std::optional<std::string> since;
  std::optional<std::string> entity;
  std::optional<std::string> id;
};
int cmd_audit_log(Ctx& ctx, const AuditLogArgs& args);
int cmd_audit_verify(Ctx& ctx);

// curves
int cmd_curve_log(Ctx& ctx, const app::CurveLogRequest& request);
int cmd_curve_list(Ctx& ctx, const app::CurveListRequest& request);
int cmd_curve_show(Ctx& ctx, const std::string& id);
int cmd_curve_review(Ctx& ctx, const std::string& id, ReviewDecision decision,
                     const std::string& reason);
int cmd_curve_retire(Ctx& ctx, const std::string& id, const std::string& reason);

// checks, quantitation, questions, traces
int cmd_check_log(Ctx& ctx, const app::CheckRequest& request);
int cmd_quantify(Ctx& ctx, const app::QuantifyRequest& request);
int cmd_expiring(Ctx& ctx, const app::ExpiringRequest& request);
int cmd_status(Ctx& ctx);
int cmd_trace_result(Ctx& ctx, const std::string& id);
int cmd_trace_curve(Ctx& ctx, const std::string& id);
int cmd_trace_lot(Ctx& ctx, const std::string& code, bool csv);

}  // namespace cw::cli
