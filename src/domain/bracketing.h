// SPDX-License-Identifier: Apache-2.0
// Bracketing of samples by check standards along an instrument sequence (product.md §5.4,
// calibration-practice.md §5.4): a reportable result sits between a passing check before it
// and a passing check after it. Which results a failing check or blank puts in doubt, which
// samples exceed the method's samples_per_check, and which a sequence leaves without a closing
// check. Pure: the caller feeds the sequence in injection order and records every decision as a
// status event (a result row is never edited).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "domain/check.h"

namespace cw {

/// A passing check standard closes a bracket (and opens the next one); a blank never does: it
/// shows contamination, not whether the calibration still reads true.
bool closes_bracket(const Check& k);

/// One result that must be measured again, and why.
struct RerunDecision {
  ResultId result;
  RerunReason reason = RerunReason::CheckFailed;
  std::optional<CheckId> check;  ///< the failing check, or the last passing check
  std::string detail;            ///< the facts in plain words
};

/// The bracket of one analyte along one sequence. Results open in it are those reported since
/// the last passing check standard; the method's samples_per_check limits how many reported
/// samples may follow a passing check.
class Bracket {
 public:
  /// `reported_before`: results reported from the curve since its last passing check before the
  /// sequence (`last_pass_before`; nullopt when none passed since acquisition); `open_before`:
  /// those of them not yet marked rerun-required, oldest first. They belong to the bracket the
  /// sequence's first check closes, but a sequence that ends without a check leaves them as
  /// they are (they are not its results).
  Bracket(std::optional<int> samples_per_check, long reported_before,
          std::vector<ResultId> open_before, std::optional<CheckId> last_pass_before);

  /// A sample of the sequence was quantified; `reported` is false for a refusal (nothing to
  /// bracket). A reported sample beyond samples_per_check is rerun-required at once
  /// (samples-per-check); after a failure in the sequence every reported sample is
  /// (check-failed). `position` names the row in messages.
  std::optional<RerunDecision> on_sample(ResultId id, bool reported,
                                         std::optional<long> position = std::nullopt);

  /// A check or blank of the sequence was judged. A failure makes every open result
  /// rerun-required (check-failed) and the analyte failed for the rest of the sequence; a
  /// passing check standard closes the bracket and starts the count again.
  std::vector<RerunDecision> on_check(const Check& k, std::optional<long> position = std::nullopt);

  /// The sequence ended: its own results still open have no closing check (no-closing-check).
  std::vector<RerunDecision> on_end();

  /// Reported samples since the last passing check (before and in the sequence).
  long reported_since_check() const { return reported_; }
  std::optional<CheckId> last_passing_check() const { return last_pass_; }
  /// A check or blank of this analyte failed in the sequence.
  bool has_failed() const { return failed_.has_value(); }
  /// Results open in the current bracket.
  std::size_t open_count() const { return open_.size(); }

 private:
  struct Open {
    ResultId id;
    bool in_sequence = false;
  };

  std::optional<int> limit_;
  long reported_ = 0;
  std::vector<Open> open_;
  std::optional<CheckId> last_pass_;
  std::optional<CheckId> failed_;
  std::string failure_;
};

/// "check 12 at position 5 failed: recovery 86.0 %, allowed 90–110 %" and the like.
std::string describe_failure(const Check& k, std::optional<long> position);

}  // namespace cw
