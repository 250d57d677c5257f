// SPDX-License-Identifier: Apache-2.0
// Numbers a metrologist signs: results below the reporting limit are censored ("< limit", never a
// bare or negative number, on every weighting and in every view), every reported value carries its
// uncertainty budget (Eurachem/CITAC QUAM 3rd ed. 2012, example A5 as recomputed in
// calibration-practice.md §9 M4), DIN 32645 limits are reported when the method chooses them
// (§9 M1), and printed figures never contradict their verdict.
#include <catch2/catch.hpp>
#include <cmath>
#include <regex>
#include <string>

#include "scenario_support.h"

using namespace cw::scenario;

namespace {

constexpr const char* kAt = "2026-03-02T09:00:00Z";
constexpr const char* kLater = "2026-03-02T10:00:00Z";

/// Nitrate at 1, 2, 5, 10 and 20 mg/L, responses about 0.1·x + 0.02 (invented, positive).
std::string nitrate_points() {
  return std::string(kPointsHeader) +
         "nitrate,N1,1,0.119,1,\nnitrate,N2,2,0.221,1,\nnitrate,N3,5,0.518,1,\n"
         "nitrate,N4,10,1.023,1,\nnitrate,N5,20,2.019,1,\n";
}

MethodSpec nitrate_method(const std::string& code, const std::string& weighting) {
  MethodSpec m;
  m.code = code;
  m.analytes = {"nitrate"};
  m.weighting = weighting;
  return m;
}

Json quantify_at(const Lab& lab, std::vector<std::string> args, int exit = 0) {
  args.insert(args.begin(), "quantify");
  return lab.json_at(kLater, args, exit);
}

}  // namespace

TEST_CASE("censoring: a zero response is censored, not refused, on every weighting", "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  int i = 0;
  for (const char* weighting : {"none", "1/x", "1/x^2", "1/y", "1/y^2"}) {
    DYNAMIC_SECTION("weighting " << weighting) {
      const std::string code = "NO3-" + std::to_string(++i);
      lab.add_method(nitrate_method(code, weighting));
      const Json logged = lab.log_curve(code, "IC-01", "CRM-A", nitrate_points(), kAt);
      const std::string curve = std::to_string(logged.at("curves")[0].at("id").get<int>());
      // A blank: zero response. Under 1/x it has no interval (the weight at 0 is undefined),
      // and yet it is a result: below the lowest calibrator (1 mg/L).
      const Json blank =
          quantify_at(lab, {"--curve", curve, "--response", "0", "--sample", "BLANK"});
      CHECK(blank.at("status") == "reported");
      CHECK(blank.at("censored") == "<");
      CHECK(blank.at("concentration").is_null());
      CHECK(blank.at("ci_low").is_null());
      CHECK(blank.at("x0").is_null());
      CHECK(blank.at("reporting_limit").get<double>() == 1.0);
      CHECK(blank.at("report_as") == "< 1 mg/L");
      // Diluted fivefold, the limit is five times higher.
      const Json diluted = quantify_at(
          lab, {"--curve", curve, "--response", "0", "--dilution", "5", "--sample", "BLANK-5"});
      CHECK(diluted.at("reporting_limit").get<double>() == 5.0);
      CHECK(diluted.at("report_as") == "< 5 mg/L");
      // Below the intercept the estimate is negative: kept for the record, never released.
      const Json negative =
          quantify_at(lab, {"--curve", curve, "--response", "0.001", "--sample", "LOW"});
      CHECK(negative.at("censored") == "<");
      CHECK(negative.at("concentration").is_null());
      REQUIRE(negative.at("computed_concentration").is_number());
      CHECK(negative.at("computed_concentration").get<double>() < 0);
    }
  }
}

