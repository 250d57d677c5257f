// SPDX-License-Identifier: Apache-2.0
// Views of checks, results, the expiring list, the status board and traces.
#pragma once

#include <ostream>

#include "app/quantitation.h"
#include "app/queries.h"
#include "report/json.h"

namespace cw::report {

Json check_json(const Check& k);
Json check_outcome_json(const app::CheckOutcome& o);
void print_check_outcome(std::ostream& out, const app::CheckOutcome& o, const LabZone& zone);

/// A result with its current status ("status": the recorded one overridden by the latest status
/// event), the recorded one, the latest event ("rerun") and the run it came from.
Json result_json(const Result& r);
Json status_event_json(const ResultStatusEvent& e);
Json reason_tokens(const std::vector<Finding>& findings);
/// What was released: "7.409 mg/L", "< 0.5 mg/L" (censored), "refused".
std::string released_text(const Result& r, const std::string& unit);
/// "7.409 mg/L (95 % CI ...)", "< 0.5 mg/L [censored]", "refused", or "RE-RUN REQUIRED (was ...)".
std::string result_value_text(const Result& r, const std::string& unit);
/// The uncertainty budget object of product.md §4.1, or null.
Json uncertainty_json(const std::optional<ResultUncertainty>& u);
Json quantify_json(const app::QuantifyOutcome& o);
void print_quantify(std::ostream& out, const app::QuantifyOutcome& o, const LabZone& zone);

Json expiring_json(const app::ExpiringOutcome& o);
void print_expiring(std::ostream& out, const app::ExpiringOutcome& o, const LabZone& zone);

Json status_json(const std::vector<app::InstrumentStatus>& board, Instant at);
void print_status_board(std::ostream& out, const std::vector<app::InstrumentStatus>& board,
                        const LabZone& zone, Instant at);

Json trace_result_json(const app::ResultTrace& t, const LabZone& zone);
void print_trace_result(std::ostream& out, const app::ResultTrace& t, const LabZone& zone);
Json trace_curve_json(const app::CurveTrace& t, const LabZone& zone);
void print_trace_curve(std::ostream& out, const app::CurveTrace& t, const LabZone& zone);
Json trace_lot_json(const app::LotTrace& t, const LabZone& zone);
void print_trace_lot(std::ostream& out, const app::LotTrace& t, const LabZone& zone);
/// One CSV line per affected result (with its curve), for spreadsheets.

}  // namespace cw::report
