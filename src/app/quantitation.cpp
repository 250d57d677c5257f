// SPDX-License-Identifier: Apache-2.0
// Checks and quantitation.
#include "app/quantitation.h"

#include "app/curves.h"
#include "app/refusal.h"
#include "app/registry.h"
#include "app/users.h"
#include "core/error.h"
#include "core/text.h"
#include "domain/bracketing.h"

namespace cw::app {

SinceLastPass since_last_pass(const std::vector<Check>& checks, Instant at,
                              std::optional<CheckId> except) {
  SinceLastPass out;
  for (const auto& k : checks) {
    if (!closes_bracket(k) || k.occurred_at > at || (except && k.id == *except)) continue;
    if (!out.at || k.occurred_at >= *out.at) {
      out.at = k.occurred_at;
      out.check = k.id;
    }
  }
  return out;
}

std::optional<Check> next_bracket_check(const std::vector<Check>& checks, Instant at) {
  std::optional<Check> out;
  for (const auto& k : checks) {
    if (k.occurred_at <= at || (k.passed && !closes_bracket(k))) continue;
    if (!out || k.occurred_at < out->occurred_at ||
        (k.occurred_at == out->occurred_at && k.id < out->id)) {
      out = k;
    }
  }
  return out;
}

void record_rerun(store::WriteUnit& unit, const RerunDecision& decision, std::optional<RunId> run,
                  Instant at) {
  ResultStatusEvent e;
  e.result_id = decision.result;
  e.status = ResultStatus::RerunRequired;
  e.reason = decision.reason;
  e.detail = decision.detail;
  e.check_id = decision.check;
  e.run_id = run;
  e.occurred_at = at;
  unit.run_writer().add_status_event(e);
  unit.append_entry({"result.rerun-required", "result", std::to_string(decision.result.value),
                     std::string(to_string(decision.reason)) + ": " + decision.detail, at});
}

CheckOutcome log_check(Session& s, const CheckRequest& r) {
  const Instant at = s.at();
  const std::string entity = std::to_string(r.curve.value);
  auto unit = s.write();
  authorize(s, *unit, Permission::Log, "check.log", "curve", entity);
  CheckOutcome out;
  {
    FactSet facts(*unit, s.zone());
    // With its points: a check's range starts at the curve's lowest calibrator.
    const Curve& c = facts.curve(r.curve, store::CurveDetail::Points);
    const MethodDefinition& d = facts.version_of(r.curve).definition;
    out.unit = d.unit;
    require_acquired(at, c, s.zone());
    out.check = judge_check(r.reading, c, d);  // bad input throws before anything is written
    const CurveStatus status = facts.status(r.curve, at);
    if (status.state == CurveState::Rejected || status.state == CurveState::Retired) {
      refuse(*unit, "check.log", "curve", entity,
             {status.state == CurveState::Rejected ? Reason::CurveRejected : Reason::CurveRetired},
             "curve " + entity + " is " + std::string(to_string(status.state)) + " (" +
                 (status.cause ? status.cause->message : std::string()) +
                 "); checks are not recorded against it",
             at);
    }
  }
  Check& check = out.check;
  check.curve_id = r.curve;
  check.analyst = s.actor().name;
  check.occurred_at = at;
  check.id = unit->curve_writer().add_check(check);
  unit->append_entry({"check.log", "check", std::to_string(check.id.value),
                      std::string(to_string(check.kind)) + (check.passed ? " passed" : " FAILED") +
                          " on curve " + entity,
                      at});
  FactSet after(*unit, s.zone());
  if (!check.passed) {
    // Results reported since the last passing check standard before this one (or since
    // acquisition) must be re-run: each becomes rerun-required by a status event of its own.
    // A check logged for an earlier time takes the results reported after it too: the curve
    // was stale from its failure on (check-failed does not clear).
    const auto& checks = after.facts(r.curve).checks;
    const SinceLastPass since = since_last_pass(checks, at, check.id);
    out.affected_results =
        unit->curves().reported_between(r.curve, since.at, since.check, last_stored_moment());
    std::vector<ResultId> open;
    for (const auto& result : out.affected_results) {
      if (result.current_status() != ResultStatus::RerunRequired) open.push_back(result.id);
    }
    const MethodDefinition& d = after.version_of(r.curve).definition;
    Bracket bracket(d.check.samples_per_check, static_cast<long>(out.affected_results.size()), open,
                    since.check);
    for (const auto& decision : bracket.on_check(check)) {
      record_rerun(*unit, decision, std::nullopt, at);
    }
  }
  out.curve = make_views(after, {r.curve}, at).front();
  unit->commit();
  return out;
}

namespace {

/// The one active curve of a group at `at`, or the findings that explain why there is none.
std::optional<CurveId> choose_curve(store::ReadUnit& unit, FactSet& facts, const Method& method,
                                    const Instrument& instrument, const std::string& analyte,
                                    Instant at, const LabZone& zone,
                                    std::vector<Finding>& why_none) {
  const CurveGroup group{method.id, instrument.id, analyte};
  const auto active = facts.active_in_groups({group}, at);
  if (auto it = active.find(group); it != active.end()) return it->second.curve;
  std::string message = "no active curve for method " + method.code + ", instrument " +
                        instrument.code + ", analyte " + analyte + " at " + zone.format_local(at);
  // Explain with the latest curve that passed acceptance (the one the analyst expects to use);
  // fall back to the latest curve of any verdict.
  auto latest = unit.curves().latest_in_group(method.id, instrument.id, analyte, at, true);
  if (!latest) latest = unit.curves().latest_in_group(method.id, instrument.id, analyte, at, false);
  if (!latest) {
    why_none.push_back({Reason::NoActiveCurve, std::nullopt, message + "; none has been logged"});
    return std::nullopt;
  }
  const CurveStatus st = facts.status(*latest, at);
  const bool accepted = facts.curve(*latest).verdict == Verdict::Accepted;
  message += "; the latest " + std::string(accepted ? "accepted " : "") + "curve, " +
             std::to_string(latest->value) + ", is " + std::string(to_string(st.state));
  why_none.push_back({Reason::NoActiveCurve, std::nullopt, message});
  for (const auto& f : st.blocking()) why_none.push_back(f);
  return std::nullopt;
}

}  // namespace

QuantifyOutcome quantify(Session& s, const QuantifyRequest& r) {
  const Instant at = s.at();
  QuantifyOutcome out;
  Result result;
  result.sample = r.sample;
  result.response = r.reading.response;
  result.is_response = r.reading.is_response;
  result.replicates = r.reading.replicates;
  result.dilution = r.reading.dilution;
  result.analyst = s.actor().name;
  result.occurred_at = at;

  auto unit = s.write();
  authorize(s, *unit, Permission::Log, "quantify", "sample", result.sample);
  {
    FactSet facts(*unit, s.zone());
    std::optional<CurveId> chosen = r.target.curve;
    std::vector<Finding> why_none;
    if (chosen) {
      const Curve& c = facts.curve(*chosen);
      result.analyte = c.analyte;
      result.method_id = c.method_id;
      result.instrument_id = c.instrument_id;
    } else {
      const Method method = get_method(*unit, r.target.method);
      const Instrument instrument = get_instrument(*unit, r.target.instrument);
      bool known = false;
      for (const auto& v : method.versions) {
        known = known || v.definition.has_analyte(r.target.analyte);
      }
      if (!known) {
        std::string list;
        for (const auto& a : method.latest().definition.analytes) {
          list += (list.empty() ? "" : ", ") + a;
        }
        throw ValidationError(
            "method " + quote(method.code) + " has no analyte " + quote(r.target.analyte),
            "its analytes: " + list);
      }
      result.analyte = r.target.analyte;
      result.method_id = method.id;
      result.instrument_id = instrument.id;
      chosen =
          choose_curve(*unit, facts, method, instrument, r.target.analyte, at, s.zone(), why_none);
    }
    QuantitationDecision decision;
    if (chosen) {
      // With its points: results are released below the curve's lowest calibrator.
      const Curve& c = facts.curve(*chosen, store::CurveDetail::Points);
      require_acquired(at, c, s.zone());
      const MethodVersion& version = facts.version_of(*chosen);
      const CurveStatus status = facts.status(*chosen, at);
      const SinceLastPass since = since_last_pass(facts.facts(*chosen).checks, at);
      ChecksSoFar so_far;
      so_far.last_passing_check = since.check;
      so_far.next_check = next_bracket_check(facts.facts(*chosen).checks, at);
      so_far.reported_since_check = static_cast<long>(
          unit->curves().count_reported_between(*chosen, since.at, since.check, at));
      decision = decide_quantitation(c, status, version.definition, facts.lots_of(*chosen),
                                     r.reading, {}, so_far);
      result.curve_id = *chosen;
      out.unit = version.definition.unit;
      out.method_version = version.version;
      for (const Lot* lot : facts.lots_of(*chosen)) out.lots.push_back(*lot);
      out.curve = make_view(facts, *chosen, status, at);
    } else {
      decision = refuse_without_curve(std::move(why_none));
    }
    record_decision(result, decision);
    out.reporting_limit = decision.reporting_limit;
    out.suggested_dilution = decision.suggested_dilution;
  }
  result.id = unit->curve_writer().add_result(result);
  std::string summary =
      r.sample + " " + result.analyte + ": " + std::string(to_string(result.status));
  for (const auto& f : result.reasons) summary += " " + std::string(to_string(f.reason));
  unit->append_entry({result.status == ResultStatus::Reported ? "result.report" : "result.refuse",
                      "result", std::to_string(result.id.value), summary, at});
  unit->commit();
  out.result = std::move(result);
  return out;
}

}  // namespace cw::app
