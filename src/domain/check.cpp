// SPDX-License-Identifier: Apache-2.0
// Text forms of check and result enums.
#include "domain/check.h"

#include <algorithm>

#include "domain/enum_text.h"

namespace cw {
namespace {

constexpr std::pair<CheckKind, std::string_view> kKinds[] = {{CheckKind::Check, "check"},
                                                             {CheckKind::Blank, "blank"}};
constexpr std::pair<ResultStatus, std::string_view> kStatuses[] = {
    {ResultStatus::Reported, "reported"},
    {ResultStatus::Refused, "refused"},
    {ResultStatus::RerunRequired, "rerun-required"}};
constexpr std::pair<ResultFlag, std::string_view> kFlags[] = {
    {ResultFlag::BelowRange, "below-range"}};
constexpr std::pair<RerunReason, std::string_view> kRerunReasons[] = {
    {RerunReason::CheckFailed, "check-failed"},
    {RerunReason::SamplesPerCheck, "samples-per-check"},
    {RerunReason::NoClosingCheck, "no-closing-check"}};

}  // namespace

std::string_view to_string(CheckKind k) {
  return text_of(kKinds, k);
}
std::optional<CheckKind> parse_check_kind(std::string_view text) {
  return value_of(kKinds, text);
}
std::string_view to_string(ResultStatus s) {
  return text_of(kStatuses, s);
}
std::optional<ResultStatus> parse_result_status(std::string_view text) {
  return value_of(kStatuses, text);
}
std::vector<ResultStatus> all_result_statuses() {
  std::vector<ResultStatus> out;
  for (const auto& [status, text] : kStatuses) out.push_back(status);
  return out;
}
std::string_view to_string(ResultFlag f) {
  return text_of(kFlags, f);
}
std::optional<ResultFlag> parse_result_flag(std::string_view text) {
  return value_of(kFlags, text);
}
std::vector<ResultFlag> all_result_flags() {
  std::vector<ResultFlag> out;
  for (const auto& [flag, text] : kFlags) out.push_back(flag);
  return out;
}
std::string_view to_string(RerunReason r) {
  return text_of(kRerunReasons, r);
}
std::optional<RerunReason> parse_rerun_reason(std::string_view text) {
  return value_of(kRerunReasons, text);
}
std::vector<RerunReason> all_rerun_reasons() {
  std::vector<RerunReason> out;
  for (const auto& [reason, text] : kRerunReasons) out.push_back(reason);
  return out;
}

bool Result::has_flag(ResultFlag f) const {
  return std::find(flags.begin(), flags.end(), f) != flags.end();
}

ResultStatus Result::current_status() const {
  return latest_event ? latest_event->status : status;
}

}  // namespace cw
