// SPDX-License-Identifier: Apache-2.0
// Checks fit() and inverse_predict() against a reference least-squares and inverse-prediction
// implementation in 50-digit arithmetic (Boost.Multiprecision cpp_bin_float_50), for every model
// and weighting on data sets that are hard for double: narrow ranges far from zero (x ~ 10³ and
// 10⁵), tiny concentrations (x ~ 10⁻⁹), and wide ranges with replicates. Also measures the NIST
// StRD Norris and Pontius intercepts against the best the double inputs allow.
//
// Every reference value in this file is computed here with 50-digit Boost.Multiprecision from the
// same double inputs, following calibration-practice.md §1-§4 literally (normal equations, which
// are fine at 50 digits once x is centred; the formulas as printed). LRE = -log10(|a - b|/|b|).
#include <algorithm>
#include <boost/multiprecision/cpp_bin_float.hpp>
#include <catch2/catch.hpp>
#include <cmath>
#include <cstddef>
#include <cstdlib>
#include <fstream>
#include <iomanip>
#include <iostream>
#include <limits>
#include <stdexcept>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "fitting/fit.h"

namespace {

using cw::fitting::FitResult;
using cw::fitting::Model;
using cw::fitting::Observation;
using cw::fitting::Prediction;
using cw::fitting::Weighting;
using Real = boost::multiprecision::cpp_bin_float_50;
using RealMatrix = std::vector<std::vector<Real>>;

// ---------------------------------------------------------------------------------------------
// The 50-digit reference.

Real raw_weight(Weighting weighting, const Real& x, const Real& y) {
  switch (weighting) {
    case Weighting::None:
      return 1;
    case Weighting::InvX:
      return 1 / x;
    case Weighting::InvX2:
      return 1 / (x * x);
    case Weighting::InvY:
      return 1 / y;
    case Weighting::InvY2:
      return 1 / (y * y);
  }
  return 1;
}

// Solves M·z = v for each column of `rhs` by Gauss-Jordan elimination with partial pivoting.
RealMatrix solve(RealMatrix m, RealMatrix rhs) {
  const std::size_t p = m.size();
  for (std::size_t k = 0; k < p; ++k) {
    std::size_t pivot = k;
    for (std::size_t r = k + 1; r < p; ++r) {
      if (abs(m[r][k]) > abs(m[pivot][k])) pivot = r;
    }
    std::swap(m[k], m[pivot]);
    std::swap(rhs[k], rhs[pivot]);
    for (std::size_t r = 0; r < p; ++r) {
      if (r == k) continue;
      const Real f = m[r][k] / m[k][k];
      for (std::size_t j = 0; j < p; ++j) m[r][j] -= f * m[k][j];
      for (std::size_t j = 0; j < rhs[r].size(); ++j) rhs[r][j] -= f * rhs[k][j];
    }
  }
  for (std::size_t k = 0; k < p; ++k) {
    for (auto& value : rhs[k]) value /= m[k][k];
  }
  return rhs;
}

// A weighted polynomial fit in t = x - shift (shift = weighted mean of x, 0 through the origin),
// weights normalised to Σw' = n (calibration-practice.md §1.3).
struct Reference {
  Model model;
  Weighting weighting;
  std::vector<Real> x, y, w;
  Real n, sum_raw_w, shift;
  std::vector<int> powers;  // powers of t in the model: {0, 1}, {1}, {0, 1, 2}
  std::vector<Real> coef;   // coefficient of t^powers[k]
  RealMatrix inverse;       // (TᵀW'T)⁻¹
  Real sse, s2;
  int dof = 0;
  Real rf_mean, rf_sd;  // mean response factor
  Real x_low;

