// SPDX-License-Identifier: Apache-2.0
// SQL for calibrations, curves, points, reviews, retirements, checks, results and refusals.
#include "store/curve_repository.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <nlohmann/json.hpp>

#include "store/codec.h"
#include "store/connection_impl.h"

namespace cw::store {
namespace {

using nlohmann::json;

std::string json_list(const std::vector<std::string>& v) {
  return json(v).dump();
}
std::vector<std::string> list_from(const std::string& text) {
  return json::parse(text).get<std::vector<std::string>>();
}

std::optional<std::int64_t> opt_id(const auto& id) {
  if (!id) return std::nullopt;
  return id->value;
}

std::vector<CurveId> ids_of(SQLite::Statement& s) {
  std::vector<CurveId> out;
  while (s.executeStep()) out.emplace_back(s.getColumn(0).getInt64());
  return out;
}

Check check_of(SQLite::Statement& s) {
  Check k;
  k.id = CheckId{s.getColumn("id").getInt64()};
  k.curve_id = CurveId{s.getColumn("curve_id").getInt64()};
  k.kind = *parse_check_kind(s.getColumn("kind").getString());
  k.nominal = s.getColumn("nominal").getDouble();
  k.response = s.getColumn("response").getDouble();
  k.is_response = opt_real(s.getColumn("is_response"));
  k.measured = opt_real(s.getColumn("measured"));
  k.recovery_pct = opt_real(s.getColumn("recovery_pct"));
  k.limit_low = opt_real(s.getColumn("limit_low"));
  k.limit_high = opt_real(s.getColumn("limit_high"));
  k.passed = s.getColumn("passed").getInt64() != 0;
  k.analyst = s.getColumn("analyst").getString();
  k.occurred_at = instant_of(s.getColumn("occurred_at"));
  return k;
}

Result result_of(SQLite::Statement& s) {
  Result r;
  r.id = ResultId{s.getColumn("id").getInt64()};
  r.sample = s.getColumn("sample").getString();
  r.analyte = s.getColumn("analyte").getString();
  r.status = s.getColumn("status").getString() == "reported" ? ResultStatus::Reported
                                                             : ResultStatus::Refused;
  if (auto v = opt_int(s.getColumn("curve_id"))) r.curve_id = CurveId{*v};
  if (auto v = opt_int(s.getColumn("method_id"))) r.method_id = MethodId{*v};
  if (auto v = opt_int(s.getColumn("instrument_id"))) r.instrument_id = InstrumentId{*v};
  r.response = s.getColumn("response").getDouble();
  r.is_response = opt_real(s.getColumn("is_response"));
  r.replicates = s.getColumn("replicates").getInt();
  r.dilution = s.getColumn("dilution").getDouble();
  r.x0 = opt_real(s.getColumn("x0"));
  r.sd_x0 = opt_real(s.getColumn("sd_x0"));
  r.concentration = opt_real(s.getColumn("concentration"));
  r.ci_low = opt_real(s.getColumn("ci_low"));
  r.ci_high = opt_real(s.getColumn("ci_high"));
  r.flags = list_from(s.getColumn("flags").getString());
  r.reasons = list_from(s.getColumn("reasons").getString());
  for (const auto& d : json::parse(s.getColumn("reason_details").getString())) {
    ReasonDetail detail;
    detail.reason = d.at("reason").get<std::string>();
    if (!d.at("since").is_null()) detail.since = parse_instant(d.at("since").get<std::string>());
    detail.message = d.at("message").get<std::string>();
    r.details.push_back(std::move(detail));
  }
  r.analyst = s.getColumn("analyst").getString();
  r.occurred_at = instant_of(s.getColumn("occurred_at"));
  return r;
}

}  // namespace

CalibrationId insert_calibration(WriteTransaction& tx, const Calibration& c) {
  return guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO calibrations (method_version_id, instrument_id, acquired_at, analyst, note, "
        "points_file, "
        "points_sha256, audit_seq) VALUES (:mv, :instrument, :at, :analyst, :note, :file, :sha, "
        ":seq)");
    bind_int(s, ":mv", c.method_version_id.value);
    bind_int(s, ":instrument", c.instrument_id.value);
    bind_instant(s, ":at", c.acquired_at);
    bind_text(s, ":analyst", c.analyst);
    bind_opt_text(s, ":note", c.note);
    bind_text(s, ":file", c.points_file);
    bind_text(s, ":sha", c.points_sha256);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    const CalibrationId id{last_id(impl)};
    tx.add_row(FactTable::Calibrations, id.value);
    for (const LotId lot : c.lots) {
      auto& l = impl.statement(
          "INSERT INTO calibration_lots (calibration_id, lot_id, audit_seq) VALUES (:calibration, "
          ":lot, :seq)");
      bind_int(l, ":calibration", id.value);
      bind_int(l, ":lot", lot.value);
      bind_int(l, ":seq", tx.seq());
      l.exec();
      tx.add_row(FactTable::CalibrationLots, last_id(impl));
    }
    return id;
  });
}

