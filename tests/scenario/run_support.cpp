// SPDX-License-Identifier: Apache-2.0
// Set-up shared by the run scenarios.
#include "run_support.h"

#include <catch2/catch.hpp>

namespace cw::scenario {

RunLab::RunLab(MethodSpec spec) {
  lab.add_instrument("IC-01");
  lab.add_lot("CRM-A", "2026-12-31");
  lab.add_method(spec);
  const Json j =
      lab.log_curve("ANION-IC", "IC-01", "CRM-A",
                    std::string(kPointsHeader) + m1_rows() + duplicate_sulfate_rows(), kCurvesAt);
  nitrate = j.at("curves")[0].at("id").get<std::int64_t>();
  sulfate = j.at("curves")[1].at("id").get<std::int64_t>();
}

RunResult RunLab::import(const std::string& name, const std::string& csv,
                         const std::vector<std::string>& extra, const std::string& at) const {
  const auto file = lab.box.write_file(name, csv);
  std::vector<std::string> args{"run",      "import",       file.string(), "--method",
                                "ANION-IC", "--instrument", "IC-01"};
  args.insert(args.end(), extra.begin(), extra.end());
  return lab.run_at(at, args);
}

Json RunLab::import_json(const std::string& name, const std::string& csv, int expected_exit,
                         const std::vector<std::string>& extra, const std::string& at) const {
  const RunResult r = import(name, csv, extra, at);
  INFO(r.describe());
  REQUIRE(r.exit_code == expected_exit);
  return r.json();
}

std::string row(long position, const std::string& kind, const std::string& sample,
                const std::string& analyte, const std::string& response,
                const std::string& nominal) {
  return std::to_string(position) + "," + kind + "," + sample + "," + analyte + "," + response +
         "," + nominal + "\n";
}

std::map<std::string, std::string> status_by_sample(const Json& run) {
  std::map<std::string, std::string> out;
  for (const auto& r : run.at("results")) {
    out[r.at("sample").get<std::string>()] = r.at("status").get<std::string>();
  }
  return out;
}

const Json& result_of(const Json& run, const std::string& sample) {
  for (const auto& r : run.at("results")) {
    if (r.at("sample") == sample) return r;
  }
  FAIL("no result for sample " << sample);
  throw std::logic_error("unreachable");
}

}  // namespace cw::scenario
