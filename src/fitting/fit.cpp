// SPDX-License-Identifier: Apache-2.0
// fit(): input checks, weights, the model fits and their summary figures (calibration-practice.md
// §1, §2.2, §4.1).
#include "fitting/fit.h"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <string>

#include "fitting/least_squares.h"
#include "fitting/number_format.h"

namespace cw::fitting {
namespace {

using detail::format_number;

struct ModelName {
  Model model;
  std::string_view text;
};
constexpr ModelName kModelNames[] = {
    {Model::Linear, "linear"},
    {Model::LinearThroughOrigin, "linear-through-origin"},
    {Model::Quadratic, "quadratic"},
    {Model::MeanResponseFactor, "mean-response-factor"},
};

struct WeightingName {
  Weighting weighting;
  std::string_view text;
};
constexpr WeightingName kWeightingNames[] = {
    {Weighting::None, "none"}, {Weighting::InvX, "1/x"},    {Weighting::InvX2, "1/x^2"},
    {Weighting::InvY, "1/y"},  {Weighting::InvY2, "1/y^2"},
};

bool uses_x(Weighting weighting) {
  return weighting == Weighting::InvX || weighting == Weighting::InvX2;
}
bool uses_y(Weighting weighting) {
  return weighting == Weighting::InvY || weighting == Weighting::InvY2;
}

double raw_weight(Weighting weighting, double x, double y) {
  switch (weighting) {
    case Weighting::None:
      return 1.0;
    case Weighting::InvX:
      return 1.0 / x;
    case Weighting::InvX2:
      return 1.0 / (x * x);
    case Weighting::InvY:
      return 1.0 / y;
    case Weighting::InvY2:
      return 1.0 / (y * y);
  }
  return 1.0;
}

// dy/dx at x: in u coordinates for a quadratic carrying its design (b + 2c·x cancels there when
// the range is narrow and far from zero), raw otherwise.
double derivative_at(const FitResult& fit, double x) {
  if (fit.model == Model::Quadratic && fit.design && fit.design->parameters == 3) {
    const ScaledDesign& d = *fit.design;
    const double u = (x - d.centre) / d.scale;
    return (d.coefficients[1] + 2 * d.coefficients[2] * u) / d.scale;
  }
  return fit.slope + 2 * fit.quadratic * x;
}

std::string point_label(std::size_t index) {
  return "point " + std::to_string(index + 1);
}

// The fitted subset of the input, in input order.
struct FittedData {
  std::vector<std::size_t> index;  // position in the input
  std::vector<double> x, y, w;     // w: normalised weights, Σw = n
  double sum_raw_weights = 0;
};

FittedData select_and_weigh(Model model, Weighting weighting,
                            const std::vector<Observation>& observations) {
  FittedData data;
  for (std::size_t i = 0; i < observations.size(); ++i) {
    const Observation& o = observations[i];
    if (o.excluded) continue;
    if (!std::isfinite(o.x) || !std::isfinite(o.y)) {
      throw FitError(
          point_label(i) + " has a concentration or response that is not a finite number",
          "correct the value or exclude the point");
    }
    data.index.push_back(i);
    data.x.push_back(o.x);
    data.y.push_back(o.y);
  }

  std::vector<double> levels = data.x;
  std::sort(levels.begin(), levels.end());
  const auto n_levels = std::unique(levels.begin(), levels.end()) - levels.begin();
  if (n_levels < min_levels_to_fit(model)) {
    throw FitError("a " + std::string(to_string(model)) + " fit needs at least " +
                       std::to_string(min_levels_to_fit(model)) +
                       " distinct concentration levels, but the data have " +
                       std::to_string(n_levels) + " (excluded points not counted)",
                   "add calibration levels or choose a model with fewer coefficients");
  }

  if (model == Model::MeanResponseFactor) {
    if (weighting != Weighting::None) {
      throw FitError("a mean-response-factor fit takes no weighting, got '" +
                         std::string(to_string(weighting)) + "'",
                     "use weighting 'none' with this model");
    }
    for (std::size_t k = 0; k < data.x.size(); ++k) {
      if (!(data.x[k] > 0)) {
        throw FitError("a mean-response-factor fit needs concentrations above 0, but " +
                           point_label(data.index[k]) + " has concentration " +
                           format_number(data.x[k]),
                       "exclude the blank or zero level from the fit");
      }
    }
  }

  // 1/x-type weights need x > 0, 1/y-type y > 0 (calibration-practice.md §1.3, edge rules).
  for (std::size_t k = 0; k < data.x.size(); ++k) {
    if (uses_x(weighting) && !(data.x[k] > 0)) {
      throw FitError("cannot weight by " + std::string(to_string(weighting)) + ": " +
                         point_label(data.index[k]) + " has concentration " +
                         format_number(data.x[k]) +
                         ", and the weight needs a concentration above 0",
                     "exclude the blank or zero level from the fit, or choose another weighting");
    }
    if (uses_y(weighting) && !(data.y[k] > 0)) {
      throw FitError("cannot weight by " + std::string(to_string(weighting)) + ": " +
                         point_label(data.index[k]) + " has response " + format_number(data.y[k]) +
                         ", and the weight needs a response above 0",
                     "exclude that point from the fit, or choose another weighting");
    }
  }

  // Normalise to Σw' = n (Miller & Miller convention, §1.3).
  data.w.resize(data.x.size());
  for (std::size_t k = 0; k < data.x.size(); ++k) {
    data.w[k] = raw_weight(weighting, data.x[k], data.y[k]);
    data.sum_raw_weights += data.w[k];
  }
  const double n = static_cast<double>(data.x.size());
  for (double& w : data.w) w = n * w / data.sum_raw_weights;
  return data;
}

void set_covariance(FitResult& out, const std::array<std::array<double, 3>, 3>& unscaled,
                    double s2) {
  for (std::size_t i = 0; i < 3; ++i) {
    for (std::size_t j = 0; j < 3; ++j) out.covariance[i][j] = s2 * unscaled[i][j];
  }
  out.se_intercept = std::sqrt(out.covariance[0][0]);
  out.se_slope = std::sqrt(out.covariance[1][1]);
  out.se_quadratic = std::sqrt(out.covariance[2][2]);
}

std::string r2_text(Model model, Weighting weighting) {
  const bool weighted = weighting != Weighting::None;
  switch (model) {
    case Model::Linear:
    case Model::Quadratic:
      return weighted ? "weighted, centred: 1 - sum(w*e^2)/sum(w*(y - ybar_w)^2)"
                      : "centred: 1 - sum(e^2)/sum((y - ybar)^2)";
    case Model::LinearThroughOrigin:
      return weighted ? "weighted, uncentred: 1 - sum(w*e^2)/sum(w*y^2)"
                      : "uncentred: 1 - sum(e^2)/sum(y^2)";
    case Model::MeanResponseFactor:
      return "uncentred, slope = mean response factor: 1 - sum((y - RF*x)^2)/sum(y^2)";
  }
  return {};
}

// Mandel's fitting test (ISO 8466-1, §2.2) for a linear fit; same normalised weights.
std::optional<MandelTest> mandel_test(const FittedData& data, double sse_linear, int n_levels) {
  const int n = static_cast<int>(data.x.size());
  if (n - 3 < 1 || n_levels < 3) return std::nullopt;
  detail::LeastSquares quadratic;
  try {
    quadratic = detail::solve_least_squares(detail::Design::Quadratic, data.x, data.y, data.w);
  } catch (const FitError&) {
    return std::nullopt;  // the auxiliary quadratic is not estimable: no test, the line stands
  }
  MandelTest test{};
  test.dof_quadratic = n - 3;
  test.s_y1 = std::sqrt(sse_linear / (n - 2));
  test.s_y2 = std::sqrt(quadratic.sse / (n - 3));
  if (!(test.s_y2 > 0)) return std::nullopt;  // PW undefined for an exact quadratic fit
  // PW = DS²/s_y2² with DS² = SSE_lin - SSE_quad, the extra sum of squares of the quadratic term.
  // For nested least-squares fits that extra sum equals c²/[(XᵀW'X)⁻¹]_cc, so PW = (c/se(c))², the
  // squared t statistic of the quadratic coefficient (any affine rescaling of x leaves the ratio
  // unchanged, so it is taken in the solver's u coordinates). se(β2) = s_y2·|R⁻¹_22| because the
  // last row of the triangular R⁻¹ holds only its diagonal. This keeps the digits the difference
  // of two nearly equal sums loses on hard data.
  const double se_quadratic = test.s_y2 * std::abs(quadratic.r_inverse[2][2]);
  const double t = quadratic.beta_scaled[2] / se_quadratic;
  test.test_value = t * t;
  test.ds2 = test.test_value * test.s_y2 * test.s_y2;
  test.f_critical_99 = f_quantile(0.99, 1, n - 3);
  test.linear_adequate = test.test_value <= test.f_critical_99;
  return test;
}

ScaledDesign scaled_design(const detail::LeastSquares& ls) {
  ScaledDesign design;
  design.centre = ls.centre;
  design.scale = ls.scale;
  design.parameters = ls.parameters;
  design.coefficients = ls.beta_scaled;
  design.r_inverse = ls.r_inverse;
  return design;
}

// ICH Q2 (calibration-practice.md §4.1): LOD = 3.3·σ/S, LOQ = 10·σ/S, σ and S taken at the low
// end of the range, where the limits live.
//  - Unweighted fits assume one response SD everywhere: σ = s_y/x.
//  - A weighted fit models Var(y_i) = s_w²/w'_i (weights normalised to Σw' = n, §1.3), so the
//    response SD it implies at the lowest calibrator is σ = s_w·sqrt(mean of 1/w'_i over that
//    level's readings), i.e. s_w/sqrt(w'(x_low)) for 1/x and 1/x² (for 1/y-type weights the
//    readings' own weights, as fitted). This σ does not depend on how the weights are
//    normalised, whereas s_w alone is the SD at a point of "average weight" and moves with the
//    design (more high calibrators raise it).
//  - Mean response factor: the model's relative error s_RF/RFbar gives a response SD proportional
//    to x, σ = s_RF·x_low at the lowest calibrator (the same σ as the 1/x²-weighted line through
//    the origin, which is this model). The model's SD tends to 0 below the range, so σ is not
//    extrapolated below the lowest calibrator.
//  - S is the slope dy/dx at the lowest calibrator: b for lines, b + 2c·x_low for the quadratic,
//    RFbar for the mean response factor.
void ich_limits(FitResult& out, const FittedData& data) {
  double inverse_weight_sum = 0;
  int readings = 0;
  for (std::size_t k = 0; k < data.x.size(); ++k) {
    if (data.x[k] != out.range_low) continue;
    inverse_weight_sum += 1.0 / data.w[k];
    ++readings;
  }
  const std::string weighting(to_string(out.weighting));
  if (out.model == Model::MeanResponseFactor) {
    out.lod_sigma = out.rf_sd * out.range_low;
    out.lod_slope = out.rf_mean;
    out.lod_definition =
        "ICH Q2: sigma = s_RF*x_low, the response SD of the relative-error (mean response "
        "factor) model at the lowest calibrator; S = mean response factor";
  } else {
    if (out.weighting == Weighting::None) {
      out.lod_sigma = out.residual_sd;
      out.lod_definition = "ICH Q2: sigma = residual SD s(y/x)";
    } else {
      out.lod_sigma = out.residual_sd * std::sqrt(inverse_weight_sum / readings);
      out.lod_definition = "ICH Q2: sigma = response SD the " + weighting +
                           "-weighted fit implies at the lowest calibrator, s_w*sqrt(mean 1/w' "
                           "of its readings) (normalised weights)";
    }
    if (out.model == Model::Quadratic) {
      out.lod_slope = derivative_at(out, out.range_low);
      out.lod_definition += "; S = slope b + 2c*x at the lowest calibrator";
    } else {
      out.lod_slope = out.slope;
      out.lod_definition += "; S = slope b";
    }
  }
  const double sensitivity = std::abs(out.lod_slope);
  out.lod =
      sensitivity > 0 ? 3.3 * out.lod_sigma / sensitivity : std::numeric_limits<double>::infinity();
  out.loq = sensitivity > 0 ? 10.0 * out.lod_sigma / sensitivity
                            : std::numeric_limits<double>::infinity();
}

void response_factors(FitResult& out, const FittedData& data) {
  std::vector<double> rf;
  for (std::size_t k = 0; k < data.x.size(); ++k) {
    if (data.x[k] > 0) rf.push_back(data.y[k] / data.x[k]);
  }
  if (rf.empty()) return;
  double sum = 0;
  for (double v : rf) sum += v;
  out.rf_mean = sum / static_cast<double>(rf.size());
  if (rf.size() < 2) return;
  double ss = 0;  // two-pass: no Σx² - (Σx)²/n cancellation (§1.1)
  for (double v : rf) ss += (v - out.rf_mean) * (v - out.rf_mean);
  out.rf_sd = std::sqrt(ss / static_cast<double>(rf.size() - 1));
  out.rf_rsd_pct = 100.0 * out.rf_sd / out.rf_mean;
}

}  // namespace

std::string_view to_string(Model model) {
  for (const auto& entry : kModelNames) {
    if (entry.model == model) return entry.text;
  }
  return "unknown";
}

std::string_view to_string(Weighting weighting) {
  for (const auto& entry : kWeightingNames) {
    if (entry.weighting == weighting) return entry.text;
  }
  return "unknown";
}

std::optional<Model> parse_model(std::string_view text) {
  for (const auto& entry : kModelNames) {
    if (entry.text == text) return entry.model;
  }
  return std::nullopt;
}

std::optional<Weighting> parse_weighting(std::string_view text) {
  for (const auto& entry : kWeightingNames) {
    if (entry.text == text) return entry.weighting;
  }
  return std::nullopt;
}

int min_levels_to_fit(Model model) {
  switch (model) {
    case Model::Linear:
      return 3;
    case Model::LinearThroughOrigin:
      return 2;
    case Model::Quadratic:
      return 4;
    case Model::MeanResponseFactor:
      return 2;
  }
  return 0;
}

FitResult fit(Model model, Weighting weighting, const std::vector<Observation>& observations) {
  const FittedData data = select_and_weigh(model, weighting, observations);
  const std::size_t count = data.x.size();
  const double n = static_cast<double>(count);

  FitResult out;
  out.model = model;
  out.weighting = weighting;
  out.n_points = static_cast<int>(count);
  {
    std::vector<double> levels = data.x;
    std::sort(levels.begin(), levels.end());
    out.n_levels = static_cast<int>(std::unique(levels.begin(), levels.end()) - levels.begin());
    out.range_low = levels.front();
    out.range_high = levels.back();
  }
  out.sum_raw_weights = data.sum_raw_weights;
  out.r2_definition = r2_text(model, weighting);

  // Weighted means and sums on the normalised scale, two-pass (§1.3).
  for (std::size_t k = 0; k < count; ++k) {
    out.xbar_w += data.w[k] * data.x[k];
    out.ybar_w += data.w[k] * data.y[k];
    out.sum_x2_w += data.w[k] * data.x[k] * data.x[k];
  }
  out.xbar_w /= n;
  out.ybar_w /= n;
  double syy_w = 0;
  double sum_y2_w = 0;
  for (std::size_t k = 0; k < count; ++k) {
    out.sxx_w += data.w[k] * (data.x[k] - out.xbar_w) * (data.x[k] - out.xbar_w);
    syy_w += data.w[k] * (data.y[k] - out.ybar_w) * (data.y[k] - out.ybar_w);
    sum_y2_w += data.w[k] * data.y[k] * data.y[k];
  }
  response_factors(out, data);

  if (model == Model::MeanResponseFactor) {
    // §1.5: a line through the origin with slope RFbar; s = sqrt(Σ(y - RFbar·x)²/(n-1)) is
    // descriptive. se(RFbar) = s_RF/sqrt(n).
    out.slope = out.rf_mean;
    out.dof = out.n_points - 1;
    for (std::size_t k = 0; k < count; ++k) {
      const double e = data.y[k] - out.slope * data.x[k];
      out.sse += e * e;
    }
    out.residual_sd = std::sqrt(out.sse / out.dof);
    out.se_slope = out.rf_sd / std::sqrt(n);
    out.covariance[1][1] = out.se_slope * out.se_slope;
    out.r2 = sum_y2_w > 0 ? 1.0 - out.sse / sum_y2_w : 0.0;
  } else {
    const detail::Design design = model == Model::Linear      ? detail::Design::Line
                                  : model == Model::Quadratic ? detail::Design::Quadratic
                                                              : detail::Design::LineThroughOrigin;
    const detail::LeastSquares ls = detail::solve_least_squares(design, data.x, data.y, data.w);
    const int parameters = model == Model::Linear ? 2 : model == Model::Quadratic ? 3 : 1;
    out.intercept = ls.beta[0];
    out.slope = ls.beta[1];
    out.quadratic = ls.beta[2];
    out.sse = ls.sse;
    out.dof = out.n_points - parameters;
    const double s2 = ls.sse / out.dof;
    out.residual_sd = std::sqrt(s2);
    set_covariance(out, ls.unscaled_covariance, s2);
    out.design = scaled_design(ls);
    if (model == Model::LinearThroughOrigin) {
      // Uncentred R0² = 1 - Σw·e²/Σw·y² (§1.2; NIST StRD certifies this one for NoInt1/2).
      out.r2 = sum_y2_w > 0 ? 1.0 - ls.sse / sum_y2_w : 0.0;
    } else {
      out.r2 = syy_w > 0 ? 1.0 - ls.sse / syy_w : 0.0;
    }
    if (model == Model::Linear) out.mandel = mandel_test(data, ls.sse, out.n_levels);
  }

  ich_limits(out, data);
  if (model == Model::Linear && weighting == Weighting::None) out.din = din32645_limits(out);

  out.points.resize(observations.size());
  std::size_t next_fitted = 0;
  for (std::size_t i = 0; i < observations.size(); ++i) {
    const Observation& o = observations[i];
    PointFit& p = out.points[i];
    p.x = o.x;
    p.y = o.y;
    p.excluded = o.excluded;
    p.fitted_y = predict_response(out, o.x);
    p.back_calculated = back_calculate(out, o.y);
    if (p.back_calculated && o.x != 0) p.error_pct = 100.0 * (*p.back_calculated - o.x) / o.x;
    if (!o.excluded) p.weight = data.w[next_fitted++];
  }
  return out;
}

}  // namespace cw::fitting