CurveId insert_curve(WriteTransaction& tx, const Curve& c) {
  return guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO curves (calibration_id, method_id, instrument_id, acquired_at, analyte, "
        "model, weighting, "
        "intercept, slope, quadratic, se_intercept, se_slope, se_quadratic, r2, residual_sd, dof, "
        "n_points, "
        "n_levels, range_low, range_high, lod, loq, rf_rsd_pct, verdict, failed_criteria, "
        "statistics, acceptance, "
        "expires_at, audit_seq) VALUES (:calibration, :method, :instrument, :at, :analyte, :model, "
        ":weighting, "
        ":a, :b, :c, :sa, :sb, :sc, :r2, :sd, :dof, :n, :levels, :low, :high, :lod, :loq, :rsd, "
        ":verdict, "
        ":failed, :statistics, :acceptance, :expires, :seq)");
    const auto& f = c.fit;
    bind_int(s, ":calibration", c.calibration_id.value);
    bind_int(s, ":method", c.method_id.value);
    bind_int(s, ":instrument", c.instrument_id.value);
    bind_instant(s, ":at", c.acquired_at);
    bind_text(s, ":analyte", c.analyte);
    bind_text(s, ":model", std::string(fitting::to_string(f.model)));
    bind_text(s, ":weighting", std::string(fitting::to_string(f.weighting)));
    bind_real(s, ":a", f.intercept);
    bind_real(s, ":b", f.slope);
    bind_real(s, ":c", f.quadratic);
    bind_real(s, ":sa", f.se_intercept);
    bind_real(s, ":sb", f.se_slope);
    bind_real(s, ":sc", f.se_quadratic);
    bind_real(s, ":r2", f.r2);
    bind_real(s, ":sd", f.residual_sd);
    bind_int(s, ":dof", f.dof);
    bind_int(s, ":n", f.n_points);
    bind_int(s, ":levels", f.n_levels);
    bind_real(s, ":low", f.range_low);
    bind_real(s, ":high", f.range_high);
    // A zero slope gives infinite limits; REAL columns cannot hold them, so store the largest
    // double.
    bind_real(s, ":lod", std::isfinite(f.lod) ? f.lod : std::numeric_limits<double>::max());
    bind_real(s, ":loq", std::isfinite(f.loq) ? f.loq : std::numeric_limits<double>::max());
    bind_real(s, ":rsd", f.rf_rsd_pct);
    bind_text(s, ":verdict", std::string(to_string(c.verdict)));
    bind_text(s, ":failed", json_list(c.failed_criteria));
    bind_text(s, ":statistics", fit_to_json(f).dump());
    bind_text(s, ":acceptance", acceptance_to_json(c.acceptance).dump());
    bind_instant(s, ":expires", c.expires_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    const CurveId id{last_id(impl)};
    tx.add_row(FactTable::Curves, id.value);
    for (const auto& p : c.points) {
      auto& ps = impl.statement(
          "INSERT INTO curve_points (curve_id, source_line, level, replicate, nominal, response, "
          "is_response, y, "
          "back_calculated, error_pct, within_limits, excluded, exclude_reason, audit_seq) VALUES "
          "(:curve, :line, "
          ":level, :rep, :nominal, :response, :is, :y, :back, :re, :within, :excluded, :why, "
          ":seq)");
      bind_int(ps, ":curve", id.value);
      bind_int(ps, ":line", p.source_line);
      bind_text(ps, ":level", p.level);
      bind_int(ps, ":rep", p.replicate);
      bind_real(ps, ":nominal", p.nominal);
      bind_real(ps, ":response", p.response);
      bind_opt_real(ps, ":is", p.is_response);
      bind_real(ps, ":y", p.y);
      bind_opt_real(ps, ":back", p.back_calculated);
      bind_opt_real(ps, ":re", p.error_pct);
      bind_int(ps, ":within", p.within_limits ? 1 : 0);
      bind_int(ps, ":excluded", p.excluded ? 1 : 0);
      bind_opt_text(ps, ":why", p.exclude_reason);
      bind_int(ps, ":seq", tx.seq());
      ps.exec();
      tx.add_row(FactTable::CurvePoints, last_id(impl));
    }
    return id;
  });
}

