// SPDX-License-Identifier: Apache-2.0
// Method-file validation with toml++: known keys only, typed values, ranges, and the
// location of every problem.
#include "import/method_file.h"

#include <toml++/toml.h>
#include <set>

#include "audit/sha256.h"
#include "core/clean_text.h"
#include "core/error.h"
#include "core/text.h"
#include "import/input_file.h"

namespace cw::import {
namespace {

const std::set<std::string> kWestgardRules = {"1-2s", "1-3s", "2-2s", "R-4s", "4-1s", "10-x"};

/// Walks one TOML table, reporting problems with file, line and dotted key.
class TableReader {
 public:
  TableReader(const std::string& file, const toml::table& table, std::string prefix)
      : file_(file), table_(table), prefix_(std::move(prefix)) {}

  /// Refuses keys outside `allowed`.
  void allow_only(const std::set<std::string>& allowed) const {
    for (auto&& [key, node] : table_) {
      const std::string name(key.str());
      if (!allowed.count(name)) {
        std::string list;
        for (const auto& a : allowed) list += (list.empty() ? "" : ", ") + a;
        fail(node, name, "unknown key " + quote(dotted(name)),
             "keys allowed here: " + list + " (see the method file layout in the README)");
      }
    }
  }

  const toml::node* find(const std::string& key) const { return table_.get(key); }

  std::string required_string(const std::string& key) const {
    const auto* node = require(key);
    return string_of(*node, key);
  }

  std::optional<std::string> optional_string(const std::string& key) const {
    const auto* node = find(key);
    if (!node) return std::nullopt;
    return string_of(*node, key);
  }

  std::optional<double> optional_number(const std::string& key, double low, double high,
                                        bool low_inclusive, const std::string& range_text) const {
    const auto* node = find(key);
    if (!node) return std::nullopt;
    double value = 0;
    if (auto i = node->as_integer()) {
      value = static_cast<double>(i->get());
    } else if (auto f = node->as_floating_point()) {
      value = f->get();
    } else {
      fail(*node, key, "key " + quote(dotted(key)) + " must be a number, got " + type_of(*node));
    }
    if (!std::isfinite(value) || value > high || value < low || (!low_inclusive && value == low)) {
      fail(
          *node, key,
          "key " + quote(dotted(key)) + " must be " + range_text + ", got " + format_sig(value, 8));
    }
    return value;
  }

  std::optional<long> optional_integer(const std::string& key, long low, long high) const {
    const auto* node = find(key);
    if (!node) return std::nullopt;
    auto i = node->as_integer();
    if (!i) {
      fail(*node, key,
           "key " + quote(dotted(key)) + " must be a whole number, got " + type_of(*node));
    }
    if (i->get() < low || i->get() > high) {
      fail(*node, key,
           "key " + quote(dotted(key)) + " must be a whole number from " + std::to_string(low) +
               " to " + std::to_string(high) + ", got " + std::to_string(i->get()));
    }
    return static_cast<long>(i->get());
  }

  std::optional<bool> optional_bool(const std::string& key) const {
    const auto* node = find(key);
    if (!node) return std::nullopt;
    auto b = node->as_boolean();
    if (!b)
      fail(*node, key,
           "key " + quote(dotted(key)) + " must be true or false, got " + type_of(*node));
    return b->get();
  }

  std::optional<Duration> optional_duration(const std::string& key) const {
    const auto* node = find(key);
    if (!node) return std::nullopt;
    const std::string text = string_of(*node, key);
    try {
      return parse_duration(text, "duration");
    } catch (const ValidationError& e) {
      fail(*node, key, "key " + quote(dotted(key)) + ": " + e.what(), e.hint());
    }
  }

  std::vector<std::string> string_array(const std::string& key, bool required) const {
    const auto* node = required ? require(key) : find(key);
    if (!node) return {};
    const auto* array = node->as_array();
    if (!array)
      fail(*node, key,
           "key " + quote(dotted(key)) + " must be a list of strings, got " + type_of(*node));
    std::vector<std::string> out;
    for (const auto& element : *array) {
      auto s = element.as_string();
      if (!s) {
        fail(element, key,
             "key " + quote(dotted(key)) + " must hold only strings, got " + type_of(element));
      }
      out.push_back(s->get());
    }
    return out;
  }

