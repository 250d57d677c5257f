// SPDX-License-Identifier: Apache-2.0
// Method version lookups and the translation of method rules into fitting criteria.
#include "domain/method.h"

#include <algorithm>

#include "core/error.h"
#include "core/number.h"
#include "domain/enum_text.h"

namespace cw {
namespace {

constexpr std::pair<ReportLimit, std::string_view> kReportLimits[] = {
    {ReportLimit::LowestCalibrator, "lowest-calibrator"},
    {ReportLimit::Loq, "loq"},
    {ReportLimit::Lod, "lod"}};

}  // namespace

std::string_view to_string(ReportLimit r) {
  return text_of(kReportLimits, r);
}
std::optional<ReportLimit> parse_report_limit(std::string_view text) {
  return value_of(kReportLimits, text);
}

fitting::AcceptanceCriteria CalibrationRules::acceptance_criteria() const {
  fitting::AcceptanceCriteria c;
  c.min_levels = min_levels;
  c.min_r2 = min_r2;
  c.max_error_pct = max_error_pct;
  c.max_error_pct_lowest = max_error_pct_lowest;
  c.min_levels_within = min_levels_within;
  c.max_rf_rsd_pct = max_rf_rsd_pct;
  return c;
}

bool MethodDefinition::has_analyte(const std::string& name) const {
  return std::find(analytes.begin(), analytes.end(), name) != analytes.end();
}

double MethodDefinition::fitted_response(double response, const std::optional<double>& is_response,
                                         const std::string& response_label,
                                         const std::string& is_response_label) const {
  if (internal_standard) {
    if (!is_response) {
      throw option_error(is_response_label,
                         "method '" + code + "' uses the internal standard '" + *internal_standard +
                             "': give " + is_response_label,
                         "the response is divided by the internal-standard response");
    }
    if (!(*is_response > 0)) {
      throw option_error(is_response_label, is_response_label + " must be above 0",
                         "the internal-standard response divides the analyte response");
    }
    return require_finite(response / *is_response,
                          "the ratio " + response_label + " / " + is_response_label,
                          is_response_label);
  }
  if (is_response) {
    throw option_error(is_response_label, "method '" + code + "' has no internal standard; " +
                                              is_response_label + " does not apply");
  }
  return response;
}

const MethodVersion* Method::version_at(Instant t) const {
  const MethodVersion* found = nullptr;
  for (const auto& v : versions) {
    if (v.effective_at <= t && (found == nullptr || v.version > found->version)) found = &v;
  }
  return found;
}

const MethodVersion* Method::version_number(int n) const {
  for (const auto& v : versions) {
    if (v.version == n) return &v;
  }
  return nullptr;
}

}  // namespace cw
