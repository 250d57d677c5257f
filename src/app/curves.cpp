// SPDX-License-Identifier: Apache-2.0
// Curve use cases.
#include "app/curves.h"

#include <algorithm>
#include <set>

#include "app/registry.h"
#include "core/error.h"
#include "core/text.h"
#include "fitting/acceptance.h"
#include "import/points_file.h"
#include "store/curve_repository.h"
#include "store/registry_repository.h"

namespace cw::app {
namespace {

std::vector<std::string> split_codes(const std::vector<std::string>& options) {
  std::vector<std::string> out;
  for (const auto& o : options) {
    for (auto& part : split(o, ',')) {
      std::string code = trim(part);
      if (code.empty())
        throw UsageError("--lot has an empty code",
                         "give lot codes separated by commas, e.g. --lot A,B");
      if (std::find(out.begin(), out.end(), code) == out.end()) out.push_back(code);
    }
  }
  return out;
}

/// Fits and judges one analyte's points.
Curve build_curve(const import::PointsFile& points, const std::string& analyte,
                  const MethodVersion& version) {
  const auto& rules = version.definition.calibration;
  std::vector<fitting::Observation> observations;
  std::vector<std::string> levels;
  std::vector<const import::PointRow*> rows;
  for (const auto& row : points.rows) {
    if (row.analyte != analyte) continue;
    observations.push_back({row.nominal, row.y, row.exclude_reason.has_value()});
    levels.push_back(row.level);
    rows.push_back(&row);
  }
  Curve c;
  c.analyte = analyte;
  try {
    c.fit = fitting::fit(rules.model, rules.weighting, observations);
  } catch (const fitting::FitError& e) {
    throw ValidationError(SourceLocation{points.file_name, std::nullopt, std::nullopt, "response"},
                          "cannot fit analyte " + quote(analyte) + ": " + e.what(), e.hint());
  }
  c.acceptance = fitting::evaluate_acceptance(c.fit, levels, rules.acceptance_criteria());
  c.verdict = c.acceptance.accepted ? Verdict::Accepted : Verdict::Rejected;
  for (const auto& f : c.acceptance.failures) {
    const std::string token(fitting::to_string(f.criterion));
    if (std::find(c.failed_criteria.begin(), c.failed_criteria.end(), token) ==
        c.failed_criteria.end()) {
      c.failed_criteria.push_back(token);
    }
  }
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const auto& pf = c.fit.points[i];
    CalibrationPoint p;
    p.source_line = rows[i]->line;
    p.level = rows[i]->level;
    p.replicate = rows[i]->replicate;
    p.nominal = rows[i]->nominal;
    p.response = rows[i]->response;
    p.is_response = rows[i]->is_response;
    p.y = rows[i]->y;
    p.back_calculated = pf.back_calculated;
    p.error_pct = pf.error_pct;
    p.within_limits = c.acceptance.points[i].within_limits;
    p.excluded = rows[i]->exclude_reason.has_value();
    p.exclude_reason = rows[i]->exclude_reason;
    c.points.push_back(std::move(p));
  }
  c.fit.points.clear();  // the per-point table lives in curve_points
  return c;
}

}  // namespace

void require_acquired(const Session& s, const Curve& c) {
  if (s.at() < c.acquired_at) {
    throw ValidationError("--at " + s.zone().format_local(s.at()) + " is before curve " +
                          std::to_string(c.id.value) + " was acquired (" +
                          s.zone().format_local(c.acquired_at) + ")");
  }
}

CurveId parse_curve_id(const std::string& text) {
  auto v = parse_integer(text);
  if (!v || *v < 1) throw UsageError("curve id " + quote(text) + " is not a positive whole number");
  return CurveId{*v};
}

void refuse(Session& s, const std::string& action, const std::string& entity_kind,
            const std::string& entity_id, const std::vector<std::string>& reasons,
            const std::string& message, const std::string& hint) {
  auto tx = s.write();
  store::insert_refusal(tx, {action, entity_kind, entity_id, reasons, message, s.at()});
  tx.append_entry({action + "-refused", entity_kind, entity_id, message, s.at()});
  tx.commit();
  throw RefusedError(message, hint);
}

CurveView make_view(FactLoader& facts, CurveId id, Instant at) {
  CurveView v;
  const Curve& c = facts.curve(id);
  v.curve = c;
  v.method_code = facts.method(c.method_id).code;
  v.version = facts.version_of(id);
  v.instrument_code = facts.instrument(c.instrument_id).code;
  for (const Lot* lot : facts.lots_of(id)) v.lots.push_back(*lot);
  v.status = facts.status(id, at);
  v.as_of = at;
  return v;
}

