// SPDX-License-Identifier: Apache-2.0
// End-to-end table of bad input: each case exits 2 (4 for store problems) with a message on
// stderr that names the problem, the JSON error object with --json, and writes nothing.
#include <catch2/catch.hpp>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "harness.h"

namespace {

using cw::test::EnvOverrides;
using cw::test::RunResult;
using cw::test::Sandbox;
using Json = nlohmann::json;

/// `text` with its 1-based line `n` replaced by `line`.
std::string with_line(const std::string& text, size_t n, const std::string& line) {
  std::vector<std::string> lines;
  size_t start = 0;
  while (start < text.size()) {
    const size_t end = text.find('\n', start);
    lines.push_back(text.substr(start, end - start));
    start = end + 1;
  }
  lines.at(n - 1) = line;
  std::string out;
  for (const auto& l : lines) out += l + "\n";
  return out;
}

/// The store every case starts from: lab in Europe/Berlin, instrument IC-02, method ANION-IC
/// (version 1, from anion.toml) and lot CRM-1.
void populate(Sandbox& box) {
  box.write_file("anion.toml", cw::test::method_toml());
  for (const auto& args : std::vector<std::vector<std::string>>{
           {"init", "--lab", "Water lab", "--tz", "Europe/Berlin"},
           {"instrument", "add", "IC-02"},
           {"method", "add", "anion.toml"},
           {"lot", "add", "CRM-1", "--material", "Nitrate CRM", "--expires", "2027-03-31",
            "--value", "nitrate=1000±5"}}) {
    const RunResult r = box.run(args);
    INFO(r.describe());
    REQUIRE(r.exit_code == 0);
  }
}

struct BadCase {
  std::string name;
  std::vector<std::string> args;
  int exit_code;        ///< 2 (bad usage / bad input) or 4 (store)
  std::string message;  ///< distinctive part of the message (stderr and JSON)
  std::string code;     ///< error.code in the JSON object
  std::optional<std::string> file = std::nullopt;   ///< error.file (null when absent)
  std::optional<long> line = std::nullopt;          ///< error.line (null when absent)
  std::function<void(Sandbox&)> prepare = nullptr;  ///< extra set-up (input files, odd stores)
  EnvOverrides env = {};
  std::optional<std::string> watched = std::nullopt;  ///< a file whose bytes must not change
};

/// A file in the sandbox holding the method file with line `n` replaced.
std::function<void(Sandbox&)> method_file(const std::string& name, size_t n,
                                          const std::string& line) {
  return [=](Sandbox& box) { box.write_file(name, with_line(cw::test::method_toml(), n, line)); };
}

std::vector<std::string> lot_add(std::vector<std::string> extra) {
  std::vector<std::string> args = {"lot",         "add",       "CRM-2",     "--material",
                                   "Nitrate CRM", "--expires", "2027-03-31"};
  args.insert(args.end(), extra.begin(), extra.end());
  return args;
}

// Line numbers of cw::test::method_toml(): 1 code, 4 analytes, 7 model, 8 weighting,
// 9 min_levels, 10 min_r2, 14 valid_for.
std::vector<BadCase> cases() {
  return {
      // --- method files (TOML)
      {"bad TOML syntax",
       {"method", "add", "syntax.toml"},
       2,
       "not valid TOML",
       "bad-input",
       "syntax.toml",
       10,
       method_file("syntax.toml", 10, "min_r2 = ")},
      {"unknown key in the method file",
       {"method", "add", "colour.toml"},
       2,
       "unknown key 'calibration.colour'",
       "bad-input",
       "colour.toml",
       10,
       method_file("colour.toml", 10, R"(colour = "blue")")},
      {"value of the wrong type",
       {"method", "add", "type.toml"},
       2,
       "key 'calibration.min_levels' must be a whole number, got a string",
       "bad-input",
       "type.toml",
       9,
       method_file("type.toml", 9, R"(min_levels = "five")")},
      {"unknown weighting",
       {"method", "add", "weighting.toml"},
       2,
       "has unknown weighting '1/z'",
       "bad-input",
       "weighting.toml",
       8,
       method_file("weighting.toml", 8, R"(weighting = "1/z")")},
      {"mean-response-factor with weighting",
       {"method", "add", "mrf.toml"},
       2,
       "must be 'none' for the mean-response-factor model",
       "bad-input",
       "mrf.toml",
       8,
       method_file("mrf.toml", 7, R"(model = "mean-response-factor")")},
      {"duplicate analytes",
       {"method", "add", "twice.toml"},
       2,
       "key 'analytes' lists 'nitrate' twice",
       "bad-input",
       "twice.toml",
       4,
       method_file("twice.toml", 4, R"(analytes = ["nitrate", "nitrate"])")},
      {"bad duration",
       {"method", "add", "duration.toml"},
       2,
       "invalid duration '7 fortnights'",
       "bad-input",
       "duration.toml",
       14,
       method_file("duration.toml", 14, R"(valid_for = "7 fortnights")")},
      {"duplicate method code",
       {"method", "add", "anion.toml"},
       2,
       "method 'ANION-IC' already exists (version 1)",
       "bad-input",
       "anion.toml"},
      {"revise of an unknown method",
       {"method", "revise", "new.toml", "--reason", "first"},
       2,
       "no method 'NEW-METHOD' to revise",
       "not-found",
       std::nullopt,
       std::nullopt,
       [](Sandbox& box) { box.write_file("new.toml", cw::test::method_toml("NEW-METHOD")); }},
      {"revise without a change",
       {"method", "revise", "anion.toml", "--reason", "again"},
       2,
       "'anion.toml' is identical to version 1",
       "bad-input",
       "anion.toml"},
      {"missing method file",
       {"method", "add", "nowhere.toml"},
       2,
       "cannot read 'nowhere.toml': no such file",
       "bad-input",
       "nowhere.toml"},
      // --- zones, dates and times
      {"invalid zone on init",
       {"init", "--tz", "Mars/Olympus"},
       2,
       "unknown time zone 'Mars/Olympus'",
       "bad-input"},
      {"expiry date 2026-02-30",
       {"lot", "add", "CRM-2", "--material", "M", "--expires", "2026-02-30", "--value",
        "nitrate=1"},
       2,
       "--expires '2026-02-30' is not a calendar date",
       "bad-input"},
      {"malformed opening date", lot_add({"--opened", "2026-3-1", "--value", "nitrate=1"}), 2,
       "invalid --opened '2026-3-1'", "bad-input"},
      {"--at without a zone",
       {"--at", "2026-03-02T10:00", "instrument", "add", "IC-09"},
       2,
       "--at '2026-03-02T10:00' does not name its zone",
       "bad-input"},
      {"--at at 24:00",
       {"instrument", "add", "IC-09", "--at", "2026-03-02T24:00:00Z"},
       2,
       "is not a valid time of day",
       "bad-input"},
      {"--at on 2026-02-30",
       {"instrument", "add", "IC-09", "--at", "2026-02-30T10:00:00Z"},
       2,
       "--at '2026-02-30T10:00:00Z' is not a calendar date",
       "bad-input"},
      {"CURVEWARDEN_NOW that is not a time",
       {"instrument", "add", "IC-09"},
       2,
       "CURVEWARDEN_NOW '2026-03-02T10:00' does not name its zone",
       "bad-input",
       std::nullopt,
       std::nullopt,
       nullptr,
       EnvOverrides{{"CURVEWARDEN_NOW", "2026-03-02T10:00"}}},
      {"--since without a time of day",
       {"audit", "log", "--since", "2026-03-01"},
       2,
       "--since '2026-03-01' has no time of day and zone",
       "bad-input"},
      // --- lots
      {"negative --in-use-days",
       lot_add({"--opened", "2026-03-01", "--in-use-days", "-3", "--value", "nitrate=1"}), 2,
       "--in-use-days must be a whole number of days above 0, got -3", "bad-usage"},
      {"zero --in-use-days",
       lot_add({"--opened", "2026-03-01", "--in-use-days", "0", "--value", "nitrate=1"}), 2,
       "--in-use-days must be a whole number of days above 0, got 0", "bad-usage"},
      {"--in-use-days without --opened", lot_add({"--in-use-days", "30", "--value", "nitrate=1"}),
       2, "--in-use-days needs --opened DATE", "bad-usage"},
      {"empty lot code",
       {"lot", "add", "", "--material", "M", "--expires", "2027-03-31", "--value", "nitrate=1"},
       2,
       "lot code is empty",
       "bad-input"},
      {"SQL metacharacters in a lot code",
       {"lot", "add", "L1'; DROP TABLE lots;--", "--material", "M", "--expires", "2027-03-31",
        "--value", "nitrate=1"},
       2,
       "lot code 'L1'; DROP TABLE lots;--' contains the character '''",
       "bad-input"},
      {"SQL metacharacters in an instrument code",
       {"instrument", "add", "IC\"; DELETE FROM instruments; --"},
       2,
       "contains the character '\"'",
       "bad-input"},
      {"SQL metacharacters in a lookup",
       {"instrument", "show", "x' OR '1'='1"},
       2,
       "no instrument 'x' OR '1'='1'",
       "not-found"},
      {"--value without '='", lot_add({"--value", "nitrate1000"}), 2,
       "--value 'nitrate1000' has no '='", "bad-usage"},
      {"non-numeric certified value", lot_add({"--value", "nitrate=lots"}), 2,
       "--value 'nitrate=lots': 'lots' is not a number", "bad-usage"},
      {"negative uncertainty", lot_add({"--value", "nitrate=1000±-5"}), 2,
       "the uncertainty cannot be negative", "bad-usage"},
      {"analyte given twice", lot_add({"--value", "nitrate=1", "--value", "nitrate=2"}), 2,
       "--value names analyte 'nitrate' twice", "bad-usage"},
      {"duplicate lot code",
       {"lot", "add", "CRM-1", "--material", "M", "--expires", "2027-03-31", "--value",
        "nitrate=1"},
       2,
       "lot 'CRM-1' is already registered",
       "bad-input"},
      {"withdraw of an unknown lot",
       {"lot", "withdraw", "CRM-9", "--reason", "lost"},
       2,
       "no lot 'CRM-9'",
       "not-found"},
      {"blank --reason",
       {"lot", "withdraw", "CRM-1", "--reason", "   "},
       2,
       "--reason is empty",
       "bad-usage"},
      // --- instruments
      {"duplicate instrument",
       {"instrument", "add", "IC-02"},
       2,
       "instrument 'IC-02' is already registered",
       "bad-input"},
      {"service --back on an instrument in service",
       {"instrument", "service", "IC-02", "--back", "--reason", "repaired"},
       2,
       "instrument 'IC-02' is in service, not out",
       "bad-input"},
      {"service of an unknown instrument",
       {"instrument", "service", "IC-99", "--out", "--reason", "leak"},
       2,
       "no instrument 'IC-99'",
       "not-found"},
      {"service --out and --back together",
       {"instrument", "service", "IC-02", "--out", "--back", "--reason", "x"},
       2,
       "--out excludes --back",
       "bad-usage"},
      {"unknown method version",
       {"method", "show", "ANION-IC", "--version", "7"},
       2,
       "method 'ANION-IC' has no version 7",
       "not-found"},
      // --- command line
      {"unknown subcommand", {"frobnicate"}, 2, "unknown command 'frobnicate'", "bad-usage"},
      {"unknown option", {"instrument", "list", "--colour"}, 2, "--colour", "bad-usage"},
      {"missing required option", lot_add({}), 2, "--value is required", "bad-usage"},
      {"missing required --material",
       {"lot", "add", "CRM-2", "--expires", "2027-03-31", "--value", "nitrate=1"},
       2,
       "--material is required",
       "bad-usage"},
      {"missing argument", {"instrument", "add"}, 2, "code is required", "bad-usage"},
      {"empty --as", {"--as", "", "instrument", "add", "IC-09"}, 2, "--as is empty", "bad-usage"},
      // --- stores
      {"a file that is not a store",
       {"--db", "notes.db", "instrument", "list"},
       4,
       "'notes.db' is not a Curvewarden store or is damaged",
       "store",
       std::nullopt,
       std::nullopt,
       [](Sandbox& box) { box.write_file("notes.db", "calibration notes, not a database\n"); },
       {},
       "notes.db"},
      {"init on a file that is not a store",
       {"--db", "notes.db", "init"},
       4,
       "'notes.db' is not a Curvewarden store or is damaged",
       "store",
       std::nullopt,
       std::nullopt,
       [](Sandbox& box) { box.write_file("notes.db", std::string(4096, 'x')); },
       {},
       "notes.db"},
      {"a SQLite file of another application",
       {"--db", "other.db", "instrument", "list"},
       4,
       "'other.db' is not a Curvewarden store",
       "store",
       std::nullopt,
       std::nullopt,
       [](Sandbox& box) {
         box.write_file("other.db", "");
         REQUIRE(cw::test::exec_sql(box.path("other.db"),
                                    "CREATE TABLE samples (id INTEGER PRIMARY KEY, name TEXT);"
                                    "INSERT INTO samples (name) VALUES ('tap water');") == 0);
       },
       {},
       "other.db"},
      {"a store written by a newer version",
       {"--db", "newer.db", "instrument", "add", "IC-09"},
       4,
       "was written by a newer version of curvewarden",
       "store",
       std::nullopt,
       std::nullopt,
       [](Sandbox& box) {
         std::filesystem::copy_file(box.db(), box.path("newer.db"));
         REQUIRE(cw::test::exec_sql(box.path("newer.db"), "PRAGMA user_version = 99") == 0);
       },
       {},
       "newer.db"},
      {"a missing store",
       {"--db", "missing.db", "instrument", "list"},
       4,
       "no store at 'missing.db'",
       "store"},
      {"a missing store named by CURVEWARDEN_DB",
       {"lot", "list"},
       4,
       "no store at",
       "store",
       std::nullopt,
       std::nullopt,
       nullptr,
       EnvOverrides{{"CURVEWARDEN_DB", "gone/store.db"}}},
  };
}

}  // namespace

