// SPDX-License-Identifier: Apache-2.0
// Instrument exports with their own headers: a run file read through --columns, then through a
// mapping saved for the instrument (an audited fact), a points file read the same way, and a
// mapped header that is missing, named in the error with nothing written.
#include <catch2/catch.hpp>

#include "run_support.h"

using namespace cw::scenario;

namespace {

/// The sequence as an instrument exports it: its own headers and extra columns.
std::string export_csv(long first_position) {
  const std::string p = std::to_string(first_position);
  const std::string q = std::to_string(first_position + 1);
  const std::string r = std::to_string(first_position + 2);
  return "Seq,Sample Type,Sample Name,Component,Area,Ret. Time,Amount\n" + p +
         ",check,CCV,nitrate," + kNitratePass + ",4.21,6\n" + q + ",sample,W-77,nitrate," +
         kNitrateLow + ",4.20,\n" + r + ",check,CCV,nitrate," + kNitratePass + ",4.22,6\n";
}

const std::string kMapping =
    "position=Seq,kind=Sample Type,sample=Sample Name,analyte=Component,response=Area,"
    "nominal=Amount";

}  // namespace

TEST_CASE(
    "columns: an export with its own headers imports with --columns and with the "
    "instrument's saved columns",
    "[scenario][run]") {
  RunLab rl;
  SECTION("without a mapping its headers are refused") {
    const RunResult r = rl.import("export.csv", export_csv(1));
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.err, Catch::Contains("unknown column 'Seq'"));
  }
  SECTION("--columns") {
    const Json run = rl.import_json("export.csv", export_csv(1), 0, {"--columns", kMapping});
    CHECK(run.at("results").size() == 1);
    CHECK(result_of(run, "W-77").at("status") == "reported");
    CHECK(run.at("columns").at("response") == "Area");
    CHECK(run.at("columns_source") == "--columns");
    CHECK(run.at("ignored_columns") == Json::array({"Ret. Time"}));
  }
  SECTION("a saved mapping, used by default and recorded") {
    const auto before = rl.lab.counts();
    const Json saved = rl.lab.json_at(Lab::kSetupAt, {"instrument", "columns", "IC-01", "--set",
                                                      kMapping, "--reason", "export of IC-01"});
    CHECK(saved.at("columns").at("position") == "Seq");
    CHECK(rl.lab.counts().at("instrument_column_maps") == before.at("instrument_column_maps") + 1);
    CHECK(rl.lab.sql("SELECT action FROM audit_log ORDER BY seq DESC LIMIT 1") ==
          "instrument.columns");
    const Json run = rl.import_json("export.csv", export_csv(1), 0);
    CHECK(run.at("columns_source") == "the saved columns of instrument IC-01");
    CHECK(result_of(run, "W-77").at("status") == "reported");
    // --columns replaces the saved mapping for one file; a mapped header that is missing is
    // named, with the mapping it came from, and nothing is written.
    const auto counts = rl.lab.counts();
    const RunResult missing =
        rl.import("export2.csv", export_csv(10), {"--columns", kMapping + ",dilution=Dil. Factor"});
    INFO(missing.describe());
    CHECK(missing.exit_code == 2);
    CHECK_THAT(missing.err,
               Catch::Contains("no column 'Dil. Factor' (--columns maps it to 'dilution')"));
    CHECK(missing.json().at("error").at("line") == 1);
    CHECK(rl.lab.counts() == counts);
    // A bad value is named by the file's own header, the logical column beside it.
    std::string bad = export_csv(30);
    bad.replace(bad.find("W-77,nitrate,") + 13, std::string(kNitrateLow).size(), "n/a");
    const RunResult named = rl.import("export4.csv", bad);
    INFO(named.describe());
    CHECK(named.exit_code == 2);
    CHECK_THAT(named.err, Catch::Contains("'Area' (response)"));
    CHECK(named.json().at("error").at("field") == "Area");
    CHECK(named.json().at("error").at("line") == 3);
    CHECK(named.json().at("error").at("column") == 5);
    CHECK(rl.lab.counts() == counts);
    // A check standard's nominal outside the curve's range names the mapped header too.
    std::string far = export_csv(40);
    far.replace(far.find(",4.21,6\n") + 6, 1, "6000");
    const RunResult range = rl.import("export5.csv", far);
    INFO(range.describe());
    CHECK(range.exit_code == 2);
    CHECK_THAT(range.err, Catch::Contains("'Amount' (nominal)"));
    CHECK(range.json().at("error").at("field") == "Amount");
    CHECK(range.json().at("error").at("column") == 7);
    CHECK(rl.lab.counts() == counts);
    // Cleared, the export is refused again.
    rl.lab.json_at(Lab::kSetupAt, {"instrument", "columns", "IC-01", "--clear"});
    CHECK(rl.import("export3.csv", export_csv(20)).exit_code == 2);
  }
}

TEST_CASE("columns: a points file with foreign headers logs a calibration with --columns",
          "[scenario][run]") {
  Lab lab;
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  MethodSpec spec;
  spec.analytes = {"nitrate"};
  lab.add_method(spec);
  std::string csv = "Compound,Cal Level,Conc,Peak Area,Rep,Flag,Comment\n";
  // calibration-practice.md §9 M1, with an extra column the mapping leaves aside.
  const double x[] = {0, 2, 4, 6, 8, 10, 12};
  const char* y[] = {"2.1", "5.0", "9.0", "12.6", "17.3", "21.0", "24.7"};
  for (int i = 0; i < 7; ++i) {
    csv += "nitrate,L" + std::to_string(i) + "," + std::to_string(static_cast<int>(x[i])) + "," +
           y[i] + ",1,,ok\n";
  }
  const auto file = lab.box.write_file("cal.csv", csv);
  const std::vector<std::string> args = {
      "curve",
      "log",
      "--method",
      "ANION-IC",
      "--instrument",
      "IC-01",
      "--lot",
      "CRM-A",
      "--points",
      file.string(),
      "--columns",
      "analyte=Compound,level=Cal Level,nominal=Conc,response=Peak "
      "Area,replicate=Rep,exclude=Flag"};
  const Json j = lab.json_at("2026-03-02T08:00:00Z", args);
  const Json& curve = j.at("curves")[0];
  CHECK(curve.at("parameters").at("slope").get<double>() == Approx(m1::kSlope).epsilon(1e-9));
  CHECK(curve.at("parameters").at("intercept").get<double>() ==
        Approx(m1::kIntercept).epsilon(1e-9));
  // A name that is not a points-file column is refused before anything is read.
  std::vector<std::string> wrong = args;
  wrong.back() = "position=Seq";
  const RunResult r = lab.run_at("2026-03-02T08:30:00Z", wrong);
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.err, Catch::Contains("--columns names the unknown column 'position'"));
  // A bad value names the file's header of its column.
  std::vector<std::string> negative = args;
  negative[negative.size() - 3] =
      lab.box.write_file("cal-bad.csv", csv + "nitrate,L7,-3,30.1,1,,ok\n").string();
  const RunResult bad = lab.run_at("2026-03-02T08:40:00Z", negative);
  INFO(bad.describe());
  CHECK(bad.exit_code == 2);
  CHECK_THAT(bad.err, Catch::Contains("'Conc' (nominal) is negative"));
  CHECK(bad.json().at("error").at("field") == "Conc");
}