  const toml::table* required_table(const std::string& key) const {
    const auto* node = require(key);
    const auto* t = node->as_table();
    if (!t)
      fail(*node, key, "key " + quote(dotted(key)) + " must be a table ([" + dotted(key) + "])");
    return t;
  }

  [[noreturn]] void fail(const toml::node& node, const std::string& key, const std::string& message,
                         std::string hint = {}) const {
    SourceLocation where;
    where.file = file_;
    where.line = static_cast<long>(node.source().begin.line);
    where.column = static_cast<long>(node.source().begin.column);
    where.field = dotted(key);
    throw ValidationError(where, message, std::move(hint));
  }

  [[noreturn]] void fail_missing(const std::string& key) const {
    SourceLocation where;
    where.file = file_;
    if (table_.source().begin.line > 0) where.line = static_cast<long>(table_.source().begin.line);
    where.field = dotted(key);
    throw ValidationError(where, "missing key " + quote(dotted(key)),
                          "every method file needs code, title, unit, analytes, "
                          "[calibration] model, weighting, min_levels, valid_for and "
                          "[check] tolerance_pct");
  }

  std::string dotted(const std::string& key) const {
    return prefix_.empty() ? key : prefix_ + "." + key;
  }

 private:
  const toml::node* require(const std::string& key) const {
    const auto* node = find(key);
    if (!node) fail_missing(key);
    return node;
  }

  std::string string_of(const toml::node& node, const std::string& key) const {
    auto s = node.as_string();
    if (!s)
      fail(node, key, "key " + quote(dotted(key)) + " must be a string, got " + type_of(node));
    return s->get();
  }

  static std::string type_of(const toml::node& node) {
    switch (node.type()) {
      case toml::node_type::string:
        return "a string";
      case toml::node_type::integer:
        return "a whole number";
      case toml::node_type::floating_point:
        return "a number";
      case toml::node_type::boolean:
        return "true/false";
      case toml::node_type::array:
        return "a list";
      case toml::node_type::table:
        return "a table";
      default:
        return "a date or time";
    }
  }