void insert_review(WriteTransaction& tx, CurveId id, const CurveReview& r) {
  guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO curve_reviews (curve_id, decision, reviewer, reason, occurred_at, audit_seq) "
        "VALUES "
        "(:curve, :decision, :reviewer, :reason, :at, :seq)");
    bind_int(s, ":curve", id.value);
    bind_text(s, ":decision", std::string(to_string(r.decision)));
    bind_text(s, ":reviewer", r.reviewer);
    bind_text(s, ":reason", r.reason);
    bind_instant(s, ":at", r.occurred_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    tx.add_row(FactTable::CurveReviews, last_id(impl));
  });
}

void insert_retirement(WriteTransaction& tx, CurveId id, const CurveRetirement& r) {
  guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO curve_retirements (curve_id, retired_by, reason, occurred_at, audit_seq) "
        "VALUES "
        "(:curve, :by, :reason, :at, :seq)");
    bind_int(s, ":curve", id.value);
    bind_text(s, ":by", r.retired_by);
    bind_text(s, ":reason", r.reason);
    bind_instant(s, ":at", r.occurred_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    tx.add_row(FactTable::CurveRetirements, last_id(impl));
  });
}

CheckId insert_check(WriteTransaction& tx, const Check& k) {
  return guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO checks (curve_id, kind, nominal, response, is_response, measured, "
        "recovery_pct, limit_low, "
        "limit_high, passed, analyst, occurred_at, audit_seq) VALUES (:curve, :kind, :nominal, "
        ":response, :is, "
        ":measured, :recovery, :low, :high, :passed, :analyst, :at, :seq)");
    bind_int(s, ":curve", k.curve_id.value);
    bind_text(s, ":kind", std::string(to_string(k.kind)));
    bind_real(s, ":nominal", k.nominal);
    bind_real(s, ":response", k.response);
    bind_opt_real(s, ":is", k.is_response);
    bind_opt_real(s, ":measured", k.measured);
    bind_opt_real(s, ":recovery", k.recovery_pct);
    bind_opt_real(s, ":low", k.limit_low);
    bind_opt_real(s, ":high", k.limit_high);
    bind_int(s, ":passed", k.passed ? 1 : 0);
    bind_text(s, ":analyst", k.analyst);
    bind_instant(s, ":at", k.occurred_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    const CheckId id{last_id(impl)};
    tx.add_row(FactTable::Checks, id.value);
    return id;
  });
}