TEST_CASE("censoring: no view or export shows a censored result as a number", "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(nitrate_method("ANION-IC", "1/x"));
  const Json logged = lab.log_curve("ANION-IC", "IC-01", "CRM-A", nitrate_points(), kAt);
  const std::string curve = std::to_string(logged.at("curves")[0].at("id").get<int>());
  // 0.07 reads (0.07 - a)/b ≈ 0.5 mg/L: half the lowest calibrator.
  const Json q = quantify_at(lab, {"--curve", curve, "--response", "0.07", "--sample", "W-9"});
  REQUIRE(q.at("censored") == "<");
  const double computed = q.at("computed_concentration").get<double>();
  const std::string id = std::to_string(q.at("result_id").get<int>());
  // The computed value printed to three or four figures, as a view would print a number.
  const std::regex bare("0\\.4[0-9]|0\\.5[0-9]");
  REQUIRE(std::regex_search(std::to_string(computed), bare));

  const auto text_of = [&](std::vector<std::string> args) {
    args.insert(args.begin(), {"--at", kLater});
    const auto r = lab.run(args);
    INFO(r.describe());
    REQUIRE(r.exit_code == 0);
    return r.out;
  };
  for (const auto& args :
       std::vector<std::vector<std::string>>{{"trace", "result", id},
                                             {"trace", "curve", curve},
                                             {"trace", "lot", "CRM-A"},
                                             {"trace", "lot", "CRM-A", "--csv"}}) {
    INFO(args[0] << " " << args[1]);
    const std::string out = text_of(args);
    CHECK_THAT(out, Catch::Contains("< 1"));
    CHECK_FALSE(std::regex_search(out, bare));
  }
  const Json trace = lab.json_at(kLater, {"trace", "result", id});
  CHECK(trace.at("result").at("concentration").is_null());
  CHECK(trace.at("result").at("censored") == "<");
  CHECK(trace.at("result").at("reporting_limit").get<double>() == 1.0);
  const Json lot = lab.json_at(kLater, {"trace", "lot", "CRM-A"});
  CHECK(lot.at("results")[0].at("concentration").is_null());
  CHECK(lot.at("results")[0].at("censored") == "<");
}

TEST_CASE("censoring: a method may report down to its LOQ, and the release limit moves with it",
          "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec m;  // unweighted M1 (§9 M1): lowest non-zero calibrator 2 pg/mL, ICH LOQ 2.242
  m.unit = "pg/mL";
  m.report_limit = "loq";
  lab.add_method(m);
  const Json logged =
      lab.log_curve("ANION-IC", "IC-01", "CRM-A", std::string(kPointsHeader) + m1_rows(), kAt);
  const std::string curve = std::to_string(logged.at("curves")[0].at("id").get<int>());
  CHECK(logged.at("curves")[0].at("limits").at("release_limit").get<double>() ==
        Approx(m1::kLoq).epsilon(1e-9));
  // y0 = 6.0 reads 2.3218 pg/mL: above the LOQ, so released as a number; y0 = 5.5 reads 2.063:
  // below the LOQ (2.242), released as "< 2.242".
  const Json above = quantify_at(lab, {"--curve", curve, "--response", "6.0", "--sample", "A"});
  CHECK(above.at("censored").is_null());
  CHECK(above.at("concentration").get<double>() ==
        Approx((6.0 - m1::kIntercept) / m1::kSlope).epsilon(1e-9));
  const Json below = quantify_at(lab, {"--curve", curve, "--response", "5.5", "--sample", "B"});
  CHECK(below.at("censored") == "<");
  CHECK(below.at("reporting_limit").get<double>() == Approx(m1::kLoq).epsilon(1e-9));
}

