// SPDX-License-Identifier: Apache-2.0
// Bracketing decisions.
#include "domain/bracketing.h"

#include "core/text.h"

namespace cw {
namespace {

std::string at_position(std::optional<long> position) {
  return position ? " at position " + std::to_string(*position) : std::string();
}

}  // namespace

bool closes_bracket(const Check& k) {
  return k.kind == CheckKind::Check && k.passed;
}

std::string describe_failure(const Check& k, std::optional<long> position) {
  std::string s = std::string(to_string(k.kind)) + " " + std::to_string(k.id.value) +
                  at_position(position) + " failed: ";
  if (!k.measured) return s + "its response has no solution on the curve";
  if (k.kind == CheckKind::Check && k.recovery_pct) {
    return s + "recovery " + format_fixed(*k.recovery_pct, 1) + " %, allowed " +
           format_plain(k.limit_low.value_or(0), 6) + "–" +
           format_plain(k.limit_high.value_or(0), 6) + " %";
  }
  return s + "measured " + format_sig(*k.measured, 4) +
         (k.limit_high ? ", limit " + format_sig(*k.limit_high, 4) : std::string());
}

Bracket::Bracket(std::optional<int> samples_per_check, long reported_before,
                 std::vector<ResultId> open_before, std::optional<CheckId> last_pass_before)
    : limit_(samples_per_check), reported_(reported_before), last_pass_(last_pass_before) {
  for (ResultId id : open_before) open_.push_back({id, false});
}

std::optional<RerunDecision> Bracket::on_sample(ResultId id, bool reported,
                                                std::optional<long> position) {
  if (!reported) return std::nullopt;
  if (failed_) {
    return RerunDecision{id, RerunReason::CheckFailed, failed_,
                         "reported after " + failure_ + " earlier in the run"};
  }
  ++reported_;
  if (limit_ && reported_ > *limit_) {
    const std::string after = last_pass_ ? "check " + std::to_string(last_pass_->value)
                                         : "the curve was acquired (no check standard passed)";
    return RerunDecision{id, RerunReason::SamplesPerCheck, last_pass_,
                         "sample" + at_position(position) + " is reported sample number " +
                             std::to_string(reported_) + " since " + after +
                             "; the method allows " + std::to_string(*limit_) +
                             " before a check standard"};
  }
  open_.push_back({id, true});
  return std::nullopt;
}

std::vector<RerunDecision> Bracket::on_check(const Check& k, std::optional<long> position) {
  std::vector<RerunDecision> out;
  if (failed_) return out;  // the analyte stays failed for the rest of the sequence
  if (!k.passed) {
    failed_ = k.id;
    failure_ = describe_failure(k, position);
    for (const auto& o : open_) {
      out.push_back({o.id, RerunReason::CheckFailed, k.id,
                     failure_ + "; every result since the last passing check must be re-run"});
    }
    open_.clear();
    return out;
  }
  if (closes_bracket(k)) {
    open_.clear();
    reported_ = 0;
    last_pass_ = k.id;
  }
  return out;
}

std::vector<RerunDecision> Bracket::on_end() {
  std::vector<RerunDecision> out;
  std::vector<Open> kept;
  for (const auto& o : open_) {
    if (!o.in_sequence) {
      kept.push_back(o);
      continue;
    }
    out.push_back({o.id, RerunReason::NoClosingCheck, last_pass_,
                   "the run ended without a passing check standard after this sample"});
  }
  open_ = std::move(kept);
  return out;
}

}  // namespace cw