ResultId insert_result(WriteTransaction& tx, const Result& r) {
  return guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO results (sample, analyte, status, curve_id, method_id, instrument_id, "
        "response, is_response, "
        "replicates, dilution, x0, sd_x0, concentration, ci_low, ci_high, flags, reasons, "
        "reason_details, analyst, "
        "occurred_at, audit_seq) VALUES (:sample, :analyte, :status, :curve, :method, :instrument, "
        ":response, :is, "
        ":m, :dilution, :x0, :sd, :conc, :low, :high, :flags, :reasons, :details, :analyst, :at, "
        ":seq)");
    bind_text(s, ":sample", r.sample);
    bind_text(s, ":analyte", r.analyte);
    bind_text(s, ":status", std::string(to_string(r.status)));
    bind_opt_int(s, ":curve", opt_id(r.curve_id));
    bind_opt_int(s, ":method", opt_id(r.method_id));
    bind_opt_int(s, ":instrument", opt_id(r.instrument_id));
    bind_real(s, ":response", r.response);
    bind_opt_real(s, ":is", r.is_response);
    bind_int(s, ":m", r.replicates);
    bind_real(s, ":dilution", r.dilution);
    bind_opt_real(s, ":x0", r.x0);
    bind_opt_real(s, ":sd", r.sd_x0);
    bind_opt_real(s, ":conc", r.concentration);
    bind_opt_real(s, ":low", r.ci_low);
    bind_opt_real(s, ":high", r.ci_high);
    bind_text(s, ":flags", json_list(r.flags));
    bind_text(s, ":reasons", json_list(r.reasons));
    json details = json::array();
    for (const auto& d : r.details) {
      details.push_back({{"reason", d.reason},
                         {"since", d.since ? json(format_utc(*d.since)) : json(nullptr)},
                         {"message", d.message}});
    }
    bind_text(s, ":details", details.dump());
    bind_text(s, ":analyst", r.analyst);
    bind_instant(s, ":at", r.occurred_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    const ResultId id{last_id(impl)};
    tx.add_row(FactTable::Results, id.value);
    return id;
  });
}

void insert_refusal(WriteTransaction& tx, const Refusal& r) {
  guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO refusals (action, entity_kind, entity_id, actor, reasons, message, "
        "occurred_at, audit_seq) "
        "VALUES (:action, :kind, :id, :actor, :reasons, :message, :at, :seq)");
    bind_text(s, ":action", r.action);
    bind_text(s, ":kind", r.entity_kind);
    bind_text(s, ":id", r.entity_id);
    bind_text(s, ":actor", tx.actor().name);
    bind_text(s, ":reasons", json_list(r.reasons));
    bind_text(s, ":message", r.message);
    bind_instant(s, ":at", r.occurred_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    tx.add_row(FactTable::Refusals, last_id(impl));
  });
}

std::optional<Calibration> find_calibration(Connection& c, CalibrationId id) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Calibration> {
    Calibration cal;
    {
      auto& s = impl.statement("SELECT * FROM calibrations WHERE id = :id");
      bind_int(s, ":id", id.value);
      if (!s.executeStep()) return std::nullopt;
      cal.id = id;
      cal.method_version_id = MethodVersionId{s.getColumn("method_version_id").getInt64()};
      cal.instrument_id = InstrumentId{s.getColumn("instrument_id").getInt64()};
      cal.acquired_at = instant_of(s.getColumn("acquired_at"));
      cal.analyst = s.getColumn("analyst").getString();
      cal.note = opt_text(s.getColumn("note"));
      cal.points_file = s.getColumn("points_file").getString();
      cal.points_sha256 = s.getColumn("points_sha256").getString();
    }
    auto& l = impl.statement(
        "SELECT lot_id FROM calibration_lots WHERE calibration_id = :id ORDER BY id");
    bind_int(l, ":id", id.value);
    while (l.executeStep()) cal.lots.emplace_back(l.getColumn(0).getInt64());
    return cal;
  });
}

