// SPDX-License-Identifier: Apache-2.0
// Detection and quantification limits by definition: DIN 32645:2008-11 (calibration method) and
// the choice between it and the ICH Q2 limits of fit() (calibration-practice.md §4.1-§4.2).
#include <cmath>
#include <limits>
#include <string>

#include "fitting/fit.h"
#include "fitting/number_format.h"

namespace cw::fitting {
namespace {

using detail::format_number;

struct LimitDefinitionName {
  LimitDefinition definition;
  std::string_view text;
};
constexpr LimitDefinitionName kLimitDefinitionNames[] = {
    {LimitDefinition::IchQ2, "ich-q2"},
    {LimitDefinition::Din32645, "din-32645"},
};

void check_parameters(const DinParameters& p) {
  if (!(p.alpha > 0 && p.alpha < 0.5)) {
    throw FitError("the DIN 32645 error probability alpha must lie between 0 and 0.5, got " +
                   format_number(p.alpha));
  }
  if (!(p.beta > 0 && p.beta < 0.5)) {
    throw FitError("the DIN 32645 error probability beta must lie between 0 and 0.5, got " +
                   format_number(p.beta));
  }
  if (!(p.k > 0) || !std::isfinite(p.k)) {
    throw FitError("the DIN 32645 factor k must be above 0, got " + format_number(p.k));
  }
  if (p.m < 1) {
    throw FitError("the DIN 32645 number of readings m must be at least 1, got " +
                   std::to_string(p.m));
  }
}

}  // namespace

std::string_view to_string(LimitDefinition definition) {
  for (const auto& entry : kLimitDefinitionNames) {
    if (entry.definition == definition) return entry.text;
  }
  return "unknown";
}

std::optional<LimitDefinition> parse_limit_definition(std::string_view text) {
  for (const auto& entry : kLimitDefinitionNames) {
    if (entry.text == text) return entry.definition;
  }
  return std::nullopt;
}

std::optional<DinLimits> din32645_limits(const FitResult& fit, const DinParameters& parameters) {
  check_parameters(parameters);
  if (fit.model != Model::Linear || fit.weighting != Weighting::None) return std::nullopt;
  if (fit.dof < 1 || fit.slope == 0 || !(fit.residual_sd > 0) || !(fit.sxx_w > 0)) {
    return std::nullopt;
  }
  // DIN 32645:2008-11, calibration method (calibration-practice.md §4.2), unweighted line:
  //   f = n - 2, s_x0 = s_y/x/b, Qx = Sxx, m readings of the analysis sample
  //   y_k  = a + s_y/x·t(1-α; f)·sqrt(1/m + 1/n + xbar²/Qx)
  //   x_NG = s_x0·t(1-α; f)·sqrt(1/m + 1/n + xbar²/Qx)               (= (y_k - a)/b)
  //   x_EG = x_NG + s_x0·t(1-β; f)·sqrt(1/m + 1/n + xbar²/Qx)        (= 2·x_NG when α = β)
  //   x_BG = k·s_x0·t(1-α/2; f)·sqrt(1/m + 1/n + (x_BG - xbar)²/Qx)  (fixed point from k·x_NG)
  // t quantiles are one-sided for x_NG and x_EG and two-sided for x_BG.
  DinLimits out;
  out.parameters = parameters;
  out.dof = fit.dof;
  const double n = fit.n_points;
  const double m = parameters.m;
  const double xbar = fit.xbar_w;
  const double qx = fit.sxx_w;
  out.method_sd = fit.residual_sd / std::abs(fit.slope);
  const double root = std::sqrt(1.0 / m + 1.0 / n + xbar * xbar / qx);
  const double t_alpha = student_t_quantile(1.0 - parameters.alpha, out.dof);
  const double t_beta = student_t_quantile(1.0 - parameters.beta, out.dof);
  const double t_alpha_half = student_t_quantile(1.0 - parameters.alpha / 2.0, out.dof);
  out.critical_value = out.method_sd * t_alpha * root;
  out.critical_response = fit.intercept + fit.slope * out.critical_value;
  out.detection_limit = out.critical_value + out.method_sd * t_beta * root;

  // x = K·sqrt(A + (x - xbar)²/Qx) with K = k·s_x0·t(1-α/2; f). The map's derivative is
  // K²(x - xbar)/(Qx·x) < K²/Qx, so the iteration contracts when K² < Qx; for K² >= Qx the
  // relative uncertainty 1/k is not reached at any concentration and there is no x_BG.
  const double big_k = parameters.k * out.method_sd * t_alpha_half;
  if (!(big_k * big_k < qx)) return out;
  const double a_term = 1.0 / m + 1.0 / n;
  double x = parameters.k * out.critical_value;
  for (int iteration = 1; iteration <= 100000; ++iteration) {
    const double next = big_k * std::sqrt(a_term + (x - xbar) * (x - xbar) / qx);
    out.iterations = iteration;
    const bool converged =
        std::abs(next - x) <= 8 * std::numeric_limits<double>::epsilon() * std::abs(next);
    x = next;
    if (converged) {
      out.quantification_limit = x;
      return out;
    }
  }
  // A contraction converges within the cap unless K² is within about 1e-5 of Qx, where x_BG runs
  // off to very large values anyway; no x_BG is given then.
  return out;
}

std::optional<ReportingLimits> reporting_limits(const FitResult& fit, LimitDefinition definition) {
  switch (definition) {
    case LimitDefinition::IchQ2:
      if (!std::isfinite(fit.lod) || !std::isfinite(fit.loq)) return std::nullopt;
      // A result kept before lod_definition existed took σ = residual_sd and S = slope.
      return ReportingLimits{
          definition, fit.lod, fit.loq,
          (fit.lod_definition.empty() ? std::string("ICH Q2: sigma = residual SD, S = slope b")
                                      : fit.lod_definition) +
              "; LOD = 3.3*sigma/S, LOQ = 10*sigma/S"};
    case LimitDefinition::Din32645: {
      if (!fit.din || !fit.din->quantification_limit) return std::nullopt;
      const DinLimits& d = *fit.din;
      return ReportingLimits{
          definition, d.critical_value, *d.quantification_limit,
          "DIN 32645:2008-11 calibration method: LOD = critical value x_NG (alpha = " +
              format_number(d.parameters.alpha) + "), LOQ = quantification limit x_BG (k = " +
              format_number(d.parameters.k) + ", alpha = " + format_number(d.parameters.alpha) +
              "), m = " + std::to_string(d.parameters.m)};
    }
  }
  return std::nullopt;
}

}  // namespace cw::fitting
