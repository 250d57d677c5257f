// SPDX-License-Identifier: Apache-2.0
// Views of checks, results, expiring curves, the status board and traces.
#include "report/quantitation_views.h"

#include "core/text.h"
#include "report/curve_views.h"
#include "report/numbers.h"
#include "report/registry_views.h"
#include "report/table.h"

namespace cw::report {
namespace {

std::string opt_sig(const std::optional<double>& v, int digits = 4) {
  return v ? format_sig(*v, digits) : "-";
}

}  // namespace

Json reason_tokens(const std::vector<Finding>& findings) {
  Json list = Json::array();
  for (const auto& f : findings) list.push_back(std::string(to_string(f.reason)));
  return list;
}

/// What was released: "< 0.5 mg/L" for a censored result, never its computed number.
std::string released_text(const Result& r, const std::string& unit) {
  if (r.status == ResultStatus::Refused) return "refused";
  const std::string with_unit = unit.empty() ? "" : " " + unit;
  if (r.censored && r.reporting_limit)
    return "< " + format_plain(*r.reporting_limit, 6) + with_unit;
  if (!r.concentration) return "-";
  return format_sig(*r.concentration, 4) + with_unit;
}

std::string result_value_text(const Result& r, const std::string& unit) {
  std::string s = released_text(r, unit);
  if (r.status == ResultStatus::Reported && !r.censored && r.ci_low && r.ci_high)
    s += " (95 % CI " + format_sig(*r.ci_low, 4) + " to " + format_sig(*r.ci_high, 4) + ")";
  if (r.censored) s += " [censored]";
  for (const auto& f : r.flags) s += " [" + std::string(to_string(f)) + "]";
  if (r.current_status() == ResultStatus::RerunRequired) s = "RE-RUN REQUIRED (was " + s + ")";
  return s;
}

Json status_event_json(const ResultStatusEvent& e) {
  return Json{{"status", std::string(to_string(e.status))},
              {"reason", std::string(to_string(e.reason))},
              {"detail", e.detail},
              {"check_id", e.check_id ? Json(e.check_id->value) : Json(nullptr)},
              {"run_id", e.run_id ? Json(e.run_id->value) : Json(nullptr)},
              {"at", json_instant(e.occurred_at)}};
}

Json uncertainty_json(const std::optional<ResultUncertainty>& u) {
  if (!u) return nullptr;
  Json components = Json::array();
  for (const auto& c : u->components) {
    components.push_back({{"source", c.source}, {"relative_u", c.relative_u}});
  }
  return Json{{"components", components},
              {"combined", u->combined},
              {"expanded", u->expanded},
              {"k", u->k}};
}

namespace {

std::string uncertainty_text(const ResultUncertainty& u, const std::string& unit) {
  std::string s = "expanded uncertainty ± " + format_sig(u.expanded, 3) + " " + unit +
                  " (k = " + format_shortest(u.k) + "; from";
  for (std::size_t i = 0; i < u.components.size(); ++i) {
    s += std::string(i ? ", " : " ") + u.components[i].source + " " +
         format_sig(100 * u.components[i].relative_u, 2) + " %";
  }
  return s + ")";
}

void print_lots(std::ostream& out, const std::vector<Lot>& lots, const LabZone& zone, Instant at) {
  for (const auto& l : lots) {
    out << "    " << l.code << "  " << l.material
        << (l.certificate ? ", certificate " + *l.certificate : "") << ", usable through "
        << format_date(l.effective_expires_on()) << ", " << lot_status(l, zone, at)
        << " at the result's time\n";
    for (const auto& v : l.values) {
      out << "      " << v.analyte << " = " << format_shortest(v.value)
          << (v.uncertainty ? " ± " + format_shortest(*v.uncertainty) : "") << "\n";
    }
  }
}

}  // namespace

Json check_json(const Check& k) {
  return Json{{"check_id", k.id.value},
              {"curve_id", k.curve_id.value},
              {"kind", std::string(to_string(k.kind))},
              {"at", json_instant(k.occurred_at)},
              {"nominal", k.nominal},
              {"response", k.response},
              {"is_response", json_number(k.is_response)},
              {"measured", json_number(k.measured)},
              {"recovery_pct", json_number(k.recovery_pct)},
              {"limit_low", json_number(k.limit_low)},
              {"limit_high", json_number(k.limit_high)},
              {"passed", k.passed},
              {"analyst", k.analyst},
              {"run_id", k.run_id ? Json(k.run_id->value) : Json(nullptr)}};
}

Json check_outcome_json(const app::CheckOutcome& o) {
  Json j = check_json(o.check);
  j["curve_state"] = std::string(to_string(o.curve.status.state));
  j["reasons"] = reasons_json(o.curve.status);
  Json ids = Json::array();
  for (const auto& r : o.affected_results) ids.push_back(r.id.value);
  j["affected_results"] = ids;
  return j;
}

void print_check_outcome(std::ostream& out, const app::CheckOutcome& o, const LabZone& zone) {
  const Check& k = o.check;
  out << (k.kind == CheckKind::Check ? "Check " : "Blank ") << k.id.value << " on curve "
      << k.curve_id.value << " (" << o.curve.curve.analyte << ") at "
      << zone.format_local(k.occurred_at) << ": ";
  if (!k.measured) {
    out << "the response has no solution on the curve\n";
  } else if (k.kind == CheckKind::Check) {
    out << "measured " << format_sig(*k.measured, 4) << " " << o.unit << " against nominal "
        << format_shortest(k.nominal) << ", recovery "
        << format_fixed_against(*k.recovery_pct,
                                {k.limit_low.value_or(0), k.limit_high.value_or(0)}, 1)
        << " % (allowed " << format_shortest(*k.limit_low) << "–" << format_shortest(*k.limit_high)
        << " %)\n";
  } else {
    out << "measured " << format_sig(*k.measured, 4) << " " << o.unit << " (must be below "
        << format_sig(*k.limit_high, 4) << " " << o.unit << ")\n";
  }
  out << (k.passed ? "PASSED" : "FAILED") << "\n";
  print_status(out, o.curve.status, zone);
  if (!k.passed) {
    if (o.affected_results.empty()) {
      out << "No results were quantified from this curve since its last passing check.\n";
    } else {
      out << o.affected_results.size()
          << " result(s) since the last passing check must be re-run (each now "
             "rerun-required):\n";
      Table t({{"result", Table::Align::Right}, {"sample"}, {"at"}, {"reported"}});
      for (const auto& r : o.affected_results) {
        t.add_row({std::to_string(r.id.value), r.sample, zone.format_local(r.occurred_at),
                   result_value_text(r, o.unit)});
      }
      t.print(out, 2);
    }
  }
}

Json result_json(const Result& r) {
  return Json{{"result_id", r.id.value},
              {"status", std::string(to_string(r.current_status()))},
              {"recorded_status", std::string(to_string(r.status))},
              {"rerun", r.latest_event ? status_event_json(*r.latest_event) : Json(nullptr)},
              {"run_id", r.run_id ? Json(r.run_id->value) : Json(nullptr)},
              {"run_position", json_optional(r.run_position)},
              {"sample", r.sample},
              {"analyte", r.analyte},
              {"curve_id", r.curve_id ? Json(r.curve_id->value) : Json(nullptr)},
              {"response", r.response},
              {"is_response", json_number(r.is_response)},
              {"replicates", r.replicates},
              {"dilution", r.dilution},
              {"x0", json_number(r.x0)},
              {"sd_x0", json_number(r.sd_x0)},
              {"concentration", json_number(r.concentration)},
              {"ci_low", json_number(r.ci_low)},
              {"ci_high", json_number(r.ci_high)},
              {"censored", r.censored ? Json("<") : Json(nullptr)},
              {"reporting_limit", json_number(r.reporting_limit)},
              {"computed_concentration", json_number(r.computed_concentration)},
              {"uncertainty", uncertainty_json(r.uncertainty)},
              {"flags", tokens(r.flags)},
              {"reasons", reason_tokens(r.reasons)},
              {"reason_details", reason_details_json(r.reasons)},
              {"analyst", r.analyst},
              {"at", json_instant(r.occurred_at)}};
}

Json quantify_json(const app::QuantifyOutcome& o) {
  Json j = result_json(o.result);
  j["unit"] = o.unit.empty() ? Json(nullptr) : Json(o.unit);
  j["report_as"] = o.result.status == ResultStatus::Reported ? Json(released_text(o.result, o.unit))
                                                             : Json(nullptr);
  j["suggested_dilution"] = json_number(o.suggested_dilution);
  j["method"] = o.curve ? Json(o.curve->method_code) : Json(nullptr);
  j["method_version"] = json_optional(o.method_version);
  j["instrument"] = o.curve ? Json(o.curve->instrument_code) : Json(nullptr);
  Json lots = Json::array();
  for (const auto& l : o.lots) lots.push_back(l.code);
  j["lots"] = lots;
  return j;
}

void print_quantify(std::ostream& out, const app::QuantifyOutcome& o, const LabZone& zone) {
  const Result& r = o.result;
  out << "Result " << r.id.value << "  sample " << r.sample << "  " << r.analyte << "\n";
  if (r.status == ResultStatus::Refused) {
    out << "  REFUSED at " << zone.format_local(r.occurred_at) << ":\n";
    for (const auto& d : r.reasons) {
      out << "  - " << to_string(d.reason) << ": " << d.message << "\n";
    }
    out << "  Nothing may be reported for this sample from this quantitation; the refusal is "
           "recorded.\n";
    return;
  }
  if (r.censored) {
    out << "  reported as " << released_text(r, o.unit)
        << " (below the reporting limit; what was computed is kept in the record, not released)\n";
    out << "  from response " << format_shortest(r.response)
        << (r.replicates > 1 ? " (mean of " + std::to_string(r.replicates) + ")" : "")
        << ", dilution factor " << format_shortest(r.dilution) << "\n";
  } else {
    out << "  concentration " << format_sig(*r.concentration, 4) << " " << o.unit << "  (95 % CI "
        << format_sig(*r.ci_low, 4) << " to " << format_sig(*r.ci_high, 4) << " " << o.unit
        << ")\n";
    if (r.uncertainty) out << "  " << uncertainty_text(*r.uncertainty, o.unit) << "\n";
    out << "  from response " << format_shortest(r.response)
        << (r.replicates > 1 ? " (mean of " + std::to_string(r.replicates) + ")" : "")
        << "; instrument level " << format_sig(*r.x0, 4) << " " << o.unit << " ± "
        << format_sig(*r.sd_x0, 3) << " (s.d.), dilution factor " << format_shortest(r.dilution)
        << "\n";
  }
  if (o.curve) {
    out << "  curve " << o.curve->curve.id.value << " (method " << o.curve->method_code << " v"
        << o.curve->version.version << ", instrument " << o.curve->instrument_code << ", lots";
    for (const auto& l : o.lots) out << " " << l.code;
    out << "), active at " << zone.format_local(r.occurred_at) << "\n";
  }
  out << kReviewCaution << "\n";
}

Json expiring_json(const app::ExpiringOutcome& o) {
  Json curves = Json::array();
  for (const auto& e : o.curves) {
    curves.push_back({{"id", e.id.value},
                      {"analyte", e.analyte},
                      {"method", e.method_code},
                      {"method_version", e.method_version},
                      {"instrument", e.instrument_code},
                      {"expires_at", json_instant(e.expires_at)},
                      {"limited_by", e.limited_by}});
  }
  return Json{{"window", {{"from", json_instant(o.from)}, {"to", json_instant(o.to)}}},
              {"curves", curves}};
}

void print_expiring(std::ostream& out, const app::ExpiringOutcome& o, const LabZone& zone) {
  out << "Active curves whose validity ends between " << zone.format_local(o.from) << " and "
      << zone.format_local(o.to) << " (" << zone.name() << "):\n";
  if (o.curves.empty()) {
    out << "  none\n";
    return;
  }
  Table t({{"expires"},
           {"id", Table::Align::Right},
           {"analyte"},
           {"method"},
           {"instrument"},
           {"limited by"}});
  for (const auto& e : o.curves) {
    t.add_row({zone.format_local(e.expires_at), std::to_string(e.id.value), e.analyte,
               e.method_code + " v" + std::to_string(e.method_version), e.instrument_code,
               e.limited_by});
  }
  t.print(out, 2);
}

Json status_json(const std::vector<app::InstrumentStatus>& board, Instant at) {
  Json instruments = Json::array();
  for (const auto& st : board) {
    Json counts = Json::object();
    for (const auto& [state, n] : st.counts) counts[std::string(to_string(state))] = n;
    Json expiring = Json::array();
    for (const auto& e : st.expiring_soon) {
      expiring.push_back({{"id", e.id.value},
                          {"analyte", e.analyte},
                          {"method", e.method_code},
                          {"expires_at", json_instant(e.expires_at)}});
    }
    Json blocked = Json::array();
    for (const auto& [method, analyte] : st.blocked)
      blocked.push_back({{"method", method}, {"analyte", analyte}});
    Json failures = Json::array();
    for (const auto& k : st.recent_failures) failures.push_back(check_json(k));
    instruments.push_back({{"instrument", st.instrument.code},
                           {"in_service", st.instrument.in_service_at(at)},
                           {"counts", counts},
                           {"expiring_7_days", expiring},
                           {"blocked", blocked},
                           {"recent_failed_checks", failures}});
  }
  return Json{{"as_of", json_instant(at)}, {"instruments", instruments}};
}

void print_status_board(std::ostream& out, const std::vector<app::InstrumentStatus>& board,
                        const LabZone& zone, Instant at) {
  out << "Status at " << zone.format_local(at) << " (" << zone.name() << ")\n";
  if (board.empty()) out << "No instruments registered.\n";
  for (const auto& st : board) {
    out << "\n" << st.instrument.code << (st.instrument.name ? "  " + *st.instrument.name : "");
    if (const ServiceEvent* e = st.instrument.out_of_service_event_at(at)) {
      out << "  OUT OF SERVICE since " << zone.format_local(e->occurred_at) << " (" << e->reason
          << ")";
    }
    out << "\n  curves:";
    for (const auto& [state, n] : st.counts) out << " " << to_string(state) << " " << n << ";";
    out << "\n";
    if (!st.expiring_soon.empty()) {
      out << "  expiring in the next 7 days:\n";
      for (const auto& e : st.expiring_soon) {
        out << "    " << zone.format_local(e.expires_at) << "  curve " << e.id.value << " "
            << e.analyte << " (" << e.method_code << ")\n";
      }
    }
    if (!st.blocked.empty()) {
      out << "  BLOCKED (no active curve):";
      for (const auto& [method, analyte] : st.blocked)
        out << " " << method << "/" << analyte << ";";
      out << "\n";
    }
    if (!st.recent_failures.empty()) {
      out << "  recent failed checks:\n";
      for (const auto& k : st.recent_failures) {
        out << "    " << zone.format_local(k.occurred_at) << "  " << to_string(k.kind) << " "
            << k.id.value << " on curve " << k.curve_id.value;
        if (k.recovery_pct)
          out << ", recovery "
              << format_fixed_against(*k.recovery_pct,
                                      {k.limit_low.value_or(0), k.limit_high.value_or(0)}, 1)
              << " %";
        out << "\n";
      }
    }
  }
}

Json trace_result_json(const app::ResultTrace& t, const LabZone& zone) {
  Json j;
  j["result"] = result_json(t.result);
  j["curve"] = t.curve ? curve_json(*t.curve, zone) : Json(nullptr);
  if (t.calibration) {
    Json lots = Json::array();
    for (const auto& l : t.lots) lots.push_back(l.code);
    j["calibration"] = {{"id", t.calibration->id.value},
                        {"acquired_at", json_instant(t.calibration->acquired_at)},
                        {"analyst", t.calibration->analyst},
                        {"note", json_optional(t.calibration->note)},
                        {"points_file", t.calibration->points_file},
                        {"points_sha256", t.calibration->points_sha256},
                        {"lots", lots}};
  } else {
    j["calibration"] = nullptr;
  }
  if (t.method_version) {
    j["method_version"] = {{"method", t.method_code},
                           {"version", t.method_version->version},
                           {"effective_at", json_instant(t.method_version->effective_at)},
                           {"source_sha256", t.method_version->source_sha256},
                           {"title", t.method_version->definition.title}};
  } else {
    j["method_version"] = t.method_code.empty() ? Json(nullptr) : Json({{"method", t.method_code}});
  }
  j["instrument"] =
      t.instrument ? instrument_json(*t.instrument, t.result.occurred_at) : Json(nullptr);
  Json lots = Json::array();
  for (const auto& l : t.lots) lots.push_back(lot_json(l, zone, t.result.occurred_at));
  j["lots"] = lots;
  Json checks = Json::array();
  if (t.check_before) {
    Json k = check_json(*t.check_before);
    k["bracket"] = "before";
    k["position"] = json_optional(t.check_before_position);
    checks.push_back(k);
  }
  if (t.check_after) {
    Json k = check_json(*t.check_after);
    k["bracket"] = "after";
    k["position"] = json_optional(t.check_after_position);
    checks.push_back(k);
  }
  j["checks"] = checks;
  if (t.run) {
    j["run"] = {{"run_id", t.run->id.value},
                {"position", json_optional(t.result.run_position)},
                {"file_name", t.run->file_name},
                {"file_sha256", t.run->file_sha256},
                {"acquired_at", json_instant(t.run->acquired_at)},
                {"analyst", t.run->analyst}};
  } else {
    j["run"] = nullptr;
  }
  Json history = Json::array();
  for (const auto& e : t.history) history.push_back(status_event_json(e));
  j["status_history"] = history;
  if (t.curve) {
    j["state_at_result_time"] = {
        {"state", std::string(to_string(t.curve->status.state))},
        {"reasons", reasons_json(t.curve->status)},
        {"reason_details", reason_details_json(t.curve->status.blocking())}};
  } else {
    j["state_at_result_time"] = nullptr;
  }
  return j;
}

void print_trace_result(std::ostream& out, const app::ResultTrace& t, const LabZone& zone) {
  const Result& r = t.result;
  const std::string unit = t.method_version ? t.method_version->definition.unit : "";
  out << "Result " << r.id.value << ": sample " << r.sample << ", " << r.analyte << ", "
      << result_value_text(r, unit) << "\n  quantified " << zone.format_local(r.occurred_at)
      << " by " << r.analyst << " from response " << format_shortest(r.response) << ", dilution "
      << format_shortest(r.dilution) << "\n";
  if (r.uncertainty) out << "  " << uncertainty_text(*r.uncertainty, unit) << "\n";
  for (const auto& d : r.reasons) out << "  - " << to_string(d.reason) << ": " << d.message << "\n";
  if (!t.curve) {
    out << "  no curve was used\n";
    return;
  }
  const auto& c = t.curve->curve;
  out << "Curve " << c.id.value << " (" << fitting::to_string(c.fit.model) << ", "
      << fitting::to_string(c.fit.weighting) << "): slope " << format_sig(c.fit.slope, 6)
      << ", intercept " << format_sig(c.fit.intercept, 6) << ", r² "
      << r2_text(c.fit,
                 t.method_version ? t.method_version->definition.calibration.min_r2 : std::nullopt)
      << ", " << c.fit.n_points << " points, verdict " << to_string(c.verdict) << "\n";
  out << "  state at the result's time:";
  out << "\n";
  print_status(out, t.curve->status, zone, 4);
  if (t.calibration) {
    out << "Calibration " << t.calibration->id.value << " acquired "
        << zone.format_local(t.calibration->acquired_at) << " by " << t.calibration->analyst
        << "; points file " << t.calibration->points_file << " (sha256 "
        << t.calibration->points_sha256 << ")\n";
    for (const auto& rv : c.reviews) {
      out << "  " << (rv.decision == ReviewDecision::Approve ? "approved" : "rejected") << " by "
          << rv.reviewer << " " << zone.format_local(rv.occurred_at) << ": " << rv.reason << "\n";
    }
  }
  if (t.method_version) {
    out << "Method " << t.method_code << " version " << t.method_version->version
        << " (in force from " << zone.format_local(t.method_version->effective_at)
        << ", file sha256 " << t.method_version->source_sha256 << ")\n";
  }
  if (t.instrument) {
    out << "Instrument " << t.instrument->code
        << (t.instrument->in_service_at(r.occurred_at) ? " (in service" : " (OUT OF SERVICE")
        << " at the result's time)\n";
  }
  out << "Lots:\n";
  print_lots(out, t.lots, zone, r.occurred_at);
  if (t.run) {
    out << "Run " << t.run->id.value << " (" << t.run->file_name << ", sha256 "
        << t.run->file_sha256 << "), position " << t.result.run_position.value_or(0)
        << ", imported " << zone.format_local(t.run->acquired_at) << " by " << t.run->analyst
        << "\n";
  }
  out << "Bracketing checks:\n";
  if (!t.check_before && !t.check_after) out << "  none logged against this curve\n";
  const auto where = [&](const std::optional<long>& position, const Check& k) {
    return position ? "at position " + std::to_string(*position) + " of the run"
                    : "at " + zone.format_local(k.occurred_at);
  };
  if (t.check_before) {
    out << "  before: " << to_string(t.check_before->kind) << " " << t.check_before->id.value << " "
        << where(t.check_before_position, *t.check_before) << " "
        << (t.check_before->passed ? "passed" : "FAILED") << "\n";
  }
  if (t.check_after) {
    out << "  after:  " << to_string(t.check_after->kind) << " " << t.check_after->id.value << " "
        << where(t.check_after_position, *t.check_after) << " "
        << (t.check_after->passed ? "passed" : "FAILED") << "\n";
  } else if (t.check_before) {
    out << "  after:  none yet (the result is not bracketed by a closing check)\n";
  }
  out << "Status history:\n";
  out << "  " << zone.format_local(r.occurred_at) << "  " << to_string(r.status) << "\n";
  for (const auto& e : t.history) {
    out << "  " << zone.format_local(e.occurred_at) << "  " << to_string(e.status) << " ("
        << to_string(e.reason) << "): " << e.detail << "\n";
  }
}

Json trace_curve_json(const app::CurveTrace& t, const LabZone& zone) {
  Json checks = Json::array();
  for (const auto& k : t.checks) checks.push_back(check_json(k));
  Json results = Json::array();
  for (const auto& r : t.results) results.push_back(result_json(r));
  return Json{{"curve", curve_json(t.curve, zone)}, {"checks", checks}, {"results", results}};
}

void print_trace_curve(std::ostream& out, const app::CurveTrace& t, const LabZone& zone) {
  const auto& c = t.curve.curve;
  const std::string& unit = t.curve.version.definition.unit;
  out << "Curve " << c.id.value << "  " << c.analyte << "  method " << t.curve.method_code << " v"
      << t.curve.version.version << ", instrument " << t.curve.instrument_code << ", acquired "
      << zone.format_local(c.acquired_at) << "\n";
  print_status(out, t.curve.status, zone);
  out << "Checks (" << t.checks.size() << "):\n";
  if (!t.checks.empty()) {
    Table k({{"id", Table::Align::Right},
             {"kind"},
             {"at"},
             {"measured", Table::Align::Right},
             {"recovery", Table::Align::Right},
             {""}});
    for (const auto& x : t.checks) {
      k.add_row({std::to_string(x.id.value), std::string(to_string(x.kind)),
                 zone.format_local(x.occurred_at), opt_sig(x.measured),
                 x.recovery_pct ? format_fixed_against(
                                      *x.recovery_pct,
                                      {x.limit_low.value_or(0), x.limit_high.value_or(0)}, 1) +
                                      " %"
                                : "-",
                 x.passed ? "passed" : "FAILED"});
    }
    k.print(out, 2);
  }
  out << "Results (" << t.results.size() << "):\n";
  if (!t.results.empty()) {
    Table rt({{"id", Table::Align::Right}, {"sample"}, {"at"}, {"value"}});
    for (const auto& r : t.results) {
      rt.add_row({std::to_string(r.id.value), r.sample, zone.format_local(r.occurred_at),
                  result_value_text(r, unit)});
    }
    rt.print(out, 2);
  }
}

Json trace_lot_json(const app::LotTrace& t, const LabZone& zone) {
  Json curves = Json::array();
  for (const auto& v : t.curves) curves.push_back(curve_list_item_json(v));
  Json results = Json::array();
  for (const auto& r : t.results) {
    // Each result with the lot, what was released and where it came from: one row of the
    // impact list (and of its CSV).
    const app::CurveView* v = nullptr;
    for (const auto& c : t.curves) {
      if (r.curve_id && c.curve.id == *r.curve_id) v = &c;
    }
    const std::string unit = v ? v->version.definition.unit : "";
    Json row = result_json(r);
    row["lot"] = t.lot.code;
    row["released"] =
        r.status == ResultStatus::Reported ? Json(released_text(r, unit)) : Json(nullptr);
    row["unit"] = unit.empty() ? Json(nullptr) : Json(unit);
    row["method"] = v ? Json(v->method_code) : Json(nullptr);
    row["method_version"] = v ? Json(v->version.version) : Json(nullptr);
    row["instrument"] = v ? Json(v->instrument_code) : Json(nullptr);
    results.push_back(std::move(row));
  }
  return Json{{"lot", lot_json(t.lot, zone,
                               t.curves.empty() ? t.lot.registered_at : t.curves.front().as_of)},
              {"curves", curves},
              {"results", results}};
}

void print_trace_lot(std::ostream& out, const app::LotTrace& t, const LabZone& zone) {
  out << "Lot " << t.lot.code << " (" << t.lot.material << ")";
  if (t.lot.withdrawal)
    out << ", WITHDRAWN " << zone.format_local(t.lot.withdrawal->occurred_at) << ": "
        << t.lot.withdrawal->reason;
  out << "\n" << t.curves.size() << " curve(s) made with it:\n";
  if (!t.curves.empty()) print_curve_list(out, t.curves, zone);
  out << t.results.size() << " result(s) from those curves:\n";
  if (!t.results.empty()) {
    Table rt({{"id", Table::Align::Right},
              {"sample"},
              {"analyte"},
              {"curve", Table::Align::Right},
              {"at"},
              {"value"}});
    for (const auto& r : t.results) {
      std::string unit;
      for (const auto& v : t.curves) {
        if (r.curve_id && v.curve.id == *r.curve_id) unit = v.version.definition.unit;
      }
      rt.add_row({std::to_string(r.id.value), r.sample, r.analyte,
                  r.curve_id ? std::to_string(r.curve_id->value) : "-",
                  zone.format_local(r.occurred_at), result_value_text(r, unit)});
    }
    rt.print(out, 2);
  }
}

}  // namespace cw::report