std::optional<Curve> find_curve(Connection& c, CurveId id) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Curve> {
    Curve curve;
    {
      auto& s = impl.statement(
          "SELECT c.*, k.analyst, k.method_version_id FROM curves c JOIN calibrations k ON k.id = "
          "c.calibration_id "
          "WHERE c.id = :id");
      bind_int(s, ":id", id.value);
      if (!s.executeStep()) return std::nullopt;
      curve.id = id;
      curve.calibration_id = CalibrationId{s.getColumn("calibration_id").getInt64()};
      curve.method_id = MethodId{s.getColumn("method_id").getInt64()};
      curve.method_version_id = MethodVersionId{s.getColumn("method_version_id").getInt64()};
      curve.instrument_id = InstrumentId{s.getColumn("instrument_id").getInt64()};
      curve.acquired_at = instant_of(s.getColumn("acquired_at"));
      curve.analyst = s.getColumn("analyst").getString();
      curve.analyte = s.getColumn("analyte").getString();
      curve.fit = fit_from_json(json::parse(s.getColumn("statistics").getString()));
      curve.acceptance = acceptance_from_json(json::parse(s.getColumn("acceptance").getString()));
      curve.verdict =
          s.getColumn("verdict").getString() == "accepted" ? Verdict::Accepted : Verdict::Rejected;
      curve.failed_criteria = list_from(s.getColumn("failed_criteria").getString());
      curve.expires_at = instant_of(s.getColumn("expires_at"));
    }
    {
      auto& s = impl.statement("SELECT * FROM curve_points WHERE curve_id = :id ORDER BY id");
      bind_int(s, ":id", id.value);
      while (s.executeStep()) {
        CalibrationPoint p;
        p.source_line = static_cast<long>(s.getColumn("source_line").getInt64());
        p.level = s.getColumn("level").getString();
        p.replicate = s.getColumn("replicate").getInt();
        p.nominal = s.getColumn("nominal").getDouble();
        p.response = s.getColumn("response").getDouble();
        p.is_response = opt_real(s.getColumn("is_response"));
        p.y = s.getColumn("y").getDouble();
        p.back_calculated = opt_real(s.getColumn("back_calculated"));
        p.error_pct = opt_real(s.getColumn("error_pct"));
        p.within_limits = s.getColumn("within_limits").getInt64() != 0;
        p.excluded = s.getColumn("excluded").getInt64() != 0;
        p.exclude_reason = opt_text(s.getColumn("exclude_reason"));
        curve.points.push_back(std::move(p));
      }
    }
    {
      auto& s = impl.statement(
          "SELECT * FROM curve_reviews WHERE curve_id = :id ORDER BY occurred_at, id");
      bind_int(s, ":id", id.value);
      while (s.executeStep()) {
        curve.reviews.push_back(
            {s.getColumn("decision").getString() == "approve" ? ReviewDecision::Approve
                                                              : ReviewDecision::Reject,
             s.getColumn("reviewer").getString(), s.getColumn("reason").getString(),
             instant_of(s.getColumn("occurred_at"))});
      }
    }
    {
      auto& s = impl.statement(
          "SELECT * FROM curve_retirements WHERE curve_id = :id ORDER BY occurred_at, id");
      bind_int(s, ":id", id.value);
      while (s.executeStep()) {
        curve.retirements.push_back({s.getColumn("retired_by").getString(),
                                     s.getColumn("reason").getString(),
                                     instant_of(s.getColumn("occurred_at"))});
      }
    }
    return curve;
  });
}

std::vector<CurveId> curves_of_calibration(Connection& c, CalibrationId id) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement("SELECT id FROM curves WHERE calibration_id = :id ORDER BY id");
    bind_int(s, ":id", id.value);
    return ids_of(s);
  });
}

std::vector<CurveId> list_curve_ids(Connection& c, const CurveFilter& f) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "SELECT id FROM curves WHERE (:method IS NULL OR method_id = :method) AND "
        "(:instrument IS NULL OR instrument_id = :instrument) AND (:analyte IS NULL OR analyte = "
        ":analyte) AND "
        "(:by IS NULL OR acquired_at <= :by) ORDER BY acquired_at, id");
    bind_opt_int(s, ":method", opt_id(f.method));
    bind_opt_int(s, ":instrument", opt_id(f.instrument));
    bind_opt_text(s, ":analyte", f.analyte);
    if (f.acquired_by) bind_instant(s, ":by", *f.acquired_by);
    return ids_of(s);
  });
}

std::vector<CurveId> live_curves_in_group(Connection& c, MethodId method, InstrumentId instrument,
                                          const std::string& analyte, std::optional<Instant> after,
                                          Instant by) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "SELECT id FROM curves WHERE method_id = :method AND instrument_id = :instrument AND "
        "analyte = :analyte "
        "AND acquired_at <= :by AND (:after IS NULL OR acquired_at >= :after) AND expires_at > :by "
        "ORDER BY acquired_at DESC, id DESC");
    bind_int(s, ":method", method.value);
    bind_int(s, ":instrument", instrument.value);
    bind_text(s, ":analyte", analyte);
    bind_instant(s, ":by", by);
    if (after) bind_instant(s, ":after", *after);
    return ids_of(s);
  });
}

