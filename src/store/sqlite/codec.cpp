// SPDX-License-Identifier: Apache-2.0
// JSON codecs for values kept in TEXT columns. Non-finite numbers are stored as null.
#include "store/sqlite/codec.h"

#include "core/error.h"
#include "store/sqlite/database.h"

#include <cmath>
#include <limits>

namespace cw::store::sqlite {
namespace {

using nlohmann::json;

json number_or_null(double v) {
  return std::isfinite(v) ? json(v) : json(nullptr);
}
double number_from(const json& j, double if_null) {
  return j.is_null() ? if_null : j.get<double>();
}

template <class T>
json optional_to_json(const std::optional<T>& v) {
  return v ? json(*v) : json(nullptr);
}

template <class T>
std::optional<T> optional_from(const json& j, const char* key) {
  if (!j.contains(key) || j.at(key).is_null()) return std::nullopt;
  return j.at(key).get<T>();
}

json duration_to_json(const Duration& d) {
  return to_string(d);
}
Duration duration_from(const json& j) {
  try {
    return parse_duration(j.get<std::string>());
  } catch (const ValidationError& e) {
    throw json::other_error::create(501, std::string("duration: ") + e.what(), &j);
  }
}

template <class E, class Parse>
E token_from(const json& j, Parse parse, const char* what) {
  auto v = parse(j.get<std::string>());
  if (!v) throw json::other_error::create(501, std::string("unknown ") + what, &j);
  return *v;
}

}  // namespace

json method_definition_to_json(const MethodDefinition& d) {
  json c = {
      {"model", fitting::to_string(d.calibration.model)},
      {"weighting", fitting::to_string(d.calibration.weighting)},
      {"min_levels", d.calibration.min_levels},
      {"min_r2", optional_to_json(d.calibration.min_r2)},
      {"max_error_pct", optional_to_json(d.calibration.max_error_pct)},
      {"max_error_pct_lowest", optional_to_json(d.calibration.max_error_pct_lowest)},
      {"min_levels_within", optional_to_json(d.calibration.min_levels_within)},
      {"max_rf_rsd_pct", optional_to_json(d.calibration.max_rf_rsd_pct)},
      {"valid_for", duration_to_json(d.calibration.valid_for)},
      {"review_required", d.calibration.review_required},
      {"limits", fitting::to_string(d.calibration.limits)},
      {"report_limit", to_string(d.calibration.report_limit)},
  };
  json k = {
      {"tolerance_pct", d.check.tolerance_pct},
      {"samples_per_check", optional_to_json(d.check.samples_per_check)},
      {"check_every", d.check.check_every ? duration_to_json(*d.check.check_every) : json(nullptr)},
      {"trend_rules", d.check.trend_rules},
      {"blank_limit", optional_to_json(d.check.blank_limit)},
  };
  // Added with trending targets; definitions stored before them do not have the keys (and are
  // never rewritten: the stored text is what their audit entries hash).
  if (d.check.trend_mean) k["trend_mean"] = *d.check.trend_mean;
  if (d.check.trend_sd) k["trend_sd"] = *d.check.trend_sd;
  return {
      {"code", d.code},
      {"title", d.title},
      {"unit", d.unit},
      {"analytes", d.analytes},
      {"internal_standard", optional_to_json(d.internal_standard)},
      {"calibration", c},
      {"check", k},
      {"uncertainty", {{"dilution_pct", optional_to_json(d.uncertainty.dilution_pct)}}},
  };
}

MethodDefinition method_definition_from_json(const json& j) {
  MethodDefinition d;
  d.code = j.at("code").get<std::string>();
  d.title = j.at("title").get<std::string>();
  d.unit = j.at("unit").get<std::string>();
  d.analytes = j.at("analytes").get<std::vector<std::string>>();
  d.internal_standard = optional_from<std::string>(j, "internal_standard");
  const json& c = j.at("calibration");
  d.calibration.model = token_from<fitting::Model>(c.at("model"), fitting::parse_model, "model");
  d.calibration.weighting =
      token_from<fitting::Weighting>(c.at("weighting"), fitting::parse_weighting, "weighting");
  d.calibration.min_levels = c.at("min_levels").get<int>();
  d.calibration.min_r2 = optional_from<double>(c, "min_r2");
  d.calibration.max_error_pct = optional_from<double>(c, "max_error_pct");
  d.calibration.max_error_pct_lowest = optional_from<double>(c, "max_error_pct_lowest");
  d.calibration.min_levels_within = optional_from<double>(c, "min_levels_within");
  d.calibration.max_rf_rsd_pct = optional_from<double>(c, "max_rf_rsd_pct");
  d.calibration.valid_for = duration_from(c.at("valid_for"));
  d.calibration.review_required = c.at("review_required").get<bool>();
  // Keys added after the first versions were stored: absent means the earlier behaviour.
  if (c.contains("limits")) {
    d.calibration.limits = token_from<fitting::LimitDefinition>(
        c.at("limits"), fitting::parse_limit_definition, "limit definition");
  }
  if (c.contains("report_limit")) {
    d.calibration.report_limit =
        token_from<ReportLimit>(c.at("report_limit"), parse_report_limit, "report limit");
  }
  if (j.contains("uncertainty")) {
    d.uncertainty.dilution_pct = optional_from<double>(j.at("uncertainty"), "dilution_pct");
  }
  const json& k = j.at("check");
  d.check.tolerance_pct = k.at("tolerance_pct").get<double>();
  d.check.samples_per_check = optional_from<int>(k, "samples_per_check");
  if (k.contains("check_every") && !k.at("check_every").is_null()) {
    d.check.check_every = duration_from(k.at("check_every"));
  }
  d.check.trend_rules = k.at("trend_rules").get<std::vector<std::string>>();
  d.check.blank_limit = optional_from<double>(k, "blank_limit");
  d.check.trend_mean = optional_from<double>(k, "trend_mean");
  d.check.trend_sd = optional_from<double>(k, "trend_sd");
  return d;
}

json fit_to_json(const fitting::FitResult& f) {
  json cov = json::array();
  for (const auto& row : f.covariance) cov.push_back({row[0], row[1], row[2]});
  json j = {
      {"model", fitting::to_string(f.model)},
      {"weighting", fitting::to_string(f.weighting)},
      {"intercept", f.intercept},
      {"slope", f.slope},
      {"quadratic", f.quadratic},
      {"se_intercept", f.se_intercept},
      {"se_slope", f.se_slope},
      {"se_quadratic", f.se_quadratic},
      {"covariance", cov},
      {"r2", f.r2},
      {"r2_definition", f.r2_definition},
      {"residual_sd", f.residual_sd},
      {"sse", f.sse},
      {"dof", f.dof},
      {"n_points", f.n_points},
      {"n_levels", f.n_levels},
      {"range_low", f.range_low},
      {"range_high", f.range_high},
      {"lod", number_or_null(f.lod)},
      {"loq", number_or_null(f.loq)},
      {"rf_mean", f.rf_mean},
      {"rf_sd", f.rf_sd},
      {"rf_rsd_pct", f.rf_rsd_pct},
      {"xbar_w", f.xbar_w},
      {"ybar_w", f.ybar_w},
      {"sxx_w", f.sxx_w},
      {"sum_raw_weights", f.sum_raw_weights},
      {"sum_x2_w", f.sum_x2_w},
      {"weights_normalisation", "weights scaled to sum to the number of fitted points"},
  };
  j["lod_sigma"] = number_or_null(f.lod_sigma);
  j["lod_slope"] = number_or_null(f.lod_slope);
  j["lod_definition"] = f.lod_definition;
  if (f.din) {
    const auto& d = *f.din;
    j["din"] = {{"alpha", d.parameters.alpha},
                {"beta", d.parameters.beta},
                {"k", d.parameters.k},
                {"m", d.parameters.m},
                {"dof", d.dof},
                {"method_sd", d.method_sd},
                {"critical_response", d.critical_response},
                {"critical_value", d.critical_value},
                {"detection_limit", d.detection_limit},
                {"quantification_limit", optional_to_json(d.quantification_limit)},
                {"iterations", d.iterations}};
  } else {
    j["din"] = nullptr;
  }
  if (f.design) {
    const auto& d = *f.design;
    json r = json::array();
    for (const auto& row : d.r_inverse) r.push_back({row[0], row[1], row[2]});
    j["design"] = {{"centre", d.centre},
                   {"scale", d.scale},
                   {"parameters", d.parameters},
                   {"coefficients", {d.coefficients[0], d.coefficients[1], d.coefficients[2]}},
                   {"r_inverse", r}};
  } else {
    j["design"] = nullptr;
  }
  if (f.mandel) {
    j["mandel"] = {{"s_y1", f.mandel->s_y1},
                   {"s_y2", f.mandel->s_y2},
                   {"ds2", f.mandel->ds2},
                   {"test_value", f.mandel->test_value},
                   {"f_critical_99", f.mandel->f_critical_99},
                   {"dof_quadratic", f.mandel->dof_quadratic},
                   {"linear_adequate", f.mandel->linear_adequate}};
  } else {
    j["mandel"] = nullptr;
  }
  return j;
}

fitting::FitResult fit_from_json(const json& j) {
  fitting::FitResult f;
  f.model = token_from<fitting::Model>(j.at("model"), fitting::parse_model, "model");
  f.weighting =
      token_from<fitting::Weighting>(j.at("weighting"), fitting::parse_weighting, "weighting");
  f.intercept = j.at("intercept").get<double>();
  f.slope = j.at("slope").get<double>();
  f.quadratic = j.at("quadratic").get<double>();
  f.se_intercept = j.at("se_intercept").get<double>();
  f.se_slope = j.at("se_slope").get<double>();
  f.se_quadratic = j.at("se_quadratic").get<double>();
  const json& cov = j.at("covariance");
  for (int r = 0; r < 3; ++r) {
    for (int c = 0; c < 3; ++c) f.covariance[r][c] = cov.at(r).at(c).get<double>();
  }
  f.r2 = j.at("r2").get<double>();
  f.r2_definition = j.at("r2_definition").get<std::string>();
  f.residual_sd = j.at("residual_sd").get<double>();
  f.sse = j.at("sse").get<double>();
  f.dof = j.at("dof").get<int>();
  f.n_points = j.at("n_points").get<int>();
  f.n_levels = j.at("n_levels").get<int>();
  f.range_low = j.at("range_low").get<double>();
  f.range_high = j.at("range_high").get<double>();
  const double inf = std::numeric_limits<double>::infinity();
  f.lod = number_from(j.at("lod"), inf);
  f.loq = number_from(j.at("loq"), inf);
  f.rf_mean = j.at("rf_mean").get<double>();
  f.rf_sd = j.at("rf_sd").get<double>();
  f.rf_rsd_pct = j.at("rf_rsd_pct").get<double>();
  f.xbar_w = j.at("xbar_w").get<double>();
  f.ybar_w = j.at("ybar_w").get<double>();
  f.sxx_w = j.at("sxx_w").get<double>();
  f.sum_raw_weights = j.at("sum_raw_weights").get<double>();
  f.sum_x2_w = j.at("sum_x2_w").get<double>();
  // Figures added after the first curves were stored: absent in those, which keep the limits
  // they were judged with (fitting::reporting_limits describes them).
  if (j.contains("lod_sigma")) f.lod_sigma = number_from(j.at("lod_sigma"), 0);
  if (j.contains("lod_slope")) f.lod_slope = number_from(j.at("lod_slope"), 0);
  if (j.contains("lod_definition")) f.lod_definition = j.at("lod_definition").get<std::string>();
  if (j.contains("din") && !j.at("din").is_null()) {
    const json& d = j.at("din");
    fitting::DinLimits din;
    din.parameters.alpha = d.at("alpha").get<double>();
    din.parameters.beta = d.at("beta").get<double>();
    din.parameters.k = d.at("k").get<double>();
    din.parameters.m = d.at("m").get<int>();
    din.dof = d.at("dof").get<int>();
    din.method_sd = d.at("method_sd").get<double>();
    din.critical_response = d.at("critical_response").get<double>();
    din.critical_value = d.at("critical_value").get<double>();
    din.detection_limit = d.at("detection_limit").get<double>();
    din.quantification_limit = optional_from<double>(d, "quantification_limit");
    din.iterations = d.at("iterations").get<int>();
    f.din = din;
  }
  if (j.contains("design") && !j.at("design").is_null()) {
    const json& d = j.at("design");
    fitting::ScaledDesign design;
    design.centre = d.at("centre").get<double>();
    design.scale = d.at("scale").get<double>();
    design.parameters = d.at("parameters").get<int>();
    for (int i = 0; i < 3; ++i) design.coefficients[i] = d.at("coefficients").at(i).get<double>();
    for (int r = 0; r < 3; ++r) {
      for (int c = 0; c < 3; ++c)
        design.r_inverse[r][c] = d.at("r_inverse").at(r).at(c).get<double>();
    }
    f.design = design;
  }
  if (j.contains("mandel") && !j.at("mandel").is_null()) {
    const json& m = j.at("mandel");
    f.mandel =
        fitting::MandelTest{m.at("s_y1").get<double>(),          m.at("s_y2").get<double>(),
                            m.at("ds2").get<double>(),           m.at("test_value").get<double>(),
                            m.at("f_critical_99").get<double>(), m.at("dof_quadratic").get<int>(),
                            m.at("linear_adequate").get<bool>()};
  }
  return f;
}

json acceptance_to_json(const fitting::Acceptance& a) {
  auto findings = [](const std::vector<fitting::CriterionFinding>& list) {
    json out = json::array();
    for (const auto& f : list) {
      out.push_back({{"criterion", fitting::to_string(f.criterion)},
                     {"detail", f.detail},
                     {"level", optional_to_json(f.level)},
                     {"value", number_or_null(f.value)},
                     {"limit", number_or_null(f.limit)}});
    }
    return out;
  };
  return {{"accepted", a.accepted},
          {"failures", findings(a.failures)},
          {"warnings", findings(a.warnings)}};
}

fitting::Acceptance acceptance_from_json(const json& j) {
  auto findings = [](const json& list) {
    std::vector<fitting::CriterionFinding> out;
    const double nan = std::numeric_limits<double>::quiet_NaN();
    for (const auto& f : list) {
      out.push_back(
          {token_from<fitting::Criterion>(f.at("criterion"), fitting::parse_criterion, "criterion"),
           f.at("detail").get<std::string>(), optional_from<std::string>(f, "level"),
           number_from(f.at("value"), nan), number_from(f.at("limit"), nan)});
    }
    return out;
  };
  fitting::Acceptance a;
  a.accepted = j.at("accepted").get<bool>();
  a.failures = findings(j.at("failures"));
  a.warnings = findings(j.at("warnings"));
  return a;
}

}  // namespace cw::store::sqlite

