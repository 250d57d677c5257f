// SPDX-License-Identifier: Apache-2.0
// Curve use cases.
#include "app/curves.h"

#include <algorithm>
#include <cmath>

#include "app/refusal.h"
#include "app/registry.h"
#include "app/signatures.h"
#include "app/users.h"
#include "core/error.h"
#include "core/text.h"
#include "domain/expiry.h"
#include "fitting/acceptance.h"
#include "import/input_file.h"
#include "import/points_file.h"

namespace cw::app {
namespace {

/// What a calibration is made against, loaded and checked at the acquisition time.
struct CalibrationBasis {
  Method method;
  MethodVersionId version_id;
  Instrument instrument;
  std::vector<Lot> lots;
  std::optional<import::HeaderMapping> mapping;  ///< --columns, or the instrument's saved one

  const MethodVersion& version() const { return *method.version_number(version_number); }
  int version_number = 0;
};

CalibrationBasis load_basis(store::ReadUnit& unit, const CurveLogRequest& r, Instant at,
                            const LabZone& zone) {
  CalibrationBasis b;
  b.method = get_method(unit, r.method);
  const MethodVersion* version = b.method.version_at(at);
  if (!version) {
    throw ValidationError(
        "method " + quote(b.method.code) + " has no version in force at " + zone.format_local(at),
        "version 1 took effect " + zone.format_local(b.method.versions.front().effective_at));
  }
  b.version_id = version->id;
  b.version_number = version->version;
  b.instrument = get_instrument(unit, r.instrument);
  if (at < b.instrument.registered_at) {
    throw ValidationError("instrument " + quote(b.instrument.code) + " was registered only at " +
                          zone.format_local(b.instrument.registered_at));
  }
  if (const ServiceEvent* out = b.instrument.out_of_service_event_at(at)) {
    throw ValidationError(
        "instrument " + quote(b.instrument.code) + " is out of service since " +
            zone.format_local(out->occurred_at) + " (" + out->reason + ")",
        "return it with 'instrument service " + b.instrument.code + " --back --reason ...' first");
  }
  if (r.columns) {
    b.mapping = import::HeaderMapping{*r.columns, "--columns"};
  } else if (const SavedColumns* saved = b.instrument.columns_at(at)) {
    b.mapping = import::HeaderMapping{saved->columns,
                                      "the saved columns of instrument " + b.instrument.code};
  }
  for (const auto& code : r.lots) {
    Lot lot = get_lot(unit, code);
    if (lot.is_withdrawn_at(at)) {
      throw ValidationError("lot " + quote(code) + " was withdrawn " +
                                zone.format_local(lot.withdrawal->occurred_at) + " (" +
                                lot.withdrawal->reason + ")",
                            "calibrate with another lot");
    }
    if (lot.is_expired_at(at, zone)) {
      throw ValidationError("lot " + quote(code) + " expired at the end of " +
                                format_date(lot.effective_expires_on()),
                            "calibrate with a lot that is still usable");
    }
    if (at < lot.registered_at) {
      throw ValidationError("lot " + quote(code) + " was registered only at " +
                            zone.format_local(lot.registered_at));
    }
    b.lots.push_back(std::move(lot));
  }
  return b;
}

/// Refuses a fit whose figures cannot be stored or read: a zero slope or a value that is not
/// finite (e.g. responses that do not change with concentration).
void require_storable(const Curve& c, const std::string& file) {
  const SourceLocation where{file, std::nullopt, std::nullopt, "response"};
  const auto& f = c.fit;
  if (f.slope == 0 && f.quadratic == 0) {
    throw ValidationError(where,
                          "analyte " + quote(c.analyte) +
                              ": the responses do not change with concentration (slope 0), so "
                              "no calibration can be read from them",
                          "check the response column of the points file");
  }
  std::vector<double> values = {
      f.intercept, f.slope,           f.quadratic, f.se_intercept, f.se_slope,   f.se_quadratic,
      f.r2,        f.residual_sd,     f.sse,       f.range_low,    f.range_high, f.lod,
      f.loq,       f.rf_mean,         f.rf_sd,     f.rf_rsd_pct,   f.xbar_w,     f.ybar_w,
      f.sxx_w,     f.sum_raw_weights, f.sum_x2_w};
  for (const auto& row : f.covariance) values.insert(values.end(), row.begin(), row.end());
  if (f.mandel) {
    values.insert(values.end(), {f.mandel->s_y1, f.mandel->s_y2, f.mandel->ds2,
                                 f.mandel->test_value, f.mandel->f_critical_99});
  }
  for (const auto& p : c.points) {
    if (p.back_calculated) values.push_back(*p.back_calculated);
    if (p.error_pct) values.push_back(*p.error_pct);
  }
  for (const auto& finding : c.acceptance.failures) {
    if (!std::isnan(finding.value)) values.push_back(finding.value);
  }
  for (double v : values) {
    if (!std::isfinite(v)) {
      throw ValidationError(where,
                            "analyte " + quote(c.analyte) +
                                ": the fit of these points gives a value that is not a finite "
                                "number (the concentrations or responses are too large, too "
                                "small or too nearly equal)",
                            "check the nominal and response columns of the points file");
    }
  }
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
  const auto fitted_y = [](const fitting::Observation& o) {
    return o.excluded ? std::nullopt : std::optional<double>(o.y);
  };
  std::optional<double> first_y;
  bool varies = false;
  for (const auto& o : observations) {
    const auto y = fitted_y(o);
    if (!y) continue;
    if (first_y && *y != *first_y) varies = true;
    if (!first_y) first_y = y;
  }
  if (first_y && !varies) {
    throw ValidationError(SourceLocation{points.file_name, std::nullopt, std::nullopt, "response"},
                          "analyte " + quote(analyte) +
                              ": the responses do not change with concentration (every fitted "
                              "response is " +
                              format_shortest(*first_y) +
                              "), so no calibration can be read from them",
                          "check the response column of the points file");
  }
  try {
    c.fit = fitting::fit(rules.model, rules.weighting, observations);
  } catch (const fitting::FitError& e) {
    throw ValidationError(SourceLocation{points.file_name, std::nullopt, std::nullopt, "response"},
                          "cannot fit analyte " + quote(analyte) + ": " + e.what(), e.hint());
  }
  c.acceptance = fitting::evaluate_acceptance(c.fit, levels, rules.acceptance_criteria());
  c.verdict = c.acceptance.accepted ? Verdict::Accepted : Verdict::Rejected;
  for (const auto& f : c.acceptance.failures) {
    if (std::find(c.failed_criteria.begin(), c.failed_criteria.end(), f.criterion) ==
        c.failed_criteria.end()) {
      c.failed_criteria.push_back(f.criterion);
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
  require_storable(c, points.file_name);
  return c;
}

/// The points file parsed for one method version, and its curves fitted and judged.
struct FittedCalibration {
  import::PointsFile points;
  std::vector<Curve> curves;
};

FittedCalibration fit_calibration(const std::string& file, const std::string& text,
                                  const MethodVersion& version,
                                  const std::optional<import::HeaderMapping>& mapping) {
  FittedCalibration out;
  out.points =
      import::parse_points_text(file, text, version.definition, mapping ? &*mapping : nullptr);
  for (const auto& analyte : out.points.analytes) {
    out.curves.push_back(build_curve(out.points, analyte, version));
  }
  return out;
}

std::string failed_list(const Curve& c) {
  std::string out;
  for (const auto& t : c.failed_criteria) {
    out += (out.empty() ? "" : ", ") + std::string(fitting::to_string(t));
  }
  return out;
}

}  // namespace

FittedPoints fit_points_text(const std::string& file, const std::string& text,
                             const MethodVersion& version) {
  FittedCalibration fitted = fit_calibration(file, text, version, std::nullopt);
  return {fitted.points.file_name, fitted.points.sha256, std::move(fitted.curves)};
}

void require_acquired(Instant at, const Curve& c, const LabZone& zone) {
  if (at < c.acquired_at) {
    throw ValidationError("--at " + zone.format_local(at) + " is before curve " +
                          std::to_string(c.id.value) + " was acquired (" +
                          zone.format_local(c.acquired_at) + ")");
  }
}

CurveLogOutcome log_calibration(Session& s, const CurveLogRequest& r) {
  const Instant at = s.at();
  // 1. Outside the write lock: what the file is checked against, the file, the fit.
  const std::string text =
      import::read_text_file(r.points, import::kMaxPointsFileBytes, "--points");
  CalibrationBasis basis;
  {
    auto unit = s.read();
    basis = load_basis(*unit, r, at, s.zone());
  }
  FittedCalibration fitted =
      fit_calibration(import::recorded_name(r.points), text, basis.version(), basis.mapping);

  // 2. One transaction: the same checks on the current facts, then the facts and entries.
  auto unit = s.write();
  authorize(s, *unit, Permission::Log, "curve.log", "method", r.method);
  const CalibrationBasis now = load_basis(*unit, r, at, s.zone());
  if (now.version_id != basis.version_id || now.mapping != basis.mapping) {
    // The method was revised (or the instrument's columns saved) in between: read and judge
    // against what is in force now.
    fitted = fit_calibration(import::recorded_name(r.points), text, now.version(), now.mapping);
  }
  const MethodVersion& version = now.version();

  CurveLogOutcome outcome;
  if (!fitted.points.ignored_columns.empty()) {
    std::string list;
    for (const auto& c : fitted.points.ignored_columns)
      list += (list.empty() ? "" : ", ") + quote(c);
    outcome.warnings.push_back("columns not used (" + now.mapping->source +
                               " is in force): " + list);
  }
  // Every curve traces to a certified value of its analyte (calibration-practice.md §6.5), whose
  // uncertainty enters every result's budget: a curve no lot certifies is not logged.
  for (const auto& analyte : fitted.points.analytes) {
    const bool certified = std::any_of(now.lots.begin(), now.lots.end(),
                                       [&](const Lot& l) { return l.value_for(analyte); });
    if (!certified) {
      std::string given;
      for (const auto& l : now.lots) given += (given.empty() ? "" : ", ") + l.code;
      throw option_error(
          "--lot",
          "no lot given (" + given + ") certifies a value for analyte " + quote(analyte) +
              ": its curve would not trace to a reference "
              "material; nothing was logged",
          "name every lot the calibrators were made from, e.g. --lot A,B ('curvewarden "
          "lot list' shows what each certifies)");
    }
  }
  for (const auto& analyte : version.definition.analytes) {
    if (std::find(fitted.points.analytes.begin(), fitted.points.analytes.end(), analyte) ==
        fitted.points.analytes.end()) {
      outcome.warnings.push_back("the points file has no calibrators for analyte '" + analyte +
                                 "'");
    }
  }
  std::vector<const Lot*> lots;
  for (const auto& lot : now.lots) lots.push_back(&lot);
  const Instant expires = expiry_of(at, version, lots, s.zone()).at;

  Calibration calibration;
  calibration.method_version_id = version.id;
  calibration.instrument_id = now.instrument.id;
  calibration.acquired_at = at;
  calibration.analyst = s.actor().name;
  calibration.note = r.note;
  calibration.points_file = fitted.points.file_name;
  calibration.points_sha256 = fitted.points.sha256;
  for (const auto& lot : now.lots) calibration.lots.push_back(lot.id);
  const CalibrationId calibration_id = unit->curve_writer().add_calibration(calibration);
  unit->append_entry(
      {"calibration.log", "calibration", std::to_string(calibration_id.value), r.note, at});
  std::vector<CurveId> ids;
  for (auto& c : fitted.curves) {
    c.calibration_id = calibration_id;
    c.method_id = now.method.id;
    c.method_version_id = version.id;
    c.instrument_id = now.instrument.id;
    c.acquired_at = at;
    c.analyst = s.actor().name;
    c.expires_at = expires;
    const CurveId id = unit->curve_writer().add_curve(c);
    ids.push_back(id);
    std::string summary = c.analyte + ": " + std::string(to_string(c.verdict));
    for (const auto& t : c.failed_criteria) summary += " " + std::string(fitting::to_string(t));
    unit->append_entry({"curve.log", "curve", std::to_string(id.value), summary, at});
    outcome.any_rejected = outcome.any_rejected || c.verdict == Verdict::Rejected;
  }
  FactSet facts(*unit, s.zone());
  outcome.curves = make_views(facts, ids, at, /*with_points=*/true);
  unit->commit();
  outcome.calibration_id = calibration_id;
  return outcome;
}

CurveView show_curve(Session& s, CurveId id) {
  auto unit = s.read();
  FactSet facts(*unit, s.zone());
  require_acquired(s.at(), facts.curve(id, store::CurveDetail::Points), s.zone());
  return make_views(facts, {id}, s.at(), true).front();
}

CurveView change_curve(Session& s, CurveId id, CurveAction action, const std::string& reason) {
  const Instant at = s.at();
  const std::string entity = std::to_string(id.value);
  const std::string attempted = action == CurveAction::Retire ? "curve.retire" : "curve.review";
  const std::string meaning = action == CurveAction::Approve  ? "approved"
                              : action == CurveAction::Reject ? "rejected"
                                                              : "retired";
  std::string passphrase = ask_signature(s, meaning);
  auto unit = s.write();
  const User user =
      authorize(s, *unit, action == CurveAction::Retire ? Permission::Retire : Permission::Review,
                attempted, "curve", entity);
  {
    FactSet facts(*unit, s.zone());
    const Curve& c = facts.curve(id);
    require_acquired(at, c, s.zone());
    const CurveStatus status = facts.status(id, at);
    const bool self = canonical_user_code(c.analyst) == canonical_user_code(s.actor().name);
    if (const auto refusal = transition_refusal(action, status.state, c.verdict, self)) {
      std::string message;
      switch (*refusal) {
        case Reason::SelfReview:
          message = "curve " + entity + " was logged by " + c.analyst +
                    "; a second person must review it (the reviewer cannot be the analyst)";
          break;
        case Reason::CurveRejected:
          message = "curve " + entity + " was rejected by acceptance (" + failed_list(c) +
                    "); it cannot be reviewed. Log a new calibration";
          break;
        case Reason::NotRetirable:
          message = "curve " + entity + " is already " + std::string(to_string(status.state)) +
                    (status.cause ? ": " + status.cause->message : "");
          break;
        default: {
          message = "curve " + entity + " is " + std::string(to_string(status.state)) +
                    ", not awaiting review";
          if (status.cause) message += ": " + status.cause->message;
          if (status.state == CurveState::Active || status.state == CurveState::Stale) {
            if (!c.reviews.empty()) {
              message += " (approved by " + c.reviews.front().reviewer + " on " +
                         s.zone().format_local(c.reviews.front().occurred_at) + ")";
            } else {
              message += " (its method version does not require review)";
            }
          }
        }
      }
      refuse(*unit, attempted, "curve", entity, {*refusal}, message, at);
    }
  }
  sign(s, *unit, user, passphrase, {attempted, meaning, "curve", entity});
  if (action == CurveAction::Retire) {
    unit->curve_writer().add_retirement(id, {s.actor().name, reason, at});
    unit->append_entry({"curve.retire", "curve", entity, reason, at});
  } else {
    const ReviewDecision decision =
        action == CurveAction::Approve ? ReviewDecision::Approve : ReviewDecision::Reject;
    unit->curve_writer().add_review(id, {decision, s.actor().name, reason, at});
    unit->append_entry({action == CurveAction::Approve ? "curve.approve" : "curve.reject", "curve",
                        entity, reason, at});
  }
  FactSet after(*unit, s.zone());
  CurveView view = make_views(after, {id}, at).front();
  unit->commit();
  return view;
}

}  // namespace cw::app