std::optional<CurveId> latest_curve_in_group(Connection& c, MethodId method,
                                             InstrumentId instrument, const std::string& analyte,
                                             Instant by, bool accepted_only) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<CurveId> {
    auto& s = impl.statement(
        "SELECT id FROM curves WHERE method_id = :method AND instrument_id = :instrument AND "
        "analyte = :analyte AND acquired_at <= :by AND (:accepted = 0 OR verdict = 'accepted') "
        "ORDER BY acquired_at DESC, id DESC LIMIT 1");
    bind_int(s, ":accepted", accepted_only ? 1 : 0);
    bind_int(s, ":method", method.value);
    bind_int(s, ":instrument", instrument.value);
    bind_text(s, ":analyte", analyte);
    bind_instant(s, ":by", by);
    if (!s.executeStep()) return std::nullopt;
    return CurveId{s.getColumn(0).getInt64()};
  });
}

std::vector<Result> reported_results_between(Connection& c, CurveId id,
                                             std::optional<Instant> after, Instant until) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "SELECT * FROM results WHERE curve_id = :id AND status = 'reported' AND occurred_at <= "
        ":until "
        "AND (:after IS NULL OR occurred_at > :after) ORDER BY occurred_at, id");
    bind_int(s, ":id", id.value);
    bind_instant(s, ":until", until);
    if (after) bind_instant(s, ":after", *after);
    std::vector<Result> out;
    while (s.executeStep()) out.push_back(result_of(s));
    return out;
  });
}

std::vector<Result> results_of_curves(Connection& c, const std::vector<CurveId>& ids) {
  std::vector<Result> out;
  for (CurveId id : ids) {
    auto part = results_of_curve(c, id);
    out.insert(out.end(), part.begin(), part.end());
  }
  std::sort(out.begin(), out.end(), [](const Result& a, const Result& b) {
    return a.occurred_at != b.occurred_at ? a.occurred_at < b.occurred_at : a.id < b.id;
  });
  return out;
}

std::vector<std::pair<MethodId, std::string>> method_analytes_of_instrument(
    Connection& c, InstrumentId instrument) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "SELECT DISTINCT method_id, analyte FROM curves WHERE instrument_id = :instrument ORDER BY "
        "method_id, analyte");
    bind_int(s, ":instrument", instrument.value);
    std::vector<std::pair<MethodId, std::string>> out;
    while (s.executeStep())
      out.emplace_back(MethodId{s.getColumn(0).getInt64()}, s.getColumn(1).getString());
    return out;
  });
}

std::vector<CurveId> curves_expiring_between(Connection& c, Instant from, Instant to) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "SELECT id FROM curves WHERE expires_at >= :from AND expires_at < :to ORDER BY expires_at, "
        "id");
    bind_instant(s, ":from", from);
    bind_instant(s, ":to", to);
    return ids_of(s);
  });
}

std::string explain_expiring_query(Connection& c) {
  return guarded(c, [&](Connection::Impl& impl) {
    SQLite::Statement s(
        *impl.db,
        "EXPLAIN QUERY PLAN SELECT id FROM curves WHERE expires_at >= :from AND expires_at < :to "
        "ORDER BY expires_at, id");
    std::string plan;
    while (s.executeStep()) plan += s.getColumn(3).getString() + "\n";
    return plan;
  });
}

std::vector<CurveId> live_curves_of_instrument(Connection& c, InstrumentId instrument, Instant t) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "SELECT id FROM curves WHERE instrument_id = :instrument AND expires_at > :t AND "
        "acquired_at <= :t "
        "ORDER BY acquired_at, id");
    bind_int(s, ":instrument", instrument.value);
    bind_instant(s, ":t", t);
    return ids_of(s);
  });
}

std::vector<CurveId> curves_of_lot(Connection& c, LotId lot) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "SELECT c.id FROM calibration_lots l JOIN curves c ON c.calibration_id = l.calibration_id "
        "WHERE l.lot_id = :lot ORDER BY c.acquired_at, c.id");
    bind_int(s, ":lot", lot.value);
    return ids_of(s);
  });
}

