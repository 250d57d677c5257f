// SPDX-License-Identifier: Apache-2.0
// Handlers of check, quantify, expiring, status and trace commands.
#include <numeric>

#include "app/quantitation.h"
#include "app/queries.h"
#include "cli/handlers.h"
#include "core/clean_text.h"
#include "core/error.h"
#include "core/number.h"
#include "core/text.h"
#include "report/quantitation_views.h"

namespace cw::cli::handlers {

int check_log(Invocation& in) {
  app::CheckRequest r;
  r.curve = in.curve_id("--curve");
  if (auto kind = in.optional_text("--kind", kMaxLabelChars)) {
    const auto k = parse_check_kind(*kind);
    if (!k) {
      UsageError e("--kind " + quote(*kind) + " is not a kind of check", "use check or blank");
      e.set_option("--kind");
      throw e;
    }
    r.reading.kind = *k;
  }
  r.reading.nominal = in.optional_number("--nominal");
  r.reading.response = in.number("--response");
  r.reading.is_response = in.optional_number("--is-response");
  auto s = in.open_session();
  const auto o = app::log_check(s, r);
  if (in.json()) {
    in.emit(report::check_outcome_json(o));
  } else {
    report::print_check_outcome(in.out(), o, s.zone());
  }
  if (!o.check.passed) {
    return in.refused(std::string(to_string(o.check.kind)) + " " +
                      std::to_string(o.check.id.value) + " failed; curve " +
                      std::to_string(o.check.curve_id.value) + " is " +
                      std::string(to_string(o.curve.status.state)));
  }
  return 0;
}

int quantify(Invocation& in) {
  app::QuantifyRequest r;
  r.sample = in.text("--sample", kMaxNameChars);
  if (in.has("--curve")) {
    if (in.has("--method") || in.has("--instrument") || in.has("--analyte")) {
      throw UsageError("give either --curve ID or --method, --instrument and --analyte, not both");
    }
    r.target.curve = in.curve_id("--curve");
  } else {
    if (!(in.has("--method") && in.has("--instrument") && in.has("--analyte"))) {
      throw UsageError("give --curve ID, or --method CODE --instrument CODE --analyte NAME");
    }
    r.target.method = in.code("--method", "method code");
    r.target.instrument = in.code("--instrument", "instrument code");
    r.target.analyte = *in.optional_analyte("--analyte");
  }
  const std::vector<double> responses = in.numbers("--response");
  if (responses.empty()) throw UsageError("give --response R");
  int m = static_cast<int>(responses.size());
  if (auto reps = in.optional_whole("--replicates", 1, 1000)) {
    if (responses.size() > 1 && *reps != m) {
      throw UsageError("--replicates " + std::to_string(*reps) + " does not match the " +
                       std::to_string(m) + " --response values given");
    }
    m = static_cast<int>(*reps);
  }
  if (responses.size() > 1000) throw UsageError("give at most 1000 --response values");
  double sum = 0;
  for (double v : responses) sum += v;
  r.reading.response = require_finite(sum / static_cast<double>(responses.size()),
                                      "the mean of the --response values");
  r.reading.replicates = m;
  r.reading.is_response = in.optional_number("--is-response");
  r.reading.dilution = in.optional_number("--dilution").value_or(1.0);
  if (!(r.reading.dilution > 0)) {
    UsageError e("--dilution must be above 0, got " + format_shortest(r.reading.dilution),
                 "the dilution factor multiplies the concentration: 1 for an undiluted sample");
    e.set_option("--dilution");
    throw e;
  }
  auto s = in.open_session();
  const auto o = app::quantify(s, r);
  if (in.json()) {
    in.emit(report::quantify_json(o));
  } else {
    report::print_quantify(in.out(), o, s.zone());
  }
  if (o.result.status == ResultStatus::Refused) {
    std::string message = "quantitation of sample " + o.result.sample + " refused (result " +
                          std::to_string(o.result.id.value) + "):";
    for (const auto& f : o.result.reasons) message += " " + std::string(to_string(f.reason));
    return in.refused(message);
  }
  return 0;
}

int expiring(Invocation& in) {
  app::ExpiringRequest r;
  r.this_week = in.flag("--this-week");
  r.within = in.optional_duration("--within");
  if (r.this_week && r.within) throw UsageError("give --this-week or --within, not both");
  auto s = in.open_session();
  const auto o = app::expiring(s, r);
  if (in.json()) {
    in.emit(report::expiring_json(o));
  } else {
    report::print_expiring(in.out(), o, s.zone());
  }
  return 0;
}

int status(Invocation& in) {
  auto s = in.open_session();
  const auto board = app::status_board(s);
  if (in.json()) {
    in.emit(report::status_json(board, s.at()));
  } else {
    report::print_status_board(in.out(), board, s.zone(), s.at());
  }
  return 0;
}

int trace_result(Invocation& in) {
  const ResultId id = in.result_id("id");
  auto s = in.open_session();
  const auto t = app::trace_result(s, id);
  if (in.json()) {
    in.emit(report::trace_result_json(t, s.zone()));
  } else {
    report::print_trace_result(in.out(), t, s.zone());
  }
  return 0;
}

int trace_curve(Invocation& in) {
  const CurveId id = in.curve_id("id");
  auto s = in.open_session();
  const auto t = app::trace_curve(s, id);
  if (in.json()) {
    in.emit(report::trace_curve_json(t, s.zone()));
  } else {
    report::print_trace_curve(in.out(), t, s.zone());
  }
  return 0;
}

int trace_lot(Invocation& in) {
  const std::string code = in.code("code", "lot code");
  auto s = in.open_session();
  const auto t = app::trace_lot(s, code);
  if (in.json()) {
    in.emit(report::trace_lot_json(t, s.zone()));
  } else {
    report::print_trace_lot(in.out(), t, s.zone());
  }
  return 0;
}

}  // namespace cw::cli::handlers
