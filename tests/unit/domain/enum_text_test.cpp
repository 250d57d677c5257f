// SPDX-License-Identifier: Apache-2.0
// Every enum has exactly one text form: printing then parsing gives the value back, every text
// form is distinct, and text that names no value parses to nothing (never to another value).
#include <catch2/catch.hpp>
#include <set>
#include <string>
#include <vector>

#include "domain/check.h"
#include "domain/curve.h"
#include "domain/curve_state.h"
#include "domain/curve_transitions.h"
#include "domain/instrument.h"
#include "fitting/acceptance.h"
#include "fitting/fit.h"
#include "rules/westgard.h"

namespace {

template <class E, class Parse>
void round_trip(const std::vector<E>& values, Parse parse) {
  std::set<std::string> texts;
  for (E v : values) {
    const std::string text(to_string(v));
    INFO("text: '" << text << "'");
    CHECK_FALSE(text.empty());
    CHECK(texts.insert(text).second);  // no two values share a text
    const auto back = parse(text);
    REQUIRE(back.has_value());
    CHECK(*back == v);
  }
  for (const char* unknown : {"", " ", "ACTIVE", "active ", "unknown", "0", "null"}) {
    if (texts.count(unknown)) continue;
    INFO("unknown: '" << unknown << "'");
    CHECK_FALSE(parse(unknown).has_value());
  }
}

}  // namespace

TEST_CASE("enum text: curve states, reasons, flags and statuses round-trip", "[domain]") {
  using namespace cw;
  round_trip(std::vector<CurveState>(std::begin(kAllCurveStates), std::end(kAllCurveStates)),
             parse_curve_state);
  round_trip(all_reasons(), parse_reason);
  // + trend-violation, check-due, already-imported, not-permitted, wrong-passphrase, user-locked
  CHECK(all_reasons().size() == 25);
  round_trip(all_result_flags(), parse_result_flag);
  round_trip(std::vector<ResultStatus>{ResultStatus::Reported, ResultStatus::Refused},
             parse_result_status);
  round_trip(std::vector<CheckKind>{CheckKind::Check, CheckKind::Blank}, parse_check_kind);
  round_trip(std::vector<Verdict>{Verdict::Accepted, Verdict::Rejected}, parse_verdict);
  round_trip(std::vector<ReviewDecision>{ReviewDecision::Approve, ReviewDecision::Reject},
             parse_review_decision);
  round_trip(std::vector<ServiceDirection>{ServiceDirection::Out, ServiceDirection::Back},
             parse_service_direction);
}

TEST_CASE("enum text: fitting and trending enums round-trip", "[domain]") {
  using namespace cw::fitting;
  round_trip(std::vector<Model>{Model::Linear, Model::LinearThroughOrigin, Model::Quadratic,
                                Model::MeanResponseFactor},
             parse_model);
  round_trip(std::vector<Weighting>{Weighting::None, Weighting::InvX, Weighting::InvX2,
                                    Weighting::InvY, Weighting::InvY2},
             parse_weighting);
  round_trip(std::vector<Criterion>{Criterion::TooFewLevels, Criterion::R2BelowMin,
                                    Criterion::LevelError, Criterion::TooFewLevelsWithin,
                                    Criterion::RfRsdAboveMax, Criterion::NotMonotonic},
             parse_criterion);
  round_trip(std::vector<LimitDefinition>{LimitDefinition::IchQ2, LimitDefinition::Din32645},
             parse_limit_definition);
  const auto rules = cw::rules::all_westgard_rules();
  round_trip(std::vector<cw::rules::WestgardRule>(rules.begin(), rules.end()),
             cw::rules::parse_westgard_rule);
}

TEST_CASE("enum text: the stored tokens of earlier versions still parse", "[domain]") {
  // Stores written before the reasons were typed hold these tokens (refusals.reasons,
  // results.reasons, results.flags); each must read back as the value it meant.
  CHECK(cw::parse_reason("self-review") == cw::Reason::SelfReview);
  CHECK(cw::parse_reason("not-awaiting-review") == cw::Reason::NotAwaitingReview);
  CHECK(cw::parse_reason("not-retirable") == cw::Reason::NotRetirable);
  CHECK(cw::parse_reason("rejected") == cw::Reason::CurveRejected);
  CHECK(cw::parse_reason("retired") == cw::Reason::CurveRetired);
  CHECK(cw::parse_reason("above-range") == cw::Reason::AboveRange);
  CHECK(cw::parse_reason("no-active-curve") == cw::Reason::NoActiveCurve);
  CHECK(cw::parse_result_flag("below-range") == cw::ResultFlag::BelowRange);
}
