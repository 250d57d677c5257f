// SPDX-License-Identifier: Apache-2.0
// Shared set-up for the scenario tests: a lab in a sandbox, method files built from a spec,
// and the reference data sets whose expected numbers the tests check.
//
// Overview. A `Lab` owns one cw::test::Sandbox (temporary directory, pinned environment) and
// runs the real binary. Its helpers register instruments, methods and lots and log
// calibrations, each REQUIREing the exit code it expects, so a scenario reads as the lab's
// day. Store checks go through the harness's backend-neutral helpers (table_row_counts,
// query_text on the sandbox: SQLite's C API or libpq), never through the tool's own store layer.
#pragma once

#include <cstdint>
#include <map>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "harness.h"

namespace cw::scenario {

using Json = nlohmann::json;
using cw::test::RunResult;

/// A method file (product.md §6) built from its settings; the defaults are an unweighted
/// linear method for nitrate and sulfate in mg/L that does not require review and has no
/// check interval, so a logged curve is active at once and stays so for 7 days.
struct MethodSpec {
  std::string code = "ANION-IC";
  std::string title = "Nitrate and sulfate in drinking water by ion chromatography";
  std::string unit = "mg/L";
  std::vector<std::string> analytes = {"nitrate", "sulfate"};
  std::optional<std::string> internal_standard;
  std::string model = "linear";
  std::string weighting = "none";
  int min_levels = 5;
  std::optional<std::string> min_r2 = "0.995";
  std::optional<std::string> max_error_pct = "15.0";
  std::optional<std::string> max_error_pct_lowest = "20.0";
  std::optional<std::string> min_levels_within = "0.75";
  std::string valid_for = "7 days";
  bool review_required = false;
  std::string tolerance_pct = "10.0";
  std::optional<std::string> check_every;
  std::optional<std::string> blank_limit;
  std::optional<std::string> limits;        ///< [calibration] limits: ich-q2 | din-32645
  std::optional<std::string> report_limit;  ///< [calibration] report_limit
  std::optional<std::string> dilution_pct;  ///< [uncertainty] dilution_pct
  std::optional<std::string> samples_per_check = "10";
  std::vector<std::string> trend_rules;   ///< e.g. {"2-2s", "1-3s"}
  std::optional<std::string> trend_mean;  ///< with trend_sd: established control limits
  std::optional<std::string> trend_sd;

  std::string toml() const;
};

/// One test's laboratory: a sandbox with a store initialised in `zone`.
class Lab {
 public:
  /// When the registries of a default lab are set up: well before the scenarios' days.
  static constexpr const char* kSetupAt = "2026-02-01T08:00:00Z";

  /// Creates the store (`init --tz zone`, which makes the sandbox's user "alice" its admin) at
  /// `setup_at`, registers the reviewers "bob" and "carol", and leaves `box.now` there.
  explicit Lab(const std::string& zone = "UTC", const std::string& setup_at = kSetupAt);

  cw::test::Sandbox box;

  /// Runs the binary with `args` (exactly as given).
  RunResult run(const std::vector<std::string>& args) const;
  /// Runs `args` with `--at at` (and `--json`) prepended as global options.
  RunResult run_at(const std::string& at, const std::vector<std::string>& args) const;
  /// Like run_at, and REQUIREs `expected_exit`; returns stdout parsed as JSON.
  Json json_at(const std::string& at, const std::vector<std::string>& args,
               int expected_exit = 0) const;

  /// `instrument add CODE` at the set-up time.
  void add_instrument(const std::string& code) const;
  /// Writes the method file and runs `method add` at the set-up time.
  void add_method(const MethodSpec& spec) const;
  /// Writes the method file and runs `method revise --reason ...` at `at`.
  void revise_method(const MethodSpec& spec, const std::string& at) const;
  /// `lot add CODE --material ... --expires DATE --value A=V ...` at the set-up time.
  void add_lot(const std::string& code, const std::string& expires,
               const std::vector<std::string>& values = {"nitrate=1000", "sulfate=1000"}) const;

  /// Writes `csv` to a points file and runs `curve log` at `at`; REQUIREs `expected_exit`
  /// and returns the JSON document.
  Json log_curve(const std::string& method, const std::string& instrument, const std::string& lots,
                 const std::string& csv, const std::string& at, int expected_exit = 0) const;

  /// `curve show ID --json` at `at`.
  Json show_curve(std::int64_t id, const std::string& at) const;

  /// Row counts of every table of the store.
  std::map<std::string, std::int64_t> counts() const;
  /// The single value of a one-row, one-column query on the store ("" for NULL).
  std::string sql(const std::string& query) const;

 private:
  std::string setup_at_;
  mutable int file_counter_ = 0;
};

/// The `reasons` array of a curve or result as a sorted list (the contract does not fix the
/// order in which several reasons are listed).
std::vector<std::string> sorted_reasons(const Json& reasons);

/// The JSON array of strings `j` as a vector, in its order.
std::vector<std::string> strings(const Json& j);

/// The ids (`key` of every element) of a JSON array, in its order.
std::vector<std::int64_t> ids(const Json& array, const std::string& key = "id");

// ---- reference data ---------------------------------------------------------------------

/// Miller & Miller, Statistics and Chemometrics for Analytical Chemistry, ch. 5 fluorescence
/// example, as reproduced in calibration-practice.md §9 M1: x (pg/mL) = 0, 2, ..., 12 and
/// y = 2.1, 5.0, 9.0, 12.6, 17.3, 21.0, 24.7, as points-file rows for `analyte` (levels L0 ..
/// L6, replicate 1). The expected values below are the brief's exact [C] values.
std::string m1_rows(const std::string& analyte = "nitrate");
namespace m1 {
inline constexpr double kSlope = 1.930357143;        // 1081/560
inline constexpr double kIntercept = 1.517857143;    // 85/56
inline constexpr double kResidualSd = 0.4328477132;  // s_y/x
inline constexpr double kSeSlope = 0.04090026446;
inline constexpr double kSeIntercept = 0.2949360014;
inline constexpr double kR2 = 0.9977603861;
inline constexpr double kLod = 0.7399653784;  // ICH 3.3 s_y/x / b
inline constexpr double kLoq = 2.242319329;   // ICH 10 s_y/x / b
}  // namespace m1

/// An invented sulfate calibration with duplicates: levels S1..S6 at 2, 4, ..., 12 mg/L, two
/// replicates each. Expected values computed with exact fractions (Python's fractions module,
/// the two-pass formulas of calibration-practice.md §1.1) when this test was written.
std::string duplicate_sulfate_rows();
namespace sulfate {
inline constexpr double kSlope = 3.09;
inline constexpr double kIntercept = 0.9033333333;
inline constexpr double kResidualSd = 0.2743477112;
inline constexpr double kSeSlope = 0.02318661354;
inline constexpr double kSeIntercept = 0.1805977728;
inline constexpr double kR2 = 0.999437253;
inline constexpr double kLod = 0.2929927013;
inline constexpr double kLoq = 0.8878566707;
}  // namespace sulfate

/// The header every points file of these tests uses.
inline constexpr const char* kPointsHeader = "analyte,level,nominal,response,replicate,exclude\n";

}  // namespace cw::scenario
