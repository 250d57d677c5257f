// SPDX-License-Identifier: Apache-2.0
// Shared set-up for the scenario tests: the Lab helpers and the reference data sets.
#include "scenario_support.h"

#include <algorithm>
#include <catch2/catch.hpp>

namespace cw::scenario {

std::string MethodSpec::toml() const {
  std::string t = "code = \"" + code + "\"\ntitle = \"" + title + "\"\nunit = \"" + unit + "\"\n";
  t += "analytes = [";
  for (std::size_t i = 0; i < analytes.size(); ++i)
    t += (i ? ", " : "") + std::string("\"") + analytes[i] + "\"";
  t += "]\n";
  if (internal_standard) t += "internal_standard = \"" + *internal_standard + "\"\n";
  t += "\n[calibration]\nmodel = \"" + model + "\"\nweighting = \"" + weighting + "\"\n";
  t += "min_levels = " + std::to_string(min_levels) + "\n";
  if (min_r2) t += "min_r2 = " + *min_r2 + "\n";
  if (max_error_pct) t += "max_error_pct = " + *max_error_pct + "\n";
  if (max_error_pct_lowest) t += "max_error_pct_lowest = " + *max_error_pct_lowest + "\n";
  if (min_levels_within) t += "min_levels_within = " + *min_levels_within + "\n";
  t += "valid_for = \"" + valid_for + "\"\n";
  t += std::string("review_required = ") + (review_required ? "true" : "false") + "\n";
  if (limits) t += "limits = \"" + *limits + "\"\n";
  if (report_limit) t += "report_limit = \"" + *report_limit + "\"\n";
  t += "\n[check]\ntolerance_pct = " + tolerance_pct + "\n";
  if (samples_per_check) t += "samples_per_check = " + *samples_per_check + "\n";
  if (check_every) t += "check_every = \"" + *check_every + "\"\n";
  if (blank_limit) t += "blank_limit = " + *blank_limit + "\n";
  if (!trend_rules.empty()) {
    t += "trend_rules = [";
    for (std::size_t i = 0; i < trend_rules.size(); ++i)
      t += (i ? ", " : "") + std::string("\"") + trend_rules[i] + "\"";
    t += "]\n";
  }
  if (trend_mean) t += "trend_mean = " + *trend_mean + "\n";
  if (trend_sd) t += "trend_sd = " + *trend_sd + "\n";
  if (dilution_pct) t += "\n[uncertainty]\ndilution_pct = " + *dilution_pct + "\n";
  return t;
}

Lab::Lab(const std::string& zone, const std::string& setup_at) : setup_at_(setup_at) {
  box.now = setup_at;
  const RunResult r = box.run({"init", "--lab", "Scenario lab", "--tz", zone});
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
  for (const char* reviewer : {"bob", "carol"}) {
    const RunResult added = box.add_user(reviewer, "reviewer");
    INFO(added.describe());
    REQUIRE(added.exit_code == 0);
  }
}

RunResult Lab::run(const std::vector<std::string>& args) const {
  return box.run(args);
}

RunResult Lab::run_at(const std::string& at, const std::vector<std::string>& args) const {
  std::vector<std::string> full{"--json", "--at", at};
  full.insert(full.end(), args.begin(), args.end());
  // The event is recorded when it happens: "now" is the event's time, not a back-dating.
  return box.run(full, {{"CURVEWARDEN_NOW", at}});
}

Json Lab::json_at(const std::string& at, const std::vector<std::string>& args,
                  int expected_exit) const {
  const RunResult r = run_at(at, args);
  INFO(r.describe());
  REQUIRE(r.exit_code == expected_exit);
  return r.json();
}

void Lab::add_instrument(const std::string& code) const {
  json_at(setup_at_, {"instrument", "add", code, "--name", "Ion chromatograph " + code});
}

void Lab::add_method(const MethodSpec& spec) const {
  const auto file =
      box.write_file("method-" + std::to_string(++file_counter_) + ".toml", spec.toml());
  json_at(setup_at_, {"method", "add", file.string()});
}

void Lab::revise_method(const MethodSpec& spec, const std::string& at) const {
  const auto file =
      box.write_file("method-" + std::to_string(++file_counter_) + ".toml", spec.toml());
  json_at(at, {"method", "revise", file.string(), "--reason", "tighter acceptance limits"});
}

void Lab::add_lot(const std::string& code, const std::string& expires,
                  const std::vector<std::string>& values) const {
  std::vector<std::string> args{"lot",       "add",  code, "--material", "Anion standard 1000 mg/L",
                                "--expires", expires};
  for (const auto& v : values) {
    args.push_back("--value");
    args.push_back(v);
  }
  json_at(setup_at_, args);
}

Json Lab::log_curve(const std::string& method, const std::string& instrument,
                    const std::string& lots, const std::string& csv, const std::string& at,
                    int expected_exit) const {
  const auto file =
      box.write_file("points-" + std::to_string(++file_counter_) + ".csv", csv).string();
  return json_at(at,
                 {"curve", "log", "--method", method, "--instrument", instrument, "--lot", lots,
                  "--points", file},
                 expected_exit);
}

Json Lab::show_curve(std::int64_t id, const std::string& at) const {
  return json_at(at, {"curve", "show", std::to_string(id)});
}

std::map<std::string, std::int64_t> Lab::counts() const {
  return cw::test::table_row_counts(box);
}

std::string Lab::sql(const std::string& query) const {
  return cw::test::query_text(box, query);
}

std::vector<std::string> sorted_reasons(const Json& reasons) {
  std::vector<std::string> out = strings(reasons);
  std::sort(out.begin(), out.end());
  return out;
}

std::vector<std::string> strings(const Json& j) {
  std::vector<std::string> out;
  for (const auto& e : j) out.push_back(e.get<std::string>());
  return out;
}

std::vector<std::int64_t> ids(const Json& array, const std::string& key) {
  std::vector<std::int64_t> out;
  for (const auto& e : array) out.push_back(e.at(key).get<std::int64_t>());
  return out;
}

std::string m1_rows(const std::string& analyte) {
  // calibration-practice.md §9 M1 (Miller & Miller, ch. 5 fluorescence example).
  const double x[] = {0, 2, 4, 6, 8, 10, 12};
  const char* y[] = {"2.1", "5.0", "9.0", "12.6", "17.3", "21.0", "24.7"};
  std::string rows;
  for (int i = 0; i < 7; ++i) {
    rows += analyte + ",L" + std::to_string(i) + "," + std::to_string(static_cast<int>(x[i])) +
            "," + y[i] + ",1,\n";
  }
  return rows;
}

std::string duplicate_sulfate_rows() {
  return "sulfate,S1,2,7.1,1,\n"
         "sulfate,S1,2,6.9,2,\n"
         "sulfate,S2,4,13.2,1,\n"
         "sulfate,S2,4,13.5,2,\n"
         "sulfate,S3,6,19.6,1,\n"
         "sulfate,S3,6,19.2,2,\n"
         "sulfate,S4,8,25.9,1,\n"
         "sulfate,S4,8,25.4,2,\n"
         "sulfate,S5,10,31.6,1,\n"
         "sulfate,S5,10,32.3,2,\n"
         "sulfate,S6,12,38.1,1,\n"
         "sulfate,S6,12,37.6,2,\n";
}

}  // namespace cw::scenario
