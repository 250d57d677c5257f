// SPDX-License-Identifier: Apache-2.0
// Control limits from passing checks and the Westgard multirules over a series of recoveries.
//
// Source of the rules: J. O. Westgard, P. L. Barry, M. R. Hunt, T. Groth, "A multi-rule Shewhart
// chart for quality control in clinical chemistry", Clinical Chemistry 27 (1981) 493–501. The
// paper's wording is given beside each rule from memory (to be confirmed against the paper); the
// definitions implemented are those of calibration-practice.md §8.2, taken from training sources
// that follow the paper.
#include "rules/westgard.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <utility>

#include "core/error.h"
#include "core/text.h"

namespace cw::rules {
namespace {

constexpr std::array<std::pair<WestgardRule, std::string_view>, 6> kRules = {{
    {WestgardRule::R1_2s, "1-2s"},
    {WestgardRule::R1_3s, "1-3s"},
    {WestgardRule::R2_2s, "2-2s"},
    {WestgardRule::R4s, "R-4s"},
    {WestgardRule::R4_1s, "4-1s"},
    {WestgardRule::R10x, "10-x"},
}};

Limits make_limits(double mean, double sd, LimitsBasis basis, std::size_t n) {
  Limits l;
  l.mean = mean;
  l.sd = sd;
  l.warn_low = mean - 2 * sd;
  l.warn_high = mean + 2 * sd;
  l.low = mean - 3 * sd;
  l.high = mean + 3 * sd;
  l.basis = basis;
  l.n = n;
  return l;
}

bool same_run(const ControlObservation& a, const ControlObservation& b) {
  return a.run.has_value() && b.run.has_value() && *a.run == *b.run;
}

/// Length of the streak of consecutive results meeting a condition, ending at the latest one.
class Streak {
 public:
  int next(bool holds) { return length_ = holds ? length_ + 1 : 0; }