TEST_CASE("e2e bad input: refused with a named problem and nothing written", "[e2e]") {
  const auto all = cases();
  REQUIRE(all.size() >= 20);
  for (const auto& c : all) {
    DYNAMIC_SECTION(c.name) {
      Sandbox box;
      populate(box);
      if (c.prepare) c.prepare(box);
      const auto counts = cw::test::table_row_counts(box.db());
      const std::string watched_before = c.watched ? cw::test::read_file(box.path(*c.watched)) : "";
      const bool missing_store = c.code == "store" && !c.watched;

      // Plain text: the message on stderr, nothing on stdout.
      const RunResult text = box.run(c.args, c.env);
      INFO(text.describe());
      CHECK(text.exit_code == c.exit_code);
      CHECK(text.out.empty());
      CHECK_THAT(text.err, Catch::StartsWith("curvewarden: error: "));
      CHECK_THAT(text.err, Catch::Contains(c.message));
      if (c.file) CHECK_THAT(text.err, Catch::Contains(*c.file));
      if (c.line) CHECK_THAT(text.err, Catch::Contains("line " + std::to_string(*c.line)));

      // --json: the error object on stdout.
      std::vector<std::string> json_args = c.args;
      json_args.push_back("--json");
      const RunResult json = box.run(json_args, c.env);
      INFO(json.describe());
      CHECK(json.exit_code == c.exit_code);
      CHECK_THAT(json.err, Catch::Contains(c.message));
      const Json j = json.json();
      REQUIRE(j.is_object());
      CHECK(j.size() == 1);
      const Json& e = j.at("error");
      CHECK(e.at("code") == c.code);
      CHECK_THAT(e.at("message").get<std::string>(), Catch::Contains(c.message));
      CHECK(e.at("file") == (c.file ? Json(*c.file) : Json(nullptr)));
      CHECK(e.at("line") == (c.line ? Json(*c.line) : Json(nullptr)));
      CHECK(e.at("exit_code") == c.exit_code);

      // Nothing written: every table of the store has the rows it had, and files the case
      // points at are byte for byte what they were (or still absent).
      CHECK(cw::test::table_row_counts(box.db()) == counts);
      if (c.watched) CHECK(cw::test::read_file(box.path(*c.watched)) == watched_before);
      if (missing_store) {
        CHECK_FALSE(std::filesystem::exists(box.path("missing.db")));
        CHECK_FALSE(std::filesystem::exists(box.path("gone")));
      }
    }
  }
}

TEST_CASE("e2e bad input: init with an invalid zone creates no store", "[e2e]") {
  Sandbox box;
  const RunResult r = box.run({"init", "--tz", "Europe/Atlantis", "--json"});
  CHECK(r.exit_code == 2);
  CHECK(r.json()["error"]["message"] == "unknown time zone 'Europe/Atlantis'");
  CHECK_FALSE(std::filesystem::exists(box.db()));
  CHECK(std::filesystem::is_empty(box.dir()));
}

// Style guide (anchors §3.4): a mistyped command is named, with the nearest command suggested.
TEST_CASE("e2e bad input: an unknown subcommand is named in the message", "[e2e]") {
  Sandbox box;
  const RunResult r = box.run({"instrument", "frobnicate"});
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.err, Catch::Contains("'frobnicate'"));
  const RunResult near = box.run({"curve", "retrie", "1", "--reason", "x"});
  CHECK(near.exit_code == 2);
  CHECK_THAT(near.err, Catch::Contains("did you mean 'retire'?"));
}
