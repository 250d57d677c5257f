// SPDX-License-Identifier: Apache-2.0
// Every listing's --csv against its --json, read back by an independent RFC 4180 reader: the
// sqlite3 shell's `.import --csv` (the same sqlite3 the tamper tests use). Names with quotes,
// commas, non-ASCII letters and a leading '=' must come back as they went in.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdio>
#include <memory>
#include <string>

#include "harness.h"
#include "report/csv.h"

namespace {

using cw::test::RunResult;
using cw::test::Sandbox;
using nlohmann::json;

void run_ok(const Sandbox& box, const std::vector<std::string>& args) {
  const RunResult r = box.run(args);
  INFO(r.describe());
  REQUIRE(r.exit_code == 0);
}

/// The rows of `csv_path` as the sqlite3 shell reads them: a JSON array of objects whose values
/// are the cells' text, keyed by the header row.
json read_with_sqlite3(const std::filesystem::path& csv_path) {
  const std::string command = "sqlite3 -batch :memory: -cmd \".import --csv '" + csv_path.string() +
                              "' t\" -cmd \".mode json\" \"SELECT * FROM t\" 2>&1";
  std::string out;
  std::unique_ptr<FILE, int (*)(FILE*)> pipe(popen(command.c_str(), "r"), pclose);
  REQUIRE(pipe != nullptr);
  char buffer[4096];
  while (fgets(buffer, sizeof buffer, pipe.get()) != nullptr) out += buffer;
  INFO(out);
  if (out.find_first_not_of(" \r\n") == std::string::npos) return json::array();
  return json::parse(out);
}

/// The header names as sqlite3 read them (the first line, parsed by the same reader: a table of
/// no rows still has its columns).
std::vector<std::string> header_with_sqlite3(const std::filesystem::path& csv_path) {
  const std::string command = "sqlite3 -batch :memory: -cmd \".import --csv '" + csv_path.string() +
                              "' t\" \"SELECT name FROM pragma_table_info('t')\"";
  std::string out;
  std::unique_ptr<FILE, int (*)(FILE*)> pipe(popen(command.c_str(), "r"), pclose);
  REQUIRE(pipe != nullptr);
  char buffer[4096];
  while (fgets(buffer, sizeof buffer, pipe.get()) != nullptr) out += buffer;
  std::vector<std::string> names;
  std::size_t at = 0;
  while (at < out.size()) {
    const auto end = out.find('\n', at);
    names.push_back(out.substr(at, end - at));
    at = end == std::string::npos ? out.size() : end + 1;
  }
  return names;
}

const json* field(const json& row, const std::string& path) {
  const json* at = &row;
  std::size_t start = 0;
  while (true) {
    const auto dot = path.find('.', start);
    const std::string key = path.substr(start, dot - start);
    if (!at->is_object() || !at->contains(key)) return nullptr;
    at = &(*at)[key];
    if (dot == std::string::npos) return at;
    start = dot + 1;
  }
}

/// Checks one cell against the JSON value it came from, with the rules the README states.
void check_cell(const std::string& cell, const json* value, const std::string& column) {
  INFO("column " << column << ": cell '" << cell << "'");
  if (value == nullptr || value->is_null()) {
    CHECK(cell.empty());
  } else if (value->is_boolean()) {
    CHECK(cell == (value->get<bool>() ? "true" : "false"));
  } else if (value->is_number()) {
    // Full precision: the cell reads back as exactly the same double.
    CHECK(std::strtod(cell.c_str(), nullptr) == value->get<double>());
  } else if (value->is_string()) {
    const std::string s = value->get<std::string>();
    const bool formula = !s.empty() && std::string("=+-@").find(s[0]) != std::string::npos;
    CHECK(cell == (formula ? "'" + s : s));
  } else if (value->is_array() && std::all_of(value->begin(), value->end(),
                                              [](const json& v) { return v.is_string(); })) {
    std::string joined;
    for (const auto& v : *value) joined += (joined.empty() ? "" : ";") + v.get<std::string>();
    CHECK(cell == joined);
  } else {
    CHECK(json::parse(cell) == *value);
  }
}

}  // namespace