TEST_CASE("uncertainty: the budget of a result follows QUAM example A5 (§9 M4)", "[scenario]") {
  // Cd by AAS, Eurachem/CITAC QUAM 3rd ed. 2012 example A5 (data as recalled in the domain brief,
  // reproducing the published B1 = 0.241, B0 = 0.0087, S = 0.005486): u(c0) at c0 = 0.26 mg/L
  // from p = 2 readings and n = 15 calibration readings is 0.01784557457 [C].
  Lab lab;
  lab.add_instrument("AAS-1");
  lab.add_lot("CRM-CD", "2026-12-31", {"cadmium=1000±2"});  // U = 2 with k = 2: u/x = 0.001
  MethodSpec m;
  m.code = "CD-AAS";
  m.analytes = {"cadmium"};
  m.min_r2.reset();
  m.max_error_pct.reset();
  m.max_error_pct_lowest.reset();
  m.min_levels_within.reset();
  m.dilution_pct = "0.5";  // the dilution's relative standard uncertainty, 0.5 %
  lab.add_method(m);
  std::string points = kPointsHeader;
  const double conc[] = {0.1, 0.3, 0.5, 0.7, 0.9};
  const char* absorbances[5][3] = {{"0.028", "0.029", "0.029"},
                                   {"0.084", "0.083", "0.081"},
                                   {"0.135", "0.131", "0.133"},
                                   {"0.180", "0.181", "0.183"},
                                   {"0.215", "0.230", "0.216"}};
  for (int l = 0; l < 5; ++l) {
    for (int r = 0; r < 3; ++r) {
      points += "cadmium,C" + std::to_string(l + 1) + "," + std::to_string(conc[l]) + "," +
                absorbances[l][r] + "," + std::to_string(r + 1) + ",\n";
    }
  }
  const Json logged = lab.log_curve("CD-AAS", "AAS-1", "CRM-CD", points, kAt);
  const Json c = logged.at("curves")[0];
  CHECK(c.at("parameters").at("slope").get<double>() == Approx(0.241).epsilon(1e-12));
  CHECK(c.at("parameters").at("intercept").get<double>() == Approx(0.0087).epsilon(1e-10));
  CHECK(c.at("residual_sd").get<double>() == Approx(0.005485645604).epsilon(1e-9));
  const std::string curve = std::to_string(c.at("id").get<int>());

  // c0 = 0.26 mg/L in the measured solution: y0 = 0.0087 + 0.241·0.26 = 0.07136, two readings,
  // a tenfold dilution.
  const Json q = quantify_at(lab, {"--curve", curve, "--response", "0.07136", "--replicates", "2",
                                   "--dilution", "10", "--sample", "CD-1"});
  CHECK(q.at("concentration").get<double>() == Approx(2.6).epsilon(1e-9));
  CHECK(q.at("sd_x0").get<double>() == Approx(0.01784557457).epsilon(1e-8));
  const Json u = q.at("uncertainty");
  REQUIRE(u.at("components").size() == 3);
  CHECK(u.at("components")[0].at("source") == "calibration");
  const double calibration = 0.01784557457 / 0.26;
  CHECK(u.at("components")[0].at("relative_u").get<double>() == Approx(calibration).epsilon(1e-8));
  CHECK(u.at("components")[1].at("source") == "lot CRM-CD");
  CHECK(u.at("components")[1].at("relative_u").get<double>() == Approx(0.001).epsilon(1e-12));
  CHECK(u.at("components")[2].at("source") == "dilution");
  CHECK(u.at("components")[2].at("relative_u").get<double>() == Approx(0.005).epsilon(1e-12));
  // QUAM: u_c/c = sqrt(Σ(u_i/x_i)²); U = k·u_c with k = 2.
  const double combined =
      2.6 * std::sqrt(calibration * calibration + 0.001 * 0.001 + 0.005 * 0.005);
  CHECK(u.at("combined").get<double>() == Approx(combined).epsilon(1e-8));
  CHECK(u.at("expanded").get<double>() == Approx(2 * combined).epsilon(1e-8));
  CHECK(u.at("k").get<double>() == 2.0);
  // Undiluted, the dilution contributes nothing.
  const Json undiluted = quantify_at(
      lab, {"--curve", curve, "--response", "0.07136", "--replicates", "2", "--sample", "CD-2"});
  CHECK(undiluted.at("uncertainty").at("components").size() == 2);
  // trace result carries the same budget.
  const Json trace =
      lab.json_at(kLater, {"trace", "result", std::to_string(q.at("result_id").get<int>())});
  CHECK(trace.at("result").at("uncertainty") == u);
}