  Real coefficient(int power) const {
    for (std::size_t k = 0; k < powers.size(); ++k) {
      if (powers[k] == power) return coef[k];
    }
    return 0;
  }
  Real response(const Real& x_value) const {
    if (model == Model::MeanResponseFactor) return rf_mean * x_value;
    const Real t = x_value - shift;
    return coefficient(0) + coefficient(1) * t + coefficient(2) * t * t;
  }
  Real slope_at(const Real& x_value) const {
    if (model == Model::MeanResponseFactor) return rf_mean;
    return coefficient(1) + 2 * coefficient(2) * (x_value - shift);
  }
  // Raw parameters a, b, c of y = a + b·x + c·x².
  Real intercept() const {
    return coefficient(0) - coefficient(1) * shift + coefficient(2) * shift * shift;
  }
  Real slope() const {
    if (model == Model::MeanResponseFactor) return rf_mean;
    return coefficient(1) - 2 * coefficient(2) * shift;
  }
};

Reference reference_fit(Model model, Weighting weighting, const std::vector<Observation>& data) {
  Reference r;
  r.model = model;
  r.weighting = weighting;
  for (const auto& o : data) {
    r.x.emplace_back(o.x);
    r.y.emplace_back(o.y);
    r.w.push_back(raw_weight(weighting, Real(o.x), Real(o.y)));
  }
  r.n = static_cast<int>(data.size());
  r.sum_raw_w = 0;
  for (const auto& w : r.w) r.sum_raw_w += w;
  for (auto& w : r.w) w = r.n * w / r.sum_raw_w;
  r.x_low = *std::min_element(r.x.begin(), r.x.end());
  const std::size_t count = data.size();

  if (model == Model::MeanResponseFactor) {
    // §1.5: RF_i = y_i/x_i, RFbar = ΣRF/n, s_RF with n - 1.
    Real sum = 0;
    for (std::size_t i = 0; i < count; ++i) sum += r.y[i] / r.x[i];
    r.rf_mean = sum / r.n;
    Real ss = 0;
    for (std::size_t i = 0; i < count; ++i) {
      const Real d = r.y[i] / r.x[i] - r.rf_mean;
      ss += d * d;
    }
    r.rf_sd = sqrt(ss / (r.n - 1));
    r.dof = static_cast<int>(count) - 1;
    return r;
  }

  r.powers = model == Model::Linear      ? std::vector<int>{0, 1}
             : model == Model::Quadratic ? std::vector<int>{0, 1, 2}
                                         : std::vector<int>{1};
  r.shift = 0;
  if (model != Model::LinearThroughOrigin) {
    for (std::size_t i = 0; i < count; ++i) r.shift += r.w[i] * r.x[i];
    r.shift /= r.n;
  }
  const std::size_t p = r.powers.size();
  RealMatrix normal(p, std::vector<Real>(p, Real(0)));
  RealMatrix rhs(p, std::vector<Real>(1, Real(0)));
  for (std::size_t i = 0; i < count; ++i) {
    const Real t = r.x[i] - r.shift;
    for (std::size_t a = 0; a < p; ++a) {
      const Real ta = pow(t, r.powers[a]);
      for (std::size_t b = 0; b < p; ++b) normal[a][b] += r.w[i] * ta * pow(t, r.powers[b]);
      rhs[a][0] += r.w[i] * ta * r.y[i];
    }
  }
  const RealMatrix solution = solve(normal, rhs);
  for (std::size_t a = 0; a < p; ++a) r.coef.push_back(solution[a][0]);
  RealMatrix identity(p, std::vector<Real>(p, Real(0)));
  for (std::size_t a = 0; a < p; ++a) identity[a][a] = 1;
  r.inverse = solve(normal, identity);
  r.sse = 0;
  for (std::size_t i = 0; i < count; ++i) {
    const Real e = r.y[i] - r.response(r.x[i]);
    r.sse += r.w[i] * e * e;
  }
  r.dof = static_cast<int>(count - p);
  r.s2 = r.sse / r.dof;
  return r;
}

// The unknown's weight on the normalised scale, w0 = w(x0 or y0)·n/Σw_raw (§3.2).
Real unknown_weight(const Reference& r, const Real& x0, const Real& y0) {
  const bool by_x = r.weighting == Weighting::InvX || r.weighting == Weighting::InvX2;
  return raw_weight(r.weighting, by_x ? x0 : Real(0), by_x ? Real(0) : y0) * r.n / r.sum_raw_w;
}

struct ReferencePrediction {
  Real x0, sd;
};

// Inverse prediction, calibration-practice.md §3.1-§3.4 as printed.
ReferencePrediction reference_inverse(const Reference& r, const Real& y0, int m) {
  ReferencePrediction out;
  if (r.model == Model::MeanResponseFactor) {
    // Relative-error model of the mean RF: s_x0 = x0·(s_RF/RFbar)·sqrt(1/m + 1/n).
    out.x0 = y0 / r.rf_mean;
    out.sd = out.x0 * r.rf_sd / r.rf_mean * sqrt(Real(1) / m + 1 / r.n);
    return out;
  }
  if (r.model == Model::Linear) {
    // §3.1-3.2: s_x0 = (s/|b|)·sqrt(1/(m·w0) + 1/n + (y0 - ybar_w)²/(b²·Sxx_w)).
    const Real b = r.coefficient(1);
    out.x0 = r.shift + (y0 - r.coefficient(0)) / b;
    const Real w0 = unknown_weight(r, out.x0, y0);
    Real ybar = 0;
    Real sxx = 0;
    for (std::size_t i = 0; i < r.x.size(); ++i) {
      ybar += r.w[i] * r.y[i];
      sxx += r.w[i] * (r.x[i] - r.shift) * (r.x[i] - r.shift);
    }
    ybar /= r.n;
    out.sd = sqrt(r.s2) / abs(b) *
             sqrt(1 / (m * w0) + 1 / r.n + (y0 - ybar) * (y0 - ybar) / (b * b * sxx));
    return out;
  }
  if (r.model == Model::LinearThroughOrigin) {
    // §3.3: s_x0 = (s/|b|)·sqrt(1/(m·w0) + y0²/(b²·Σw'x²)).
    const Real b = r.coefficient(1);
    out.x0 = y0 / b;
    const Real w0 = unknown_weight(r, out.x0, y0);
    Real sx2 = 0;
    for (std::size_t i = 0; i < r.x.size(); ++i) sx2 += r.w[i] * r.x[i] * r.x[i];
    out.sd = sqrt(r.s2) / abs(b) * sqrt(1 / (m * w0) + y0 * y0 / (b * b * sx2));
    return out;
  }
  // §3.4 quadratic: c·t² + b·t + (a - y0) = 0 in t = x - shift; of the two roots keep the one
  // nearer the middle of the range (the test responses lie inside it); delta method
  // s_x0 = sqrt(s²/(m·w0) + s²·gᵀM⁻¹g)/|b + 2c·t0|, g = (1, t0, t0²).
  const Real a = r.coefficient(0) - y0;
  const Real b = r.coefficient(1);
  const Real c = r.coefficient(2);
  const Real root = sqrt(b * b - 4 * a * c);
  const Real t1 = (-b + root) / (2 * c);
  const Real t2 = (-b - root) / (2 * c);
  const Real mid = (*std::max_element(r.x.begin(), r.x.end()) + r.x_low) / 2 - r.shift;
  const Real t0 = abs(t1 - mid) < abs(t2 - mid) ? t1 : t2;
  out.x0 = r.shift + t0;
  const Real w0 = unknown_weight(r, out.x0, y0);
  const Real g[3] = {1, t0, t0 * t0};
  Real quadratic_form = 0;
  for (std::size_t i = 0; i < 3; ++i) {
    for (std::size_t j = 0; j < 3; ++j) quadratic_form += g[i] * r.inverse[i][j] * g[j];
  }
  out.sd = sqrt(r.s2 / (m * w0) + r.s2 * quadratic_form) / abs(b + 2 * c * t0);
  return out;
}

// ICH Q2 LOD (§4.1) with σ and S at the lowest calibrator, as fit.h defines them.
Real reference_lod(const Reference& r) {
  if (r.model == Model::MeanResponseFactor) return Real("3.3") * r.rf_sd * r.x_low / r.rf_mean;
  Real inverse_weights = 0;
  int readings = 0;
  for (std::size_t i = 0; i < r.x.size(); ++i) {
    if (r.x[i] != r.x_low) continue;
    inverse_weights += 1 / r.w[i];
    ++readings;
  }
  const Real sigma = sqrt(r.s2) * sqrt(inverse_weights / readings);
  const Real slope = r.model == Model::Quadratic ? r.slope_at(r.x_low) : r.coefficient(1);
  return Real("3.3") * sigma / abs(slope);
}

// Mandel's PW = (SSE_lin - SSE_quad)/s_y2² (ISO 8466-1, §2.2), same normalised weights.
Real reference_mandel(Weighting weighting, const std::vector<Observation>& data) {
  const Reference line = reference_fit(Model::Linear, weighting, data);
  const Reference quadratic = reference_fit(Model::Quadratic, weighting, data);
  return (line.sse - quadratic.sse) / quadratic.s2;
}

// ---------------------------------------------------------------------------------------------
// Comparison.

double lre(double estimate, const Real& reference) {
  const Real difference = abs(Real(estimate) - reference);
  if (difference == 0) return 17.0;
  return static_cast<double>(-log10(difference / abs(reference)));
}

std::vector<Observation> xy(const std::vector<double>& x, const std::vector<double>& y) {
  std::vector<Observation> out;
  for (std::size_t i = 0; i < x.size(); ++i) out.push_back({x[i], y[i]});
  return out;
}

struct DataSet {
  std::string name;
  std::vector<Observation> data;
};

// Data sets made for these tests (responses: a smooth curve plus noise, rounded to a few
// decimals, as an instrument reports them).
std::vector<DataSet> data_sets() {
  return {
      // Narrow range far from zero, x ~ 10³: y ≈ 2.5x + 0.8 - 0.004(x - 1000)².
      {"narrow at 1e3", xy({996, 997, 998, 999, 1000, 1001, 1002, 1003, 1004},
                           {2490.743, 2493.259, 2495.781, 2498.300, 2500.789, 2503.285, 2505.796,
                            2508.259, 2510.733})},
      // Narrow range far from zero, x ~ 10⁵: y ≈ 0.04x + 0.3 - 1e-4(x - 10⁵)².
      {"narrow at 1e5", xy({99960, 99970, 99980, 99990, 100000, 100010, 100020, 100030, 100040},
                           {3998.547, 3999.011, 3999.468, 3999.894, 4000.301, 4000.662, 4001.051,
                            4001.410, 4001.750})},
      // Tiny concentrations, x ~ 10⁻⁹ (mol/L): y ≈ (2e10·x - 1.5e16·x² + 0.4)·(1 ± 1 %).
      {"tiny x", xy({1e-9, 2e-9, 5e-9, 1e-8, 2e-8, 5e-8, 1e-7},
                    {20.437, 39.684, 100.647, 199.386, 396.220, 964.650, 1849.293})},
      // Two decades with duplicates (the demo's nitrate calibration): replicated lowest level.
      {"duplicates", xy({0.5, 0.5, 1, 1, 5, 5, 10, 10, 25, 25, 50, 50},
                        {0.0508, 0.0498, 0.1004, 0.0995, 0.5050, 0.4987, 1.0120, 0.9950, 2.5100,
                         2.4900, 4.9800, 5.0300})},
      // A very precise line (residual SD ~ 1e-4 against responses up to 123, six decimals): the
      // residuals are six orders below y, where a difference of sums of squares loses its digits
      // (the former Mandel value kept 8-10.5 of them here).
      {"precise line", xy({1, 2, 3, 4, 5, 6, 7, 8, 9, 10},
                          {12.357953, 24.703709, 37.049314, 49.394984, 61.740601, 74.086352,
                           86.432163, 98.777774, 111.123514, 123.469114})},
      // Two decades, one reading per level (calibration-practice.md §9 S1).
      {"S1", xy({1, 2, 5, 10, 20, 50, 100}, {10.9, 20.3, 52.8, 100.1, 209.0, 498.0, 1041.0})},
  };
}

constexpr Weighting kWeightings[] = {Weighting::None, Weighting::InvX, Weighting::InvX2,
                                     Weighting::InvY, Weighting::InvY2};

}  // namespace