CurveLogOutcome log_calibration(Session& s, const CurveLogRequest& r) {
  const Instant at = s.at();
  const std::vector<std::string> lot_codes = split_codes(r.lots);
  if (lot_codes.empty())
    throw UsageError("give at least one --lot CODE",
                     "the reference-material lot(s) the calibrators were made from");
  std::optional<std::string> note;
  if (r.note) note = checked_reason(*r.note, "--note");

  auto tx = s.write();
  const Method method = get_method(s, r.method);
  const MethodVersion* version = method.version_at(at);
  if (!version) {
    throw ValidationError(
        "method " + quote(method.code) + " has no version in force at " + s.zone().format_local(at),
        "version 1 took effect " + s.zone().format_local(method.versions.front().effective_at));
  }
  const import::PointsFile points = import::read_points_file(r.points, version->definition);
  const Instrument instrument = get_instrument(s, r.instrument);
  if (at < instrument.registered_at) {
    throw ValidationError("instrument " + quote(instrument.code) + " was registered only at " +
                          s.zone().format_local(instrument.registered_at));
  }
  if (const ServiceEvent* out = instrument.out_of_service_event_at(at)) {
    throw ValidationError(
        "instrument " + quote(instrument.code) + " is out of service since " +
            s.zone().format_local(out->occurred_at) + " (" + out->reason + ")",
        "return it with 'instrument service " + instrument.code + " --back --reason ...' first");
  }
  std::vector<Lot> lots;
  CurveLogOutcome outcome;
  for (const auto& code : lot_codes) {
    Lot lot = get_lot(s, code);
    if (lot.is_withdrawn_at(at)) {
      throw ValidationError("lot " + quote(code) + " was withdrawn " +
                                s.zone().format_local(lot.withdrawal->occurred_at) + " (" +
                                lot.withdrawal->reason + ")",
                            "calibrate with another lot");
    }
    if (lot.is_expired_at(at, s.zone())) {
      throw ValidationError("lot " + quote(code) + " expired at the end of " +
                                format_date(lot.effective_expires_on()),
                            "calibrate with a lot that is still usable");
    }
    if (at < lot.registered_at) {
      throw ValidationError("lot " + quote(code) + " was registered only at " +
                            s.zone().format_local(lot.registered_at));
    }
    lots.push_back(std::move(lot));
  }
  for (const auto& analyte : points.analytes) {
    const bool certified =
        std::any_of(lots.begin(), lots.end(), [&](const Lot& l) { return l.value_for(analyte); });
    if (!certified)
      outcome.warnings.push_back("no lot given certifies a value for analyte '" + analyte + "'");
  }
  for (const auto& analyte : version->definition.analytes) {
    if (std::find(points.analytes.begin(), points.analytes.end(), analyte) ==
        points.analytes.end()) {
      outcome.warnings.push_back("the points file has no calibrators for analyte '" + analyte +
                                 "'");
    }
  }

  Instant expires = add_duration(at, version->definition.calibration.valid_for, s.zone());
  for (const auto& lot : lots) expires = std::min(expires, lot.expiry_instant(s.zone()));

  std::vector<Curve> curves;
  for (const auto& analyte : points.analytes)
    curves.push_back(build_curve(points, analyte, *version));

  Calibration calibration;
  calibration.method_version_id = version->id;
  calibration.instrument_id = instrument.id;
  calibration.acquired_at = at;
  calibration.analyst = s.actor().name;
  calibration.note = note;
  calibration.points_file = points.file_name;
  calibration.points_sha256 = points.sha256;
  for (const auto& lot : lots) calibration.lots.push_back(lot.id);
  const CalibrationId calibration_id = store::insert_calibration(tx, calibration);
  tx.append_entry(
      {"calibration.log", "calibration", std::to_string(calibration_id.value), note, at});
  std::vector<CurveId> ids;
  for (auto& c : curves) {
    c.calibration_id = calibration_id;
    c.method_id = method.id;
    c.method_version_id = version->id;
    c.instrument_id = instrument.id;
    c.acquired_at = at;
    c.analyst = s.actor().name;
    c.expires_at = expires;
    const CurveId id = store::insert_curve(tx, c);
    ids.push_back(id);
    std::string summary = c.analyte + ": " + std::string(to_string(c.verdict));
    for (const auto& t : c.failed_criteria) summary += " " + t;
    tx.append_entry({"curve.log", "curve", std::to_string(id.value), summary, at});
    outcome.any_rejected = outcome.any_rejected || c.verdict == Verdict::Rejected;
  }
  tx.commit();

  outcome.calibration_id = calibration_id;
  FactLoader facts(s);
  for (CurveId id : ids) outcome.curves.push_back(make_view(facts, id, at));
  return outcome;
}