TEST_CASE("limits: a method that reports with DIN 32645 gets x_NG and x_BG (§9 M1)", "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec m;
  m.limits = "din-32645";
  lab.add_method(m);
  const Json logged =
      lab.log_curve("ANION-IC", "IC-01", "CRM-A", std::string(kPointsHeader) + m1_rows(), kAt);
  const Json c = logged.at("curves")[0];
  // DIN 32645 (α = β = 0.01, k = 3, m = 1) on the M1 data [C]: x_NG 0.9130328581,
  // x_EG 1.826065716, x_BG 2.999900549.
  CHECK(c.at("limits").at("reporting") == "din-32645");
  CHECK(c.at("lod").get<double>() == Approx(0.9130328581).epsilon(1e-9));
  CHECK(c.at("loq").get<double>() == Approx(2.999900549).epsilon(1e-9));
  const Json din = c.at("limits").at("din_32645");
  CHECK(din.at("detection_limit").get<double>() == Approx(1.826065716).epsilon(1e-9));
  // The ICH figures are still shown beside them.
  CHECK(c.at("limits").at("ich_q2").at("lod").get<double>() == Approx(m1::kLod).epsilon(1e-9));
  const auto text =
      lab.run({"--at", kLater, "curve", "show", std::to_string(c.at("id").get<int>())});
  CHECK_THAT(text.out, Catch::Contains("DIN 32645"));
  CHECK_THAT(text.out, Catch::Contains("x_NG 0.913"));

  // DIN's calibration method is for an unweighted straight line: a method asking for it with a
  // weighting is refused when it is registered.
  MethodSpec weighted = m;
  weighted.code = "WEIGHTED";
  weighted.weighting = "1/x";
  lab.box.write_file("weighted.toml", weighted.toml());
  const auto r = lab.run({"method", "add", "weighted.toml"});
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.err, Catch::Contains("applies to an unweighted straight line"));
}

TEST_CASE("printing: a figure never contradicts its verdict", "[scenario]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec m;
  // r² of M1 is 0.9977603861 [C]: a minimum of 0.9977603 passes it, though six decimals would
  // print 0.997760, below the minimum. Level L1 (2 pg/mL) reads back at 1.80388, a %RE of
  // -9.806 %: against a limit of 9.8 % it fails, though one decimal would print -9.8.
  m.min_r2 = "0.9977603";
  m.max_error_pct = "9.8";
  m.max_error_pct_lowest.reset();
  m.min_levels_within = "0.5";
  lab.add_method(m);
  const Json logged =
      lab.log_curve("ANION-IC", "IC-01", "CRM-A", std::string(kPointsHeader) + m1_rows(), kAt);
  const std::string curve = std::to_string(logged.at("curves")[0].at("id").get<int>());
  const auto show = lab.run({"--at", kLater, "curve", "show", curve});
  INFO(show.out);
  std::smatch r2;
  REQUIRE(std::regex_search(show.out, r2, std::regex("r² ([0-9.]+)")));
  CHECK(std::stod(r2[1]) >= 0.9977603);  // printed on the passing side, as the verdict says
  CHECK(std::regex_search(show.out, std::regex("L1 +1 +2 +5 +1\\.8039 +-9\\.81 +FAIL")));

  // A check standard read at 110.004 % against 90-110 % fails, and prints so.
  const Json check = lab.json_at(
      kLater, {"check", "log", "--curve", curve, "--nominal", "5.6427", "--response", "13.5"}, 3);
  CHECK(check.at("passed") == false);
  const auto text = lab.run({"--at", kLater, "trace", "curve", curve});
  CHECK_THAT(text.out, Catch::Contains("110.004 %"));
}