TEST_CASE("e2e csv: every listing's CSV reads back as its JSON rows", "[e2e]") {
  Sandbox box;
  const std::string lab_name = "Laboratoire d'Analyse \"Süd\", Halle 3";
  run_ok(box, {"init", "--tz", "Europe/Berlin", "--lab", lab_name});
  run_ok(box, {"user", "add", "bob", "--name", "Test user bob", "--role", "reviewer"});
  run_ok(box, {"instrument", "add", "IC-02", "--name", "Ionenchromatograph, Raum \"B\" – Nord"});
  run_ok(box, {"instrument", "add", "GC-01", "--name", "=SUM(A1:A9)"});
  box.write_file("anion.toml", cw::test::method_toml());
  run_ok(box, {"method", "add", "anion.toml"});
  run_ok(box, {"lot", "add", "CRM-1", "--material", "Nitrat, Sulfat 1000 mg/L \"Ø\"", "--expires",
               "2027-03-31", "--certificate", "CoA, 12\n", "--value", "nitrate=1000±4", "--value",
               "sulfate=1000"});
  box.write_file("points.csv",
                 "analyte,level,nominal,response\n"
                 "nitrate,1,1,0.101\nnitrate,2,2,0.199\nnitrate,3,5,0.502\nnitrate,4,10,1.001\n"
                 "nitrate,5,20,1.998\n"
                 "sulfate,1,1,0.0301\nsulfate,2,2,0.0598\nsulfate,3,5,0.1502\nsulfate,4,10,0.2999\n"
                 "sulfate,5,20,0.6003\n");
  run_ok(box, {"curve", "log", "--method", "ANION-IC", "--instrument", "IC-02", "--lot", "CRM-1",
               "--points", "points.csv", "--note", "Kalibrierung, \"neu\""});
  box.user = "bob";
  run_ok(box, {"curve", "review", "1", "--approve", "--reason", "ok, \"geprüft\""});
  box.now = "2026-03-02T10:00:00Z";
  run_ok(box, {"quantify", "--curve", "1", "--response", "0.4321", "--sample",
               "Probe \"7\", Brunnen Ä"});
  run_ok(box, {"quantify", "--curve", "1", "--response", "0.0001", "--sample", "-12"});
  run_ok(box, {"check", "log", "--curve", "1", "--nominal", "10", "--response", "1.0"});
  box.now = "2026-03-02T11:00:00Z";
  box.write_file("run.csv",
                 "position,kind,sample,analyte,response,nominal\n"
                 "1,check,CS \"open\",nitrate,1.002,10\n"
                 "2,sample,\"Well 4, deep\",nitrate,0.3127,\n"
                 "3,sample,=1+1,nitrate,0.0001,\n"
                 "4,check,,nitrate,0.998,10\n");
  run_ok(box, {"run", "import", "run.csv", "--method", "ANION-IC", "--instrument", "IC-02"});

  const std::map<std::string, std::vector<std::string>> args{
      {"instrument list", {"instrument", "list"}},
      {"method list", {"method", "list"}},
      {"lot list", {"lot", "list"}},
      {"curve list", {"curve", "list"}},
      {"expiring", {"expiring", "--within", "30 days"}},
      {"status", {"status"}},
      {"trace curve", {"trace", "curve", "1"}},
      {"trace lot", {"trace", "lot", "CRM-1"}},
      {"run list", {"run", "list"}},
      {"result list", {"result", "list"}},
      {"check list", {"check", "list"}},
      {"trend", {"trend", "--method", "ANION-IC", "--instrument", "IC-02", "--analyte", "nitrate"}},
      {"audit log", {"audit", "log"}},
      {"user list", {"user", "list"}},
  };
  REQUIRE(args.size() == cw::report::csv_listings().size());
  for (const auto& listing : cw::report::csv_listings()) {
    const std::string command(listing.command);
    DYNAMIC_SECTION(command) {
      REQUIRE(args.count(command) == 1);
      auto with = [&](const char* flag) {
        auto a = args.at(command);
        a.push_back(flag);
        return a;
      };
      const RunResult j = box.run(with("--json"));
      const RunResult c = box.run(with("--csv"));
      INFO(j.describe() << "\n" << c.describe());
      REQUIRE(j.exit_code == 0);
      REQUIRE(c.exit_code == 0);
      // RFC 4180: every record ends in CRLF.
      REQUIRE(c.out.size() >= 2);
      CHECK(c.out.substr(c.out.size() - 2) == "\r\n");
      box.write_file("out.csv", c.out);

      std::vector<std::string> expected_header(listing.columns.begin(), listing.columns.end());
      CHECK(header_with_sqlite3(box.path("out.csv")) == expected_header);
      const json rows = j.json()[std::string(listing.rows)];
      const json read = read_with_sqlite3(box.path("out.csv"));
      REQUIRE(read.size() == rows.size());
      CHECK(rows.size() > 0);
      for (std::size_t i = 0; i < rows.size(); ++i) {
        for (const auto& column : expected_header) {
          check_cell(read[i][column].get<std::string>(), field(rows[i], column), column);
        }
      }
    }
  }
}

TEST_CASE("e2e csv: --csv with --json, or on a command that lists nothing, is refused", "[e2e]") {
  Sandbox box;
  run_ok(box, {"init", "--tz", "UTC"});
  const RunResult both = box.run({"curve", "list", "--csv", "--json"});
  CHECK(both.exit_code == 2);
  CHECK_THAT(both.out + both.err, Catch::Contains("--csv or --json"));
  const RunResult not_listing = box.run({"instrument", "add", "X", "--csv"});
  CHECK(not_listing.exit_code == 2);
  CHECK(cw::test::query_text(box, "SELECT count(*) FROM instruments") == "0");
  // An empty listing is still a header row.
  const RunResult empty = box.run({"curve", "list", "--csv"});
  CHECK(empty.exit_code == 0);
  CHECK(empty.out ==
        "id,analyte,method,method_version,instrument,state,reasons,acquired_at,expires_at,"
        "verdict\r\n");
}