  const std::string& file_;
  const toml::table& table_;
  std::string prefix_;
};

CalibrationRules read_calibration(const TableReader& r) {
  r.allow_only({"model", "weighting", "min_levels", "min_r2", "max_error_pct",
                "max_error_pct_lowest", "min_levels_within", "max_rf_rsd_pct", "valid_for",
                "review_required", "limits", "report_limit"});
  CalibrationRules c;
  const std::string model = r.required_string("model");
  if (auto m = fitting::parse_model(model)) {
    c.model = *m;
  } else {
    r.fail(*r.find("model"), "model",
           "key " + quote(r.dotted("model")) + " has unknown model " + quote(model),
           "use linear, linear-through-origin, quadratic or mean-response-factor");
  }
  const std::string weighting = r.required_string("weighting");
  if (auto w = fitting::parse_weighting(weighting)) {
    c.weighting = *w;
  } else {
    r.fail(*r.find("weighting"), "weighting",
           "key " + quote(r.dotted("weighting")) + " has unknown weighting " + quote(weighting),
           "use none, 1/x, 1/x^2, 1/y or 1/y^2");
  }
  if (c.model == fitting::Model::MeanResponseFactor && c.weighting != fitting::Weighting::None) {
    r.fail(*r.find("weighting"), "weighting",
           "key " + quote(r.dotted("weighting")) +
               " must be 'none' for the mean-response-factor model (a mean of response factors "
               "is not weighted)");
  }
  if (!r.find("min_levels")) r.fail_missing("min_levels");
  c.min_levels = static_cast<int>(*r.optional_integer("min_levels", 1, 1000));
  const int needed = fitting::min_levels_to_fit(c.model);
  if (c.min_levels < needed) {
    r.fail(*r.find("min_levels"), "min_levels",
           "key " + quote(r.dotted("min_levels")) + " is " + std::to_string(c.min_levels) +
               ", but the " + std::string(fitting::to_string(c.model)) + " model needs at least " +
               std::to_string(needed) + " levels to be fitted with a residual degree of freedom");
  }
  c.min_r2 = r.optional_number("min_r2", 0.0, 1.0, false, "greater than 0 and at most 1");
  c.max_error_pct = r.optional_number("max_error_pct", 0.0, 1000.0, false, "a percentage above 0");
  c.max_error_pct_lowest =
      r.optional_number("max_error_pct_lowest", 0.0, 1000.0, false, "a percentage above 0");
  if (c.max_error_pct_lowest && !c.max_error_pct) {
    r.fail(*r.find("max_error_pct_lowest"), "max_error_pct_lowest",
           "key " + quote(r.dotted("max_error_pct_lowest")) + " needs max_error_pct as well");
  }
  c.min_levels_within =
      r.optional_number("min_levels_within", 0.0, 1.0, false, "a fraction above 0 and at most 1");
  if (c.min_levels_within && !c.max_error_pct) {
    r.fail(*r.find("min_levels_within"), "min_levels_within",
           "key " + quote(r.dotted("min_levels_within")) + " needs max_error_pct as well");
  }
  c.max_rf_rsd_pct =
      r.optional_number("max_rf_rsd_pct", 0.0, 1000.0, false, "a percentage above 0");
  auto valid_for = r.optional_duration("valid_for");
  if (!valid_for) r.fail_missing("valid_for");
  c.valid_for = *valid_for;
  c.review_required = r.optional_bool("review_required").value_or(true);
  if (auto limits = r.optional_string("limits")) {
    if (auto d = fitting::parse_limit_definition(*limits)) {
      c.limits = *d;
    } else {
      r.fail(*r.find("limits"), "limits",
             "key " + quote(r.dotted("limits")) + " has unknown definition " + quote(*limits),
             "use ich-q2 (ICH Q2: 3.3σ/S and 10σ/S) or din-32645 (DIN 32645 calibration method)");
    }
    if (c.limits == fitting::LimitDefinition::Din32645 &&
        (c.model != fitting::Model::Linear || c.weighting != fitting::Weighting::None)) {
      r.fail(*r.find("limits"), "limits",
             "key " + quote(r.dotted("limits")) +
                 ": the DIN 32645 calibration method applies to an unweighted straight line "
                 "(model linear, weighting none)",
             "use ich-q2 with this model and weighting");
    }
  }
  if (auto limit = r.optional_string("report_limit")) {
    if (auto v = parse_report_limit(*limit)) {
      c.report_limit = *v;
    } else {
      r.fail(*r.find("report_limit"), "report_limit",
             "key " + quote(r.dotted("report_limit")) + " has unknown value " + quote(*limit),
             "use lowest-calibrator (the default), loq or lod");
    }
  }
  return c;
}

UncertaintyRules read_uncertainty(const TableReader& r) {
  r.allow_only({"dilution_pct"});
  UncertaintyRules u;
  u.dilution_pct =
      r.optional_number("dilution_pct", 0.0, 100.0, false, "a percentage above 0 and at most 100");
  return u;
}

CheckRules read_check(const TableReader& r) {
  r.allow_only({"tolerance_pct", "samples_per_check", "check_every", "trend_rules", "blank_limit",
                "trend_mean", "trend_sd"});
  CheckRules c;
  auto tolerance =
      r.optional_number("tolerance_pct", 0.0, 100.0, false, "a percentage above 0 and at most 100");
  if (!tolerance) r.fail_missing("tolerance_pct");
  c.tolerance_pct = *tolerance;
  if (auto n = r.optional_integer("samples_per_check", 1, 100000))
    c.samples_per_check = static_cast<int>(*n);
  c.check_every = r.optional_duration("check_every");
  c.trend_rules = r.string_array("trend_rules", false);
  std::set<std::string> seen;
  for (const auto& rule : c.trend_rules) {
    if (!kWestgardRules.count(rule)) {
      r.fail(*r.find("trend_rules"), "trend_rules",
             "key " + quote(r.dotted("trend_rules")) + " has unknown rule " + quote(rule),
             "use the Westgard rules 1-2s, 1-3s, 2-2s, R-4s, 4-1s, 10-x");
    }
    if (!seen.insert(rule).second) {
      r.fail(*r.find("trend_rules"), "trend_rules",
             "key " + quote(r.dotted("trend_rules")) + " lists " + quote(rule) + " twice");
    }
  }
  c.blank_limit = r.optional_number("blank_limit", 0.0, 1e300, true, "zero or more");
  // Established control limits of the recovery (calibration-practice.md §8.2: z is taken from
  // the limits set for the control material, not from a running mean).
  c.trend_mean = r.optional_number("trend_mean", 0.0, 1000.0, false,
                                   "a recovery in percent above 0 and at most 1000");
  c.trend_sd = r.optional_number("trend_sd", 0.0, 100.0, false,
                                 "a standard deviation in percent above 0 and at most 100");
  if (c.trend_mean.has_value() != c.trend_sd.has_value()) {
    const std::string given = c.trend_mean ? "trend_mean" : "trend_sd";
    const std::string missing = c.trend_mean ? "trend_sd" : "trend_mean";
    r.fail(*r.find(given), given,
           "key " + quote(r.dotted(given)) + " needs " + quote(r.dotted(missing)) + " as well",
           "give the established mean and standard deviation of the recovery together, or "
           "neither (the limits then come from the last 20 passing checks)");
  }
  return c;
}

}  // namespace

MethodFile parse_method_text(const std::string& file_name, const std::string& text) {
  toml::table root;
  try {
    root = toml::parse(text, file_name);
  } catch (const toml::parse_error& e) {
    SourceLocation where;
    where.file = file_name;
    where.line = static_cast<long>(e.source().begin.line);
    where.column = static_cast<long>(e.source().begin.column);
    throw ValidationError(where, "not valid TOML: " + std::string(e.description()),
                          "see the method file layout in the README");
  }
  TableReader top(file_name, root, "");
  top.allow_only({"code", "title", "unit", "analytes", "internal_standard", "calibration", "check",
                  "uncertainty"});

  MethodDefinition d;
  d.code = top.required_string("code");
  try {
    check_code(d.code, "method code");
  } catch (const ValidationError& e) {
    top.fail(*top.find("code"), "code", e.what(), e.hint());
  }
  const std::string title = top.required_string("title");
  try {
    d.title = clean_text(title, "key 'title'", kMaxNameChars);
  } catch (const ValidationError& e) {
    top.fail(*top.find("title"), "title", e.what(), e.hint());
  }
  const std::string unit = top.required_string("unit");
  try {
    d.unit = clean_text(unit, "key 'unit'", kMaxLabelChars);
  } catch (const ValidationError& e) {
    top.fail(*top.find("unit"), "unit", e.what(), e.hint());
  }
  d.analytes = top.string_array("analytes", true);
  if (d.analytes.empty())
    top.fail(*top.find("analytes"), "analytes", "key 'analytes' is an empty list");
  std::set<std::string> seen;
  for (const auto& a : d.analytes) {
    try {
      check_analyte_name(a, "analyte");
    } catch (const ValidationError& e) {
      top.fail(*top.find("analytes"), "analytes", e.what(), e.hint());
    }
    if (!seen.insert(a).second) {
      top.fail(*top.find("analytes"), "analytes", "key 'analytes' lists " + quote(a) + " twice");
    }
  }
  d.internal_standard = top.optional_string("internal_standard");
  if (d.internal_standard) {
    try {
      check_analyte_name(*d.internal_standard, "internal standard");
    } catch (const ValidationError& e) {
      top.fail(*top.find("internal_standard"), "internal_standard", e.what(), e.hint());
    }
    if (seen.count(*d.internal_standard)) {
      top.fail(
          *top.find("internal_standard"), "internal_standard",
          "the internal standard " + quote(*d.internal_standard) + " is also listed as an analyte");
    }
  }
  d.calibration =
      read_calibration(TableReader(file_name, *top.required_table("calibration"), "calibration"));
  d.check = read_check(TableReader(file_name, *top.required_table("check"), "check"));
  if (top.find("uncertainty")) {
    d.uncertainty =
        read_uncertainty(TableReader(file_name, *top.required_table("uncertainty"), "uncertainty"));
  }

  MethodFile out;
  out.definition = std::move(d);
  out.file_name = file_name;
  out.text = text;
  out.sha256 = audit::sha256_hex(text);
  return out;
}

MethodFile read_method_file(const std::string& path) {
  return parse_method_text(recorded_name(path),
                           read_text_file(path, kMaxMethodFileBytes, "method file"));
}

}  // namespace cw::import