 private:
  int length_ = 0;
};

}  // namespace

std::string_view to_string(WestgardRule rule) {
  for (const auto& [r, text] : kRules) {
    if (r == rule) return text;
  }
  return "";
}

std::optional<WestgardRule> parse_westgard_rule(std::string_view text) {
  for (const auto& [r, t] : kRules) {
    if (t == text) return r;
  }
  return std::nullopt;
}

std::set<WestgardRule> all_westgard_rules() {
  std::set<WestgardRule> all;
  for (const auto& [r, text] : kRules) all.insert(r);
  return all;
}

bool is_warning_only(WestgardRule rule) {
  return rule == WestgardRule::R1_2s;
}

std::optional<Limits> limits_from_history(const std::vector<double>& passing_recoveries,
                                          std::size_t last_n) {
  const std::size_t n = std::min(last_n, passing_recoveries.size());
  if (n < 2) return std::nullopt;
  const auto first = passing_recoveries.end() - static_cast<std::ptrdiff_t>(n);
  // Two passes (mean, then squared deviations from it): no cancellation between large sums, so
  // recoveries near 100 % with an SD of a few tenths keep their digits.
  double sum = 0;
  for (auto it = first; it != passing_recoveries.end(); ++it) {
    if (!std::isfinite(*it)) return std::nullopt;
    sum += *it;
  }
  const double mean = sum / static_cast<double>(n);
  double squares = 0;
  for (auto it = first; it != passing_recoveries.end(); ++it)
    squares += (*it - mean) * (*it - mean);
  const double sd = std::sqrt(squares / static_cast<double>(n - 1));
  // Identical values give exactly 0 here; with no spread every later result would "exceed" the
  // limits, so there are no usable limits rather than a chart that flags everything.
  if (!(sd > 0) || !std::isfinite(sd)) return std::nullopt;
  return make_limits(mean, sd, LimitsBasis::LastPassingChecks, n);
}

std::optional<Limits> limits_from_targets(double mean, double sd) {
  if (!std::isfinite(mean) || !std::isfinite(sd) || !(sd > 0)) return std::nullopt;
  return make_limits(mean, sd, LimitsBasis::MethodTargets, 0);
}

std::vector<Violation> evaluate_westgard(const std::vector<ControlObservation>& in_time_order,
                                         const Limits& limits,
                                         const std::set<WestgardRule>& rules_to_check) {
  if (!std::isfinite(limits.mean) || !std::isfinite(limits.sd) || !(limits.sd > 0))
    throw ValidationError("control limits need a finite mean and a positive standard deviation");
  for (std::size_t i = 0; i < in_time_order.size(); ++i) {
    const auto& o = in_time_order[i];
    if (!std::isfinite(o.recovery_pct))
      throw ValidationError("check " + std::to_string(o.check_id.value) +
                            " has no finite recovery to chart");
    if (i > 0 && o.at < in_time_order[i - 1].at)
      throw ValidationError("check " + std::to_string(o.check_id.value) +
                            " comes before the previous check in time: the series must be in "
                            "time order");
  }

  std::vector<Violation> out;
  const auto wanted = [&](WestgardRule r) { return rules_to_check.count(r) > 0; };
  const auto flag = [&](WestgardRule r, const ControlObservation& o) {
    out.push_back(Violation{r, o.check_id, o.at, is_warning_only(r)});
  };

  // The 1981 paper's chart is read as a flowchart (from memory): the other rules are applied
  // once a 1-2s warning is seen. Here every rule is evaluated on every observation, so a drift
  // shows as 4-1s or 10-x without a 1-2s before it (calibration-practice.md §9 S5, runs 14 and
  // 25). For 1-3s, 2-2s and R-4s the observation completing the pattern is itself beyond 2s,
  // so the gate would change nothing for them.
  //
  // Consecutive results on one side, over the whole series in time order. With one control per
  // run this is "in successive runs"; with several per run the materials are interleaved in
  // measurement order, so a streak counts within a run and carries over into the next.
  Streak above_2s, below_2s, above_1s, below_1s, above_mean, below_mean;
  // R-4s looks at one run only: what the run has shown so far, and whether it was reported.
  bool run_above_2s = false;
  bool run_below_2s = false;
  bool run_range_reported = false;

  for (std::size_t i = 0; i < in_time_order.size(); ++i) {
    const auto& o = in_time_order[i];
    const double z = (o.recovery_pct - limits.mean) / limits.sd;
    if (i == 0 || !same_run(in_time_order[i - 1], o)) {
      run_above_2s = run_below_2s = run_range_reported = false;
    }
    const int up2 = above_2s.next(z > 2);
    const int down2 = below_2s.next(z < -2);
    const int up1 = above_1s.next(z > 1);
    const int down1 = below_1s.next(z < -1);
    const int up0 = above_mean.next(z > 0);
    const int down0 = below_mean.next(z < 0);  // z == 0 (at the mean) ends both streaks
    run_above_2s = run_above_2s || z > 2;
    run_below_2s = run_below_2s || z < -2;

    // 1-2s. Westgard et al. 1981 (from memory): one control observation exceeding the mean ± 2s;
    // a warning that calls for inspection by the other rules, not a rejection.
    if (wanted(WestgardRule::R1_2s) && std::abs(z) > 2) flag(WestgardRule::R1_2s, o);

    // 1-3s. Westgard et al. 1981 (from memory): one control observation exceeding the mean ± 3s;
    // reject (random error, or a large systematic error).
    if (wanted(WestgardRule::R1_3s) && std::abs(z) > 3) flag(WestgardRule::R1_3s, o);

    // 2-2s. Westgard et al. 1981 (from memory): two consecutive control observations exceeding
    // the same mean + 2s or mean − 2s limit; reject (systematic error). It covers one material in
    // successive runs and two materials within one run (calibration-practice.md §8.2); here both
    // are "the previous observation in time order": within the run, or the last one of the
    // previous run.
    if (wanted(WestgardRule::R2_2s) && (up2 >= 2 || down2 >= 2)) flag(WestgardRule::R2_2s, o);

    // R-4s. Westgard et al. 1981 (from memory): one control observation exceeding the mean + 2s
    // and another exceeding the mean − 2s; reject (random error). Within one run only
    // (calibration-practice.md §8.2), so a run of a single observation never violates it, nor
    // do two extremes in successive runs. Reported once per run, at the observation that first
    // makes the pair.
    if (wanted(WestgardRule::R4s) && run_above_2s && run_below_2s && !run_range_reported) {
      flag(WestgardRule::R4s, o);
      run_range_reported = true;
    }

    // 4-1s. Westgard et al. 1981 (from memory): four consecutive control observations exceeding
    // the same mean + 1s or mean − 1s limit; reject (systematic error). Across runs: one
    // material over four runs, or two materials over two.
    if (wanted(WestgardRule::R4_1s) && (up1 >= 4 || down1 >= 4)) flag(WestgardRule::R4_1s, o);

    // 10-x. Westgard et al. 1981 (from memory): ten consecutive control observations falling on
    // one side of the mean; reject (systematic error). Across runs. A value exactly at the mean
    // is on neither side and breaks the streak (calibration-practice.md §8.2).
    if (wanted(WestgardRule::R10x) && (up0 >= 10 || down0 >= 10)) flag(WestgardRule::R10x, o);
  }
  return out;
}

std::set<WestgardRule> rejection_rules(const std::vector<std::string>& trend_rules) {
  std::set<WestgardRule> out;
  for (const auto& token : trend_rules) {
    const auto rule = parse_westgard_rule(token);
    if (!rule)
      throw ValidationError(
          "unknown Westgard rule " + quote(token) + " in the method's trend_rules",
          "use the Westgard rules 1-2s, 1-3s, 2-2s, R-4s, 4-1s, 10-x");
    // 1-2s is a warning by definition (calibration-practice.md §8.2: never reject on it alone);
    // listing it cannot make it a reason to stop using a curve.
    if (!is_warning_only(*rule)) out.insert(*rule);
  }
  return out;
}

std::vector<Violation> stale_violations(const std::vector<Violation>& found,
                                        const std::vector<std::string>& trend_rules) {
  const std::set<WestgardRule> rejecting = rejection_rules(trend_rules);
  std::vector<Violation> out;
  for (const auto& v : found) {
    if (rejecting.count(v.rule) > 0) out.push_back(v);
  }
  return out;
}

}  // namespace cw::rules