std::vector<Check> checks_of_curve(Connection& c, CurveId id) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement("SELECT * FROM checks WHERE curve_id = :id ORDER BY occurred_at, id");
    bind_int(s, ":id", id.value);
    std::vector<Check> out;
    while (s.executeStep()) out.push_back(check_of(s));
    return out;
  });
}

std::optional<Check> find_check(Connection& c, CheckId id) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Check> {
    auto& s = impl.statement("SELECT * FROM checks WHERE id = :id");
    bind_int(s, ":id", id.value);
    if (!s.executeStep()) return std::nullopt;
    return check_of(s);
  });
}

std::vector<Check> recent_failed_checks(Connection& c, InstrumentId instrument, Instant by,
                                        std::size_t limit) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "SELECT k.* FROM checks k JOIN curves c ON c.id = k.curve_id WHERE c.instrument_id = "
        ":instrument "
        "AND k.passed = 0 AND k.occurred_at <= :by ORDER BY k.occurred_at DESC, k.id DESC LIMIT "
        ":limit");
    bind_int(s, ":instrument", instrument.value);
    bind_instant(s, ":by", by);
    bind_int(s, ":limit", static_cast<std::int64_t>(limit));
    std::vector<Check> out;
    while (s.executeStep()) out.push_back(check_of(s));
    return out;
  });
}

std::optional<Result> find_result(Connection& c, ResultId id) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Result> {
    auto& s = impl.statement("SELECT * FROM results WHERE id = :id");
    bind_int(s, ":id", id.value);
    if (!s.executeStep()) return std::nullopt;
    return result_of(s);
  });
}

std::vector<Result> results_of_curve(Connection& c, CurveId id) {
  return guarded(c, [&](Connection::Impl& impl) {
    auto& s = impl.statement("SELECT * FROM results WHERE curve_id = :id ORDER BY occurred_at, id");
    bind_int(s, ":id", id.value);
    std::vector<Result> out;
    while (s.executeStep()) out.push_back(result_of(s));
    return out;
  });
}

SettledCounts settled_curve_counts(Connection& c, InstrumentId instrument, Instant t) {
  return guarded(c, [&](Connection::Impl& impl) {
    // For a curve whose expiry moment has passed the state can only be rejected, retired,
    // awaiting-review or stale (product.md §5.2), decided by reviews and retirements up to t.
    auto& s = impl.statement(
        "SELECT "
        "  sum(CASE WHEN rejected THEN 1 ELSE 0 END), "
        "  sum(CASE WHEN NOT rejected AND retired THEN 1 ELSE 0 END), "
        "  sum(CASE WHEN NOT rejected AND NOT retired AND needs_review AND NOT reviewed THEN 1 "
        "ELSE 0 END), "
        "  sum(CASE WHEN NOT rejected AND NOT retired AND NOT (needs_review AND NOT reviewed) THEN "
        "1 ELSE 0 END) "
        "FROM (SELECT "
        "  (c.verdict = 'rejected' OR EXISTS (SELECT 1 FROM curve_reviews r WHERE r.curve_id = "
        "c.id "
        "     AND r.decision = 'reject' AND r.occurred_at <= :t)) AS rejected, "
        "  EXISTS (SELECT 1 FROM curve_retirements x WHERE x.curve_id = c.id AND x.occurred_at <= "
        ":t) AS retired, "
        "  (json_extract(v.definition, '$.calibration.review_required') = 1) AS needs_review, "
        "  EXISTS (SELECT 1 FROM curve_reviews r WHERE r.curve_id = c.id AND r.occurred_at <= :t) "
        "AS reviewed "
        "  FROM curves c JOIN calibrations k ON k.id = c.calibration_id "
        "  JOIN method_versions v ON v.id = k.method_version_id "
        "  WHERE c.instrument_id = :instrument AND c.expires_at <= :t)");
    bind_int(s, ":instrument", instrument.value);
    bind_instant(s, ":t", t);
    SettledCounts out;
    if (s.executeStep()) {
      out.rejected = static_cast<long>(s.getColumn(0).getInt64());
      out.retired = static_cast<long>(s.getColumn(1).getInt64());
      out.awaiting_review = static_cast<long>(s.getColumn(2).getInt64());
      out.stale = static_cast<long>(s.getColumn(3).getInt64());
    }
    return out;
  });
}

}  // namespace cw::store