TEST_CASE("inverse_predict: every model and weighting agrees with a 50-digit reference",
          "[fitting][reference]") {
  // Source of every reference value: computed here with 50-digit Boost.Multiprecision (above).
  struct Combination {
    Model model;
    Weighting weighting;
  };
  std::vector<Combination> combinations;
  for (Model model : {Model::Linear, Model::LinearThroughOrigin, Model::Quadratic}) {
    for (Weighting weighting : kWeightings) combinations.push_back({model, weighting});
  }
  combinations.push_back({Model::MeanResponseFactor, Weighting::None});

  for (const DataSet& set : data_sets()) {
    double worst_sd = 99;
    double worst_x0 = 99;
    double worst_lod = 99;
    for (const Combination& c : combinations) {
      INFO(set.name << ", " << cw::fitting::to_string(c.model) << ", "
                    << cw::fitting::to_string(c.weighting));
      const FitResult f = cw::fitting::fit(c.model, c.weighting, set.data);
      const Reference r = reference_fit(c.model, c.weighting, set.data);
      REQUIRE(cw::fitting::is_monotonic(f));
      const double lod_lre = lre(f.lod, reference_lod(r));
      INFO("LOD " << std::setprecision(17) << f.lod << " LRE " << lod_lre);
      CHECK(lod_lre >= 10);
      worst_lod = std::min(worst_lod, lod_lre);
      // Responses at 10 %, 50 % and 90 % of the range, on the reference curve.
      for (double fraction : {0.1, 0.5, 0.9}) {
        const Real x_target = r.x_low + fraction * (f.range_high - f.range_low);
        const double y0 = static_cast<double>(r.response(x_target));
        for (int m : {1, 3}) {
          const Prediction p = cw::fitting::inverse_predict(f, y0, m);
          const ReferencePrediction ref = reference_inverse(r, Real(y0), m);
          const double sd_lre = lre(p.sd_x0, ref.sd);
          const double x0_lre = lre(p.x0, ref.x0);
          INFO("y0 " << std::setprecision(17) << y0 << ", m " << m << ": x0 " << p.x0 << " (LRE "
                     << x0_lre << "), s_x0 " << p.sd_x0 << " reference "
                     << static_cast<double>(ref.sd) << " (LRE " << sd_lre << ")");
          CHECK(sd_lre >= 10);
          CHECK(x0_lre >= 10);
          worst_sd = std::min(worst_sd, sd_lre);
          worst_x0 = std::min(worst_x0, x0_lre);
        }
      }
    }
    std::cout << std::fixed << std::setprecision(1) << set.name << ": lowest LRE s_x0 " << worst_sd
              << ", x0 " << worst_x0 << ", ICH LOD " << worst_lod << std::defaultfloat << '\n';
  }
}