namespace cw::store::sqlite {

nlohmann::json parse_stored_json(const std::string& text, const std::string& where,
                                 const std::string& path) {
  try {
    return nlohmann::json::parse(text);
  } catch (const nlohmann::json::exception&) {
    damaged(path, where + " holds text that is not JSON");
  }
}

nlohmann::json column_mapping_to_json(const ColumnMapping& m) {
  nlohmann::json j = nlohmann::json::object();
  for (const auto& [name, header] : m) j[name] = header;
  return j;
}

ColumnMapping column_mapping_from_json(const nlohmann::json& j, const std::string& where,
                                       const std::string& path) {
  if (!j.is_object()) damaged(path, where + " is not a JSON object");
  ColumnMapping m;
  for (const auto& [name, header] : j.items()) {
    if (!header.is_string()) damaged(path, where + " maps '" + name + "' to something not text");
    m.emplace_back(name, header.get<std::string>());
  }
  return m;
}

void throw_unknown_token(const std::string& text, const std::string& where,
                         const std::string& path) {
  damaged(path, where + " holds the unknown value '" + text + "'");
}

Instant stored_instant(const std::string& text, const std::string& where, const std::string& path) {
  try {
    return parse_instant(text, "stored time");
  } catch (const ValidationError&) {
    damaged(path, where + " holds the time '" + text + "', which does not parse");
  }
}

CalendarDate stored_date(const std::string& text, const std::string& where,
                         const std::string& path) {
  try {
    return parse_date(text, "stored date");
  } catch (const ValidationError&) {
    damaged(path, where + " holds the date '" + text + "', which does not parse");
  }
}

std::string uncertainty_json(const ResultUncertainty& u) {
  // Written as nlohmann's dump of {"combined", "components": [{"relative_u", "source"}],
  // "expanded", "k"} writes it (the text every stored budget has).
  std::string out = "{\"combined\":";
  audit::append_json_real(out, u.combined);
  out += ",\"components\":[";
  for (std::size_t i = 0; i < u.components.size(); ++i) {
    if (i > 0) out += ',';
    out += "{\"relative_u\":";
    audit::append_json_real(out, u.components[i].relative_u);
    out += ",\"source\":";
    audit::append_json_string(out, u.components[i].source);
    out += '}';
  }
  out += "],\"expanded\":";
  audit::append_json_real(out, u.expanded);
  out += ",\"k\":";
  audit::append_json_real(out, u.k);
  out += '}';
  return out;
}

}  // namespace cw::store::sqlite
