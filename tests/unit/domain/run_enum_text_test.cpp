// SPDX-License-Identifier: Apache-2.0
// Every enum has one text form, read and written through one table: each value round-trips,
// no two values share a text, and text that names no value parses to nothing (never silently
// to another value).
#include <catch2/catch.hpp>

#include <set>
#include <string>

#include "domain/check.h"
#include "domain/curve_state.h"
#include "domain/run.h"

namespace {

using namespace cw;

template <class E, class Parse>
void round_trip(const std::vector<E>& all, Parse parse) {
  std::set<std::string> seen;
  for (E value : all) {
    const std::string text(to_string(value));
    INFO(text);
    CHECK_FALSE(text.empty());
    CHECK(seen.insert(text).second);
    const auto back = parse(text);
    REQUIRE(back);
    CHECK(*back == value);
  }
  for (const char* wrong : {"", " reported", "Reported", "REFUSED", "rerun_required", "x"}) {
    CHECK_FALSE(parse(wrong));
  }
}

}  // namespace

TEST_CASE("enum text: result statuses round-trip", "[domain]") {
  round_trip(all_result_statuses(), parse_result_status);
  CHECK(to_string(ResultStatus::RerunRequired) == "rerun-required");
  CHECK(all_result_statuses().size() == 3);
}

TEST_CASE("enum text: rerun reasons round-trip", "[domain]") {
  round_trip(all_rerun_reasons(), parse_rerun_reason);
  CHECK(to_string(RerunReason::SamplesPerCheck) == "samples-per-check");
  CHECK(to_string(RerunReason::NoClosingCheck) == "no-closing-check");
}

TEST_CASE("enum text: run row kinds round-trip", "[domain]") {
  round_trip(all_run_row_kinds(), parse_run_row_kind);
  CHECK_FALSE(parse_run_row_kind("Sample"));  // the file reader lowers case first
}

TEST_CASE("enum text: reasons round-trip, the new ones included", "[domain]") {
  round_trip(all_reasons(), parse_reason);
  CHECK(to_string(Reason::TrendViolation) == "trend-violation");
  CHECK(to_string(Reason::CheckDue) == "check-due");
  CHECK(to_string(Reason::AlreadyImported) == "already-imported");
  CHECK(is_stale_reason(Reason::TrendViolation));
  CHECK_FALSE(is_stale_reason(Reason::CheckDue));
  CHECK_FALSE(is_stale_reason(Reason::AlreadyImported));
}

TEST_CASE("enum text: result flags and check kinds round-trip", "[domain]") {
  round_trip(all_result_flags(), parse_result_flag);
  round_trip(std::vector<CheckKind>{CheckKind::Check, CheckKind::Blank}, parse_check_kind);
}

TEST_CASE("result: the current status is the recorded one overridden by the latest event",
          "[domain]") {
  Result r;
  r.status = ResultStatus::Reported;
  CHECK(r.current_status() == ResultStatus::Reported);
  ResultStatusEvent e;
  e.status = ResultStatus::RerunRequired;
  r.latest_event = e;
  CHECK(r.current_status() == ResultStatus::RerunRequired);
  CHECK(r.status == ResultStatus::Reported);  // the row itself is never edited
}

TEST_CASE("column mapping: written as NAME=HEADER pairs in order", "[domain]") {
  CHECK(column_mapping_text({{"position", "Seq"}, {"sample", "Sample Name"}}) ==
        "position=Seq,sample=Sample Name");
  CHECK(column_mapping_text({}).empty());
}
