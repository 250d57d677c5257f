// SPDX-License-Identifier: Apache-2.0
// Calibration-curve fitting: models, weighting, least-squares fit, back-calculation and inverse
// prediction with its confidence interval.
//
// Overview. fit() turns nominal concentrations and responses into a FitResult: coefficients,
// their covariance, goodness-of-fit figures, ICH Q2 and DIN 32645 limits, response factors, the
// Mandel test and one PointFit per input observation. back_calculate() and inverse_predict() read a
// FitResult back (x from y). acceptance.h judges a FitResult against configured criteria. This
// folder is pure arithmetic: it never reads the clock, the disk or the database, and its public
// headers carry no Eigen or Boost types (those stay in least_squares.cpp and quantiles.cpp).
// Formulas follow calibration-practice.md §1-§4.
#pragma once

#include <array>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/error.h"

namespace cw::fitting {

/// Calibration model (calibration-practice.md §1.1-§1.5).
enum class Model {
  Linear,               ///< y = a + b·x
  LinearThroughOrigin,  ///< y = b·x
  Quadratic,            ///< y = a + b·x + c·x²
  MeanResponseFactor,   ///< y = RFbar·x, RFbar = mean of y/x (average response factor)
};

/// Weighting scheme of the least-squares fit (§1.3). Raw weights are evaluated per point and
/// normalised to sum n (Miller & Miller convention).
enum class Weighting { None, InvX, InvX2, InvY, InvY2 };

/// "linear", "linear-through-origin", "quadratic", "mean-response-factor".
std::string_view to_string(Model model);
/// "none", "1/x", "1/x^2", "1/y", "1/y^2".
std::string_view to_string(Weighting weighting);
/// Inverse of to_string(Model); exact, case-sensitive match; nullopt for anything else.
std::optional<Model> parse_model(std::string_view text);
/// Inverse of to_string(Weighting); exact, case-sensitive match; nullopt for anything else.
std::optional<Weighting> parse_weighting(std::string_view text);

/// Distinct non-excluded levels needed to fit with >= 1 residual degree of freedom: 3 linear,
/// 2 through-origin, 4 quadratic, 2 mean-response-factor.
int min_levels_to_fit(Model model);

/// One calibration reading: nominal concentration (or amount ratio) and response (area, height
/// or analyte/IS ratio, already formed).
struct Observation {
  double x;
  double y;
  bool excluded = false;  ///< kept in the record and back-calculated, but not fitted
};

/// Mandel's fitting test, ISO 8466-1 (calibration-practice.md §2.2): linear against quadratic
/// with the same weights.
struct MandelTest {
  double s_y1;  ///< residual SD of the line, sqrt(SSE_lin/(N-2))
  double s_y2;  ///< residual SD of the quadratic, sqrt(SSE_quad/(N-3))
  /// DS² = SSE_lin - SSE_quad (weighted sums), evaluated as PW·s_y2², which is the same quantity
  /// without the cancellation of the difference.
  double ds2;
  /// PW = DS²/s_y2², evaluated as the squared t statistic of the quadratic coefficient,
  /// (c/se(c))², which equals it algebraically and keeps the digits on hard data.
  double test_value;
  double f_critical_99;  ///< F(0.99; 1, N-3)
  int dof_quadratic;     ///< N-3
  bool linear_adequate;  ///< PW <= F(0.99; 1, N-3)
};

/// The fit seen from one input observation (same order as the input).
struct PointFit {
  double fitted_y = 0;                    ///< model value at x (also for excluded points)
  std::optional<double> back_calculated;  ///< model inverse at y (nullopt if no root)
  std::optional<double> error_pct;        ///< %RE = 100·(back-x)/x; nullopt when x == 0 or no root
  double weight = 0;      ///< normalised weight (sum over fitted points = n); 0 for excluded points
  double x = 0;           ///< nominal concentration, as given
  double y = 0;           ///< response, as given
  bool excluded = false;  ///< as given: not part of the fit
};

/// The centred, scaled coordinates the least-squares solve worked in, u = (x - centre)/scale,
/// kept so that read-back and the quadratic's x0 variance can be evaluated without the
/// cancellation the raw parameterisation suffers on narrow ranges far from zero.
struct ScaledDesign {
  /// Weighted mean of the fitted x on the normalised scale (0 for the line through the origin).
  double centre = 0;
  double scale = 1;    ///< sqrt(Σw'(x - centre)²/Σw') over the fitted points
  int parameters = 0;  ///< columns: 1 through origin (u), 2 line (1, u), 3 quadratic (1, u, u²)
  /// coefficients[k] multiplies column k: y = β0 + β1·u + β2·u² (quadratic), β0 + β1·u (line),
  /// β0·u (through origin); unused entries 0.
  std::array<double, 3> coefficients{};
  /// Upper-triangular R⁻¹ of the QR factor of the weighted design in u (normalised weights), so
  /// that the parameter covariance in u is residual_sd²·R⁻¹·R⁻ᵀ and a variance gᵀ·Cov·g is the
  /// sum of squares residual_sd²·|R⁻ᵀg|².
  std::array<std::array<double, 3>, 3> r_inverse{};
};

/// Parameters of the DIN 32645:2008-11 calibration method (calibration-practice.md §4.2).
struct DinParameters {
  double alpha = 0.01;  ///< error probability of the first kind (false positive)
  double beta = 0.01;   ///< error probability of the second kind (false negative)
  double k = 3;         ///< 1/k = relative result uncertainty at x_BG (k = 3: 33.3 %)
  int m = 1;            ///< replicate readings of the analysis sample
};

/// Detection and quantification limits of DIN 32645:2008-11, calibration method, for an
/// unweighted straight line (calibration-practice.md §4.2).
struct DinLimits {
  DinParameters parameters;  ///< α, β, k and m used
  int dof = 0;               ///< f = n - 2
  double method_sd = 0;      ///< s_x0 = s_y/x / b (Verfahrensstandardabweichung)
  /// Critical response y_k = a + s_y/x·t(1-α; f)·sqrt(1/m + 1/n + xbar²/Sxx).
  double critical_response = 0;
  /// Nachweisgrenze (critical value, decision limit) x_NG = s_x0·t(1-α; f)·sqrt(1/m + 1/n +
  /// xbar²/Sxx).
  double critical_value = 0;
  /// Erfassungsgrenze (detection limit) x_EG = x_NG + s_x0·t(1-β; f)·sqrt(1/m + 1/n + xbar²/Sxx)
  /// (= 2·x_NG when α = β).
  double detection_limit = 0;
  /// Bestimmungsgrenze (quantification limit) x_BG = k·s_x0·t(1-α/2; f)·sqrt(1/m + 1/n +
  /// (x_BG - xbar)²/Sxx), solved by fixed-point iteration from k·x_NG. nullopt when no finite
  /// solution exists (k·s_x0·t(1-α/2; f) >= sqrt(Sxx): the relative uncertainty 1/k is never
  /// reached).
  std::optional<double> quantification_limit;
  int iterations = 0;  ///< fixed-point iterations used for x_BG
};

/// Which definition of the detection and quantification limits feeds the "reporting" LOD/LOQ.
enum class LimitDefinition {
  IchQ2,     ///< ICH Q2 3.3·σ/S and 10·σ/S (FitResult::lod, loq; σ per lod_definition)
  Din32645,  ///< DIN 32645: LOD = critical value x_NG, LOQ = quantification limit x_BG
};

/// "ich-q2", "din-32645".
std::string_view to_string(LimitDefinition definition);
/// Inverse of to_string(LimitDefinition); exact match; nullopt for anything else.
std::optional<LimitDefinition> parse_limit_definition(std::string_view text);

/// Everything known about one fitted calibration curve. Coefficients and their covariance are in
/// the raw parameterisation y = intercept + slope·x + quadratic·x².
struct FitResult {
  Model model = Model::Linear;
  Weighting weighting = Weighting::None;
  /// 0 where the model has no such term; for mean-response-factor slope = mean RF.
  double intercept = 0, slope = 0, quadratic = 0;
  /// Standard errors, sqrt of the covariance diagonal (0 where absent).
  double se_intercept = 0, se_slope = 0, se_quadratic = 0;
  /// Parameter covariance s²·(XᵀW'X)⁻¹, order intercept, slope, quadratic; zero rows/cols where
  /// the model has no such term.
  std::array<std::array<double, 3>, 3> covariance{};
  double r2 = 0;              ///< see r2_definition; 0 when the responses do not vary
  std::string r2_definition;  ///< human text of the R² definition used
  /// s_y/x = sqrt(Σw'e²/dof), weights on the normalised scale. For mean-response-factor this is
  /// the unweighted SD of y about RFbar·x with n-1 degrees of freedom, a descriptive figure only:
  /// that model's interval and limits use rf_sd (its relative-error model).
  double residual_sd = 0;
  int dof = 0;                           ///< residual degrees of freedom, n - p
  int n_points = 0;                      ///< fitted (non-excluded) points, replicates counted
  int n_levels = 0;                      ///< distinct x values among the fitted points
  double range_low = 0, range_high = 0;  ///< lowest and highest non-excluded nominal
  /// ICH Q2 limits: LOD = 3.3·σ/|S|, LOQ = 10·σ/|S| with σ = lod_sigma and S = lod_slope, both
  /// taken at the low end of the range (lod_definition names them); +infinity when S = 0.
  double lod = 0, loq = 0;
  /// σ of the ICH limits: the response SD the fitted model implies at the lowest calibrator.
  /// Unweighted line, through origin, quadratic: s_y/x. Weighted: s_w·sqrt(mean of 1/w' over the
  /// readings of the lowest calibrator) = s_w/sqrt(w'(x_low)) for 1/x-type weights (normalised
  /// scale). Mean response factor: s_RF·x_low (relative-error model).
  double lod_sigma = 0;
  /// S of the ICH limits: the slope dy/dx at the lowest calibrator (b for lines, b + 2c·x_low for
  /// the quadratic, RFbar for mean response factor).
  double lod_slope = 0;
  /// Plain text naming the σ and S used for lod and loq.
  std::string lod_definition;
  /// DIN 32645:2008-11 limits with the default parameters (α = β = 0.01, k = 3, m = 1); only for
  /// an unweighted straight line with dof >= 1 and slope != 0.
  std::optional<DinLimits> din;
  /// Response factors y/x over the fitted points with x > 0 (SD with n-1; 0 when fewer than 2).
  double rf_mean = 0, rf_sd = 0, rf_rsd_pct = 0;
  /// Linear only (same weighting), when N-3 >= 1, >= 3 levels and the quadratic residual SD is
  /// not zero.
  std::optional<MandelTest> mandel;
  /// Weighted means and spread on the normalised scale (unweighted: plain means, Sxx), and Σw of
  /// the raw weights: what inverse prediction needs to place the unknown's weight w0.
  double xbar_w = 0, ybar_w = 0, sxx_w = 0, sum_raw_weights = 0;
  double sum_x2_w = 0;  ///< Σw'·x² (normalised weights), for through-origin
  std::vector<PointFit> points;
  double sse = 0;  ///< Σw'e² over the fitted points (normalised weights)
  /// The solver's centred, scaled representation (linear, through-origin and quadratic models;
  /// nullopt for mean-response-factor). Read-back and the quadratic's interval use it when
  /// present; without it a quadratic falls back to the raw covariance and refuses when that
  /// loses the digits.
  std::optional<ScaledDesign> design;
};

/// Fits `model` with `weighting` to the non-excluded observations by QR least squares on a
/// centred, scaled design. Throws FitError when the data cannot be fitted (too few levels,
/// weights undefined, non-finite values, mean RF with weighting or x <= 0).
FitResult fit(Model model, Weighting weighting, const std::vector<Observation>& observations);

/// Model value y(x); evaluated in the centred, scaled coordinates of `design` when present.
double predict_response(const FitResult& fit, double x);

/// Model inverse x(y), no interval. nullopt when y has no solution on the curve, the slope is zero,
/// or the quadratic is not monotonic over its working range (vertex in [range_low, range_high]).
std::optional<double> back_calculate(const FitResult& fit, double y);

/// x-coordinate of the parabola's vertex, -b/(2c); nullopt unless the model is quadratic with
/// c != 0.
std::optional<double> quadratic_vertex(const FitResult& fit);

/// False only for a quadratic whose vertex lies within [range_low, range_high] (§1.4).
bool is_monotonic(const FitResult& fit);

/// Result of inverse prediction (calibration-practice.md §3).
struct Prediction {
  double x0;          ///< predicted concentration
  double sd_x0;       ///< standard deviation of x0 (s_x0; QUAM u(c0))
  double ci_low;      ///< x0 - t·s_x0
  double ci_high;     ///< x0 + t·s_x0
  double t_quantile;  ///< t((1 + confidence)/2; dof)
  int dof;            ///< degrees of freedom of t
};

/// Inverse prediction from the mean y0 of m readings, two-sided interval at `confidence`.
/// Line: s_x0 = (s/|b|)·sqrt(1/(m·w0) + 1/n + (y0 - ybar_w)²/(b²·Sxx_w)) (§3.1-3.2); through
/// origin: (s/|b|)·sqrt(1/(m·w0) + y0²/(b²·Σw'x²)), f = n-1; quadratic: delta method
/// sqrt(s²/(m·w0) + gᵀ·Cov·g)/|b + 2c·x0|, g = (1, x0, x0²), f = n-3 (§3.4), evaluated in the
/// centred, scaled coordinates of FitResult::design; mean response factor (relative-error model):
/// s_x0 = x0·(s_RF/RFbar)·sqrt(1/m + 1/n), f = n-1, which equals the interval of the 1/x²-weighted
/// line through the origin. w0 is the unknown's weight on the normalised scale (1/x-type weights
/// at x0, 1/y-type at y0; 1 unweighted). Throws FitError when m < 1, confidence is not in (0, 1),
/// y0 has no solution, the curve is not monotonic over its working range, w0 is undefined, or the
/// variance cannot be computed to a useful number of digits (a quadratic without `design`).
Prediction inverse_predict(const FitResult& fit, double y0_mean, int m, double confidence = 0.95);

/// DIN 32645:2008-11 calibration-method limits of `fit` with the given parameters
/// (calibration-practice.md §4.2). nullopt unless the fit is an unweighted straight line with
/// dof >= 1, a non-zero slope and a non-zero residual SD. Throws FitError when α or β is not in
/// (0, 0.5), k <= 0 or m < 1.
std::optional<DinLimits> din32645_limits(const FitResult& fit,
                                         const DinParameters& parameters = {});

/// The reporting limits under one definition.
struct ReportingLimits {
  LimitDefinition definition;
  double lod;               ///< limit of detection, concentration units
  double loq;               ///< limit of quantitation, concentration units
  std::string description;  ///< plain text naming the definition and its σ or parameters
};

/// The LOD/LOQ of `fit` under `definition`: ICH Q2 from lod/loq (nullopt when not finite), DIN
/// 32645 from `din` (x_NG and x_BG; nullopt when din or its x_BG is absent).
std::optional<ReportingLimits> reporting_limits(const FitResult& fit, LimitDefinition definition);

/// Student-t quantile at cumulative probability p with `dof` degrees of freedom (Boost.Math).
double student_t_quantile(double p, double dof);
/// Fisher F quantile at cumulative probability p with (dof1, dof2) degrees of freedom. Both
/// quantile functions throw FitError for p outside (0, 1) or degrees of freedom not above 0.
double f_quantile(double p, double dof1, double dof2);

/// The data cannot be fitted or read back; the message says why in plain words.
class FitError : public cw::ValidationError {
 public:
  using ValidationError::ValidationError;
};

}  // namespace cw::fitting
