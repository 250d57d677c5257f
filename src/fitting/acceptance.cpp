// SPDX-License-Identifier: Apache-2.0
// evaluate_acceptance(): the initial-calibration acceptance rules of calibration-practice.md §5.1
// applied to a FitResult.
#include "fitting/acceptance.h"

#include <cmath>
#include <cstddef>
#include <limits>
#include <stdexcept>
#include <string>

#include "fitting/number_format.h"

namespace cw::fitting {
namespace {

using detail::format_number;

constexpr double kNoLimit = std::numeric_limits<double>::infinity();
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

struct CriterionName {
  Criterion criterion;
  std::string_view text;
};
constexpr CriterionName kCriterionNames[] = {
    {Criterion::TooFewLevels, "too-few-levels"},
    {Criterion::R2BelowMin, "r2-below-min"},
    {Criterion::LevelError, "level-error"},
    {Criterion::TooFewLevelsWithin, "too-few-levels-within"},
    {Criterion::RfRsdAboveMax, "rf-rsd-above-max"},
    {Criterion::NotMonotonic, "not-monotonic"},
};

// A value printed with the fewest significant digits (at least `minimum`) that still tell it
// apart from its limit, so "r² 0.99499 below minimum 0.995" never reads "0.995 below 0.995".
std::string distinct_text(double value, double limit, int minimum) {
  for (int digits = minimum; digits < 15; ++digits) {
    const std::string text = format_number(value, digits);
    if (text != format_number(limit, digits)) return text;
  }
  return format_number(value, 15);
}

// Signed %RE with 3 significant digits, more when needed to tell it from the limit.
std::string signed_pct(double value, double limit) {
  const std::string magnitude = distinct_text(std::abs(value), limit, 3);
  return (value > 0 ? "+" : value < 0 ? "-" : "") + magnitude;
}

std::string percent_limit(double limit) {
  return "\u00b1" + format_number(limit, 6) + " %";
}

struct Level {
  std::string label;
  double nominal = 0;
  bool fitted = false;              // has a non-excluded point
  std::vector<std::size_t> judged;  // points whose %RE is judged
};

}  // namespace

std::string_view to_string(Criterion criterion) {
  for (const auto& entry : kCriterionNames) {
    if (entry.criterion == criterion) return entry.text;
  }
  return "unknown";
}

std::optional<Criterion> parse_criterion(std::string_view text) {
  for (const auto& entry : kCriterionNames) {
    if (entry.text == text) return entry.criterion;
  }
  return std::nullopt;
}

Acceptance evaluate_acceptance(const FitResult& fit, const std::vector<std::string>& point_levels,
                               const AcceptanceCriteria& criteria) {
  if (point_levels.size() != fit.points.size()) {
    throw std::invalid_argument("evaluate_acceptance: " + std::to_string(point_levels.size()) +
                                " level labels for " + std::to_string(fit.points.size()) +
                                " points");
  }
  Acceptance out{true, {}, {}, {}};

  if (criteria.min_r2 && fit.r2 < *criteria.min_r2) {
    out.failures.push_back({Criterion::R2BelowMin,
                            "r\u00b2 " + distinct_text(fit.r2, *criteria.min_r2, 4) +
                                " below minimum " + format_number(*criteria.min_r2),
                            std::nullopt, fit.r2, *criteria.min_r2});
  }

  if (!is_monotonic(fit)) {
    const double vertex = *quadratic_vertex(fit);
    out.failures.push_back({Criterion::NotMonotonic,
                            "quadratic not monotonic over its working range: vertex at x = " +
                                format_number(vertex, 4) + " within [" +
                                format_number(fit.range_low) + ", " +
                                format_number(fit.range_high) + "]",
                            std::nullopt, vertex, kNaN});
  }

  // Levels in order of first appearance; the lowest is the fitted level of smallest nominal.
  std::vector<Level> levels;
  std::vector<std::size_t> level_of(fit.points.size());
  for (std::size_t i = 0; i < fit.points.size(); ++i) {
    std::size_t k = 0;
    while (k < levels.size() && levels[k].label != point_levels[i]) ++k;
    if (k == levels.size()) levels.push_back({point_levels[i], fit.points[i].x, false, {}});
    level_of[i] = k;
    const PointFit& p = fit.points[i];
    if (!p.excluded && !levels[k].fitted) {
      levels[k].fitted = true;
      levels[k].nominal = p.x;
    }
    if (!p.excluded && p.x != 0) levels[k].judged.push_back(i);
  }
  // A zero calibrator (a calibration blank) is fitted but neither judged by %RE nor counted as
  // a level of the working range: the lowest level is the lowest non-zero one (the LLOQ), and
  // the method's minimum counts non-zero levels (Standard Methods 6020 B: "non-zero").
  std::optional<double> lowest_nominal;
  int non_zero_levels = 0;
  for (const Level& level : levels) {
    if (!level.fitted || level.nominal == 0) continue;
    ++non_zero_levels;
    if (!lowest_nominal || level.nominal < *lowest_nominal) lowest_nominal = level.nominal;
  }
  if (non_zero_levels < criteria.min_levels) {
    const bool zero = non_zero_levels != fit.n_levels;
    out.failures.insert(
        out.failures.begin(),
        {Criterion::TooFewLevels,
         std::to_string(non_zero_levels) + " distinct " + (zero ? "non-zero " : "") +
             "levels fitted, at least " + std::to_string(criteria.min_levels) + " required",
         std::nullopt, static_cast<double>(non_zero_levels),
         static_cast<double>(criteria.min_levels)});
  }

  // Points: |%RE| <= limit, inclusive (the lowest-level limit only for the lowest level).
  const bool any_pct_limit = criteria.max_error_pct || criteria.max_error_pct_lowest;
  out.points.resize(fit.points.size());
  for (std::size_t i = 0; i < fit.points.size(); ++i) {
    const PointFit& p = fit.points[i];
    const Level& level = levels[level_of[i]];
    const bool lowest = level.fitted && lowest_nominal && level.nominal == *lowest_nominal;
    const std::optional<double> limit = lowest && criteria.max_error_pct_lowest
                                            ? criteria.max_error_pct_lowest
                                            : criteria.max_error_pct;
    PointJudgement& j = out.points[i];
    j.limit_pct = limit.value_or(kNoLimit);
    j.judged = !p.excluded && p.x != 0;
    if (p.excluded) {
      j.within_limits = false;
    } else if (!j.judged || !limit) {
      j.within_limits = true;
    } else {
      j.within_limits = p.error_pct.has_value() && std::abs(*p.error_pct) <= *limit;
    }
  }

  if (any_pct_limit) {
    std::vector<CriterionFinding> level_findings;
    int judged_levels = 0;
    int passing_levels = 0;
    std::string failing_names;
    for (const Level& level : levels) {
      if (level.judged.empty()) continue;
      ++judged_levels;
      int outside = 0;
      std::optional<std::size_t> worst;  // largest |%RE| among the failing points
      bool no_root = false;
      for (std::size_t i : level.judged) {
        if (out.points[i].within_limits) continue;
        ++outside;
        const PointFit& p = fit.points[i];
        if (!p.error_pct) {
          no_root = true;
        } else if (!worst || std::abs(*p.error_pct) > std::abs(*fit.points[*worst].error_pct)) {
          worst = i;
        }
      }
      if (outside == 0) {
        ++passing_levels;
        continue;
      }
      const double limit = out.points[level.judged.front()].limit_pct;
      std::string detail =
          "level " + level.label + " (nominal " + format_number(level.nominal) + "): ";
      double value = kNaN;
      if (worst) {
        value = *fit.points[*worst].error_pct;
        detail += "%RE " + signed_pct(value, limit) + " % outside " + percent_limit(limit);
      } else {
        detail += "no back-calculated value (the response has no solution on the curve)";
      }
      if (worst && no_root) detail += "; another point has no back-calculated value";
      if (level.judged.size() > 1) {
        detail += " (" + std::to_string(outside) + " of " + std::to_string(level.judged.size()) +
                  " points outside)";
      }
      level_findings.push_back({Criterion::LevelError, detail, level.label, value, limit});
      failing_names += (failing_names.empty() ? "" : ", ") + level.label;
    }

    if (!criteria.min_levels_within) {
      for (auto& finding : level_findings) out.failures.push_back(std::move(finding));
    } else if (judged_levels > 0) {
      const double fraction = static_cast<double>(passing_levels) / judged_levels;
      if (fraction < *criteria.min_levels_within) {
        out.failures.push_back(
            {Criterion::TooFewLevelsWithin,
             std::to_string(passing_levels) + " of " + std::to_string(judged_levels) + " levels (" +
                 format_number(100.0 * fraction, 3) + " %) within their %RE limits, at least " +
                 format_number(100.0 * *criteria.min_levels_within, 6) +
                 " % required; failing: " + failing_names,
             std::nullopt, fraction, *criteria.min_levels_within});
        for (auto& finding : level_findings) out.failures.push_back(std::move(finding));
      } else {
        for (auto& finding : level_findings) out.warnings.push_back(std::move(finding));
      }
    }
  }

  if (criteria.max_rf_rsd_pct && fit.rf_rsd_pct > *criteria.max_rf_rsd_pct) {
    out.failures.push_back(
        {Criterion::RfRsdAboveMax,
         "response-factor %RSD " + distinct_text(fit.rf_rsd_pct, *criteria.max_rf_rsd_pct, 3) +
             " % above maximum " + format_number(*criteria.max_rf_rsd_pct) + " %",
         std::nullopt, fit.rf_rsd_pct, *criteria.max_rf_rsd_pct});
  }

  out.accepted = out.failures.empty();
  return out;
}

}  // namespace cw::fitting
