// SPDX-License-Identifier: Apache-2.0
// The command handlers: each reads its options through the Invocation, calls one use case of
// app/ and shows the outcome with a view of report/. Nothing here parses argv or prints errors.
#pragma once

#include "cli/invocation.h"

namespace cw::cli::handlers {

// lab, instruments, methods, lots (handlers_registry.cpp)
int init(Invocation& in);
int instrument_add(Invocation& in);
int instrument_list(Invocation& in);
int instrument_show(Invocation& in);
int instrument_service(Invocation& in);
int instrument_columns(Invocation& in);
int method_add(Invocation& in);
int method_revise(Invocation& in);
int method_list(Invocation& in);
int method_show(Invocation& in);
int lot_add(Invocation& in);
int lot_list(Invocation& in);
int lot_show(Invocation& in);
int lot_withdraw(Invocation& in);

// curves (handlers_curve.cpp)
int curve_log(Invocation& in);
int curve_list(Invocation& in);
int curve_show(Invocation& in);
int curve_review(Invocation& in);
int curve_retire(Invocation& in);

// checks, quantitation, questions, traces (handlers_quantitation.cpp)
int check_log(Invocation& in);
int quantify(Invocation& in);
int expiring(Invocation& in);
int status(Invocation& in);
int trace_result(Invocation& in);
int trace_curve(Invocation& in);
int trace_lot(Invocation& in);

// printable reports (handlers_report.cpp)
int report_curve(Invocation& in);
int report_run(Invocation& in);

// runs, listings, trend (handlers_runs.cpp)
int run_import(Invocation& in);
int run_list(Invocation& in);
int run_show(Invocation& in);
int result_list(Invocation& in);
int result_show(Invocation& in);
int check_list(Invocation& in);
int trend(Invocation& in);

// users (handlers_users.cpp)
int user_add(Invocation& in);
int user_list(Invocation& in);
int user_show(Invocation& in);
int user_disable(Invocation& in);
int user_enable(Invocation& in);
int user_unlock(Invocation& in);
int user_passphrase(Invocation& in);

// audit trail (handlers_audit.cpp)
int audit_log(Invocation& in);
int audit_verify(Invocation& in);
int audit_anchor(Invocation& in);
int backup(Invocation& in);
int store_copy(Invocation& in);

}  // namespace cw::cli::handlers