std::vector<CurveView> list_curves(Session& s, const CurveListRequest& r) {
  std::optional<CurveState> state;
  if (r.state) {
    state = parse_curve_state(*r.state);
    if (!state) {
      throw UsageError("unknown state " + quote(*r.state),
                       "states are rejected, awaiting-review, active, stale, retired");
    }
  }
  store::ReadTransaction read(s.db());
  store::CurveFilter filter;
  if (r.method) filter.method = get_method(s, *r.method).id;
  if (r.instrument) filter.instrument = get_instrument(s, *r.instrument).id;
  filter.analyte = r.analyte;
  filter.acquired_by = s.at();
  FactLoader facts(s);
  std::vector<CurveView> out;
  for (CurveId id : store::list_curve_ids(s.db(), filter)) {
    CurveView v = make_view(facts, id, s.at());
    if (state && v.status.state != *state) continue;
    out.push_back(std::move(v));
  }
  return out;
}

CurveView show_curve(Session& s, CurveId id) {
  store::ReadTransaction read(s.db());
  FactLoader facts(s);
  require_acquired(s, facts.curve(id));
  return make_view(facts, id, s.at());
}

CurveView review_curve(Session& s, CurveId id, ReviewDecision decision,
                       const std::string& reason_text) {
  const std::string reason = checked_reason(reason_text);
  const std::string action = decision == ReviewDecision::Approve ? "curve.approve" : "curve.reject";
  const std::string entity = std::to_string(id.value);
  std::optional<std::pair<std::vector<std::string>, std::string>> refusal;
  {
    store::ReadTransaction read(s.db());
    FactLoader facts(s);
    const Curve& c = facts.curve(id);
    require_acquired(s, c);
    const CurveStatus status = facts.status(id, s.at());
    if (c.analyst == s.actor().name) {
      refusal = {{"self-review"},
                 "curve " + entity + " was logged by " + c.analyst +
                     "; a second person must review it (the reviewer cannot be the analyst)"};
    } else if (c.verdict == Verdict::Rejected) {
      std::string criteria;
      for (const auto& t : c.failed_criteria) criteria += (criteria.empty() ? "" : ", ") + t;
      refusal = {{"rejected"},
                 "curve " + entity + " was rejected by acceptance (" + criteria +
                     "); it cannot be reviewed. Log a new calibration"};
    } else if (status.state != CurveState::AwaitingReview) {
      std::string why = "curve " + entity + " is " + std::string(to_string(status.state)) +
                        ", not awaiting review";
      if (status.cause) why += ": " + status.cause->message;
      if (status.state == CurveState::Active || status.state == CurveState::Stale) {
        if (!c.reviews.empty()) {
          why += " (approved by " + c.reviews.front().reviewer + " on " +
                 s.zone().format_local(c.reviews.front().occurred_at) + ")";
        } else {
          why += " (its method version does not require review)";
        }
      }
      refusal = {{"not-awaiting-review"}, why};
    }
  }
  if (refusal) refuse(s, "curve.review", "curve", entity, refusal->first, refusal->second);

  auto tx = s.write();
  store::insert_review(tx, id, {decision, s.actor().name, reason, s.at()});
  tx.append_entry({action, "curve", entity, reason, s.at()});
  tx.commit();
  FactLoader facts(s);
  return make_view(facts, id, s.at());
}

CurveView retire_curve(Session& s, CurveId id, const std::string& reason_text) {
  const std::string reason = checked_reason(reason_text);
  const std::string entity = std::to_string(id.value);
  std::optional<std::string> refusal;
  {
    store::ReadTransaction read(s.db());
    FactLoader facts(s);
    const Curve& c = facts.curve(id);
    require_acquired(s, c);
    const CurveStatus status = facts.status(id, s.at());
    if (status.state == CurveState::Retired || status.state == CurveState::Rejected) {
      refusal = "curve " + entity + " is already " + std::string(to_string(status.state)) +
                (status.cause ? ": " + status.cause->message : "");
    }
  }
  if (refusal) refuse(s, "curve.retire", "curve", entity, {"not-retirable"}, *refusal);
  auto tx = s.write();
  store::insert_retirement(tx, id, {s.actor().name, reason, s.at()});
  tx.append_entry({"curve.retire", "curve", entity, reason, s.at()});
  tx.commit();
  FactLoader facts(s);
  return make_view(facts, id, s.at());
}

}  // namespace cw::app