TEST_CASE("fit: Mandel's test value agrees with a 50-digit reference", "[fitting][reference]") {
  // Reference: PW = (SSE_lin - SSE_quad)/s_y2² computed here with 50-digit Boost.Multiprecision;
  // fit() takes it as the squared t statistic of the quadratic coefficient.
  for (const DataSet& set : data_sets()) {
    double worst = 99;
    for (Weighting weighting : kWeightings) {
      INFO(set.name << ", " << cw::fitting::to_string(weighting));
      const FitResult f = cw::fitting::fit(Model::Linear, weighting, set.data);
      REQUIRE(f.mandel.has_value());
      const Real reference = reference_mandel(weighting, set.data);
      const double value_lre = lre(f.mandel->test_value, reference);
      INFO("PW " << std::setprecision(17) << f.mandel->test_value << ", reference "
                 << static_cast<double>(reference) << ", LRE " << value_lre);
      CHECK(value_lre >= 11);
      // The fields stay consistent: DS² = PW·s_y2².
      const Reference line = reference_fit(Model::Linear, weighting, set.data);
      const Reference quadratic = reference_fit(Model::Quadratic, weighting, set.data);
      CHECK(lre(f.mandel->ds2, line.sse - quadratic.sse) >= 11);
      CHECK(lre(f.mandel->s_y2, sqrt(quadratic.s2)) >= 11);
      CHECK(lre(f.mandel->s_y1, sqrt(line.s2)) >= 11);
      worst = std::min(worst, value_lre);
    }
    std::cout << std::fixed << std::setprecision(1) << set.name << ": lowest LRE Mandel PW "
              << worst << std::defaultfloat << '\n';
  }
}

