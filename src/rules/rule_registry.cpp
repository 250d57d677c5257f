// SPDX-License-Identifier: Apache-2.0
// The table of stale rules and the evaluation of a curve's state.
#include <algorithm>

#include "core/text.h"
#include "rules/rule.h"

namespace cw::rules {

const MethodVersion& CurveFacts::version() const {
  for (const auto& v : method->versions) {
    if (v.id == curve->method_version_id) return v;
  }
  throw std::logic_error("curve's method version is not among its method's versions");
}

const std::vector<RuleEntry>& stale_rules() {
  static const std::vector<RuleEntry> rules = {
      {Reason::Expired, expired_rule, "acquired + the method's valid_for has passed"},
      {Reason::MethodRevised, method_revised_rule, "a newer version of the method is in force"},
      {Reason::CheckFailed, check_failed_rule, "a check standard or blank failed"},
      {Reason::CheckOverdue, check_overdue_rule,
       "no passing check within the method's check_every"},
      {Reason::LotExpired, lot_expired_rule, "a lot used by the calibration has expired"},
      {Reason::LotWithdrawn, lot_withdrawn_rule, "a lot used by the calibration was withdrawn"},
      {Reason::InstrumentServiced, instrument_serviced_rule,
       "the instrument was taken out of service after the curve was acquired"},
      {Reason::TrendViolation, trend_violation_rule,
       "a Westgard rule named by the method's trend_rules was violated at a check on the curve"},
  };
  return rules;
}

namespace {

const CurveReview* decisive_review(const Curve& c, Instant at) {
  // The first review at or before `at` decides; later reviews of a decided curve are refused
  // when they are recorded, so there is at most one.
  for (const auto& r : c.reviews) {
    if (r.occurred_at <= at) return &r;
  }
  return nullptr;
}

const CurveRetirement* retirement(const Curve& c, Instant at) {
  for (const auto& r : c.retirements) {
    if (r.occurred_at <= at) return &r;
  }
  return nullptr;
}

bool is_newer(const Curve& a, const Curve& than) {
  return a.acquired_at > than.acquired_at || (a.acquired_at == than.acquired_at && a.id > than.id);
}

std::string list_criteria(const Curve& c) {
  std::string out;
  for (const auto& f : c.acceptance.failures) out += (out.empty() ? "" : "; ") + f.detail;
  if (out.empty()) {
    for (const auto& t : c.failed_criteria) {
      out += (out.empty() ? "" : ", ") + std::string(fitting::to_string(t));
    }
  }
  return out;
}

}  // namespace

std::optional<Instant> usable_from(const CurveFacts& f, Instant at) {
  const Curve& c = *f.curve;
  if (at < c.acquired_at || c.verdict == Verdict::Rejected || retirement(c, at))
    return std::nullopt;
  const CurveReview* review = decisive_review(c, at);
  if (review && review->decision == ReviewDecision::Reject) return std::nullopt;
  if (!f.version().definition.calibration.review_required) return c.acquired_at;
  if (!review) return std::nullopt;
  return std::max(c.acquired_at, review->occurred_at);
}

CurveStatus evaluate(const CurveFacts& f, Instant at, const LabZone& zone,
                     const std::vector<const CurveFacts*>& newer_in_group) {
  const Curve& c = *f.curve;
  CurveStatus status;
  if (at < c.acquired_at) {
    status.state = CurveState::Rejected;
    status.cause = Finding{Reason::NotYetAcquired, c.acquired_at,
                           "curve " + std::to_string(c.id.value) + " was acquired only at " +
                               zone.format_local(c.acquired_at)};
    return status;
  }
  const RuleInput input{f, at, zone};
  for (const auto& rule : stale_rules()) {
    if (auto finding = rule.evaluate(input)) status.reasons.push_back(std::move(*finding));
  }
  for (const CurveFacts* other : newer_in_group) {
    const Curve& o = *other->curve;
    if (o.id == c.id || !is_newer(o, c) || o.acquired_at > at) continue;
    if (evaluate(*other, at, zone).state != CurveState::Active) continue;
    const Instant since = usable_from(*other, at).value_or(o.acquired_at);
    status.reasons.push_back({Reason::Superseded, since,
                              "curve " + std::to_string(o.id.value) + " acquired " +
                                  zone.format_local(o.acquired_at) +
                                  " is active for the same method, "
                                  "instrument and analyte since " +
                                  zone.format_local(since)});
    break;
  }
  std::sort(status.reasons.begin(), status.reasons.end(),
            [](const Finding& a, const Finding& b) { return a.since < b.since; });

  if (c.verdict == Verdict::Rejected) {
    status.state = CurveState::Rejected;
    status.cause =
        Finding{Reason::CurveRejected, c.acquired_at, "failed acceptance: " + list_criteria(c)};
    status.reasons.clear();
    return status;
  }
  const CurveReview* review = decisive_review(c, at);
  if (review && review->decision == ReviewDecision::Reject) {
    status.state = CurveState::Rejected;
    status.cause = Finding{Reason::CurveRejected, review->occurred_at,
                           "rejected by " + review->reviewer + " on " +
                               zone.format_local(review->occurred_at) + ": " + review->reason};
    status.reasons.clear();
    return status;
  }
  if (const CurveRetirement* r = retirement(c, at)) {
    status.state = CurveState::Retired;
    status.cause = Finding{Reason::CurveRetired, r->occurred_at,
                           "retired by " + r->retired_by + " on " +
                               zone.format_local(r->occurred_at) + ": " + r->reason};
    return status;
  }
  if (f.version().definition.calibration.review_required && !review) {
    status.state = CurveState::AwaitingReview;
    status.cause = Finding{Reason::AwaitingReview, c.acquired_at,
                           "accepted, waiting for second-person review (method " + f.method->code +
                               " version " + std::to_string(f.version().version) + " requires it)"};
    return status;
  }
  status.state = status.reasons.empty() ? CurveState::Active : CurveState::Stale;
  return status;
}

}  // namespace cw::rules