TEST_CASE("fit: quadratic on a narrow range far from zero keeps x0's variance",
          "[fitting][reference]") {
  // The raw delta method gᵀ·Cov·g with g = (1, x0, x0²) cancels ~(x0/range)⁴: at x ~ 10⁵ over
  // ±40 no digit survives. fit() keeps the centred, scaled representation; this checks s_x0 at
  // the middle of both narrow ranges to the 50-digit reference (computed here) and that a curve
  // without that representation refuses instead of returning a clamped number.
  for (const DataSet& set : data_sets()) {
    if (set.name.rfind("narrow", 0) != 0) continue;
    INFO(set.name);
    FitResult f = cw::fitting::fit(Model::Quadratic, Weighting::None, set.data);
    REQUIRE(f.design.has_value());
    const Reference r = reference_fit(Model::Quadratic, Weighting::None, set.data);
    const double y0 = static_cast<double>(r.response((f.range_low + f.range_high) / 2));
    const Prediction p = cw::fitting::inverse_predict(f, y0, 1);
    const ReferencePrediction ref = reference_inverse(r, Real(y0), 1);
    CHECK(lre(p.sd_x0, ref.sd) >= 10);
    f.design.reset();  // as a result kept without the representation would be read back
    CHECK_THROWS_AS(cw::fitting::inverse_predict(f, y0, 1), cw::fitting::FitError);
  }
}

namespace {

std::string nist_path(const std::string& name) {
  return std::string(CW_TEST_DATA_DIR) + "/nist-strd/" + name;
}

std::vector<Observation> read_nist(const std::string& file) {
  std::ifstream in(nist_path(file));
  if (!in) throw std::runtime_error("cannot open " + nist_path(file));
  std::string line;
  std::getline(in, line);
  std::vector<Observation> out;
  while (std::getline(in, line)) {
    if (line.empty()) continue;
    const auto comma = line.find(',');
    out.push_back({std::strtod(line.substr(0, comma).c_str(), nullptr),
                   std::strtod(line.substr(comma + 1).c_str(), nullptr)});
  }
  return out;
}

// Certified intercept as printed by NIST (a decimal string, read into 50 digits directly).
Real certified_intercept(const std::string& dataset) {
  std::ifstream in(nist_path("certified.json"));
  const nlohmann::json document = nlohmann::json::parse(in);
  for (const auto& parameter : document.at("datasets").at(dataset).at("parameters")) {
    if (parameter.at("term") == "1") {
      std::string text = parameter.at("estimate").get<std::string>();
      return Real(text);
    }
  }
  throw std::runtime_error("no intercept for " + dataset);
}

}  // namespace

TEST_CASE("fit: NIST Norris and Pontius intercepts within 0.5 of the best the inputs allow",
          "[fitting][reference][nist]") {
  // Certified values: NIST StRD, Statistical Engineering Division (tests/data/nist-strd). The
  // best attainable LRE is that of the exact least-squares solution of the data as rounded to
  // double, computed here with 50-digit Boost.Multiprecision; fit() must come within 0.5 of it.
  struct Case {
    std::string dataset, file;
    Model model;
  };
  for (const Case& c : {Case{"Norris", "norris.csv", Model::Linear},
                        Case{"Pontius", "pontius.csv", Model::Quadratic}}) {
    const std::vector<Observation> data = read_nist(c.file);
    const Real certified = certified_intercept(c.dataset);
    const Reference exact = reference_fit(c.model, Weighting::None, data);
    const double best =
        static_cast<double>(-log10(abs(exact.intercept() - certified) / abs(certified)));
    const FitResult f = cw::fitting::fit(c.model, Weighting::None, data);
    const double got = lre(f.intercept, certified);
    std::cout << std::fixed << std::setprecision(1) << c.dataset << " b0 LRE " << got
              << " (best the double inputs allow " << best << ")" << std::defaultfloat << '\n';
    INFO(c.dataset << ": LRE " << got << ", best " << best);
    CHECK(got >= best - 0.5);
  }
}
