// SPDX-License-Identifier: Apache-2.0
// End-to-end table of hostile input, one case per way a person or a script can get it wrong:
// numbers that are not plain decimals or overflow once combined, times outside the calendar or
// in the future, durations beyond a century, text with control, direction or invisible
// characters, special and oversized files, damaged method and points files, foreign stores. Each
// case exits 2 (4 for store problems) with a message that names the option or the file and line,
// the JSON error object with --json, writes nothing, and leaves a store on which 'audit verify',
// 'curve list', 'status' and 'audit log' still succeed.
#include <sys/stat.h>

#include <catch2/catch.hpp>
#include <filesystem>
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

/// A calibration that passes the method of cw::test::method_toml() (linear, 1/x, five levels):
/// responses 0.1·x for nitrate and 0.05·x for sulfate, with a little scatter.
const char* const kPoints =
    "analyte,level,nominal,response\n"
    "nitrate,1,1,0.101\n"
    "nitrate,2,2,0.199\n"
    "nitrate,3,5,0.502\n"
    "nitrate,4,10,1.001\n"
    "nitrate,5,20,1.998\n"
    "sulfate,1,1,0.0502\n"
    "sulfate,2,2,0.0998\n"
    "sulfate,3,5,0.2505\n"
    "sulfate,4,10,0.4996\n"
    "sulfate,5,20,1.0003\n";

/// A run file that imports against the populated store (checks of 5 mg/L nitrate read 100 %).
const char* const kRun =
    "position,kind,sample,analyte,response,nominal\n"
    "1,check,CCV,nitrate,0.5,5\n"
    "2,sample,W-1,nitrate,0.3,\n"
    "3,check,CCV,nitrate,0.5,5\n";

/// The points file with line `n` (1 = header) replaced.
std::string points_with(size_t n, const std::string& line) {
  return with_line(kPoints, n, line);
}

/// The store every case starts from: lab in Europe/Berlin, instrument IC-02, method ANION-IC
/// (version 1, from anion.toml), lot CRM-1 (and CRM-N, nitrate only), and calibration 1 (curves 1
/// nitrate and 2 sulfate) logged by alice and approved by bob, so that checks and quantitation
/// reach their decisions.
void populate(Sandbox& box) {
  box.write_file("anion.toml", cw::test::method_toml());
  box.write_file("good.csv", kPoints);
  box.write_file("good-run.csv", kRun);
  for (const auto& args : std::vector<std::vector<std::string>>{
           {"init", "--lab", "Water lab", "--tz", "Europe/Berlin"},
           {"user", "add", "bob", "--name", "Test user bob", "--role", "reviewer"},
           {"instrument", "add", "IC-02"},
           {"method", "add", "anion.toml"},
           {"lot", "add", "CRM-1", "--material", "Nitrate CRM", "--expires", "2027-03-31",
            "--value", "nitrate=1000±5", "--value", "sulfate=1000±5"},
           {"lot", "add", "CRM-N", "--material", "Nitrate CRM", "--expires", "2027-03-31",
            "--value", "nitrate=1000±5"},
           {"curve", "log", "--method", "ANION-IC", "--instrument", "IC-02", "--lot", "CRM-1",
            "--points", "good.csv"},
           {"curve", "review", "1", "--approve", "--reason", "checked", "--as", "bob"},
           {"curve", "review", "2", "--approve", "--reason", "checked", "--as", "bob"}}) {
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
  std::optional<std::string> option = std::nullopt;   ///< error.option: the option named
  double max_seconds = 0;  ///< when above 0: the run must end this quickly (special files)
};

/// A file in the sandbox holding the method file with line `n` replaced.
std::function<void(Sandbox&)> method_file(const std::string& name, size_t n,
                                          const std::string& line) {
  return [=](Sandbox& box) { box.write_file(name, with_line(cw::test::method_toml(), n, line)); };
}

/// A file in the sandbox holding `content`.
std::function<void(Sandbox&)> file(const std::string& name, const std::string& content) {
  return [=](Sandbox& box) { box.write_file(name, content); };
}

/// A named pipe in the sandbox (nothing ever writes to it: reading it would block forever).
std::function<void(Sandbox&)> fifo(const std::string& name) {
  return [=](Sandbox& box) { REQUIRE(mkfifo(box.path(name).c_str(), 0600) == 0); };
}

std::vector<std::string> lot_add(std::vector<std::string> extra) {
  std::vector<std::string> args = {"lot",         "add",       "CRM-2",     "--material",
                                   "Nitrate CRM", "--expires", "2027-03-31"};
  args.insert(args.end(), extra.begin(), extra.end());
  return args;
}

std::vector<std::string> quantify(std::vector<std::string> extra) {
  std::vector<std::string> args = {"quantify", "--curve", "1", "--sample", "S-1"};
  args.insert(args.end(), extra.begin(), extra.end());
  return args;
}

std::vector<std::string> check(std::vector<std::string> extra) {
  std::vector<std::string> args = {"check", "log", "--curve", "1"};
  args.insert(args.end(), extra.begin(), extra.end());
  return args;
}

std::vector<std::string> curve_log(const std::string& points) {
  return {"curve", "log",   "--method", "ANION-IC", "--instrument",
          "IC-02", "--lot", "CRM-1",    "--points", points};
}

/// The run file with line `n` (1 = header) replaced.
std::string run_with(size_t n, const std::string& line) {
  return with_line(kRun, n, line);
}

std::vector<std::string> run_import(const std::string& file, std::vector<std::string> extra = {}) {
  std::vector<std::string> args = {"run",      "import",       file,   "--method",
                                   "ANION-IC", "--instrument", "IC-02"};
  args.insert(args.end(), extra.begin(), extra.end());
  return args;
}

std::vector<std::string> withdraw_because(const std::string& reason) {
  return {"lot", "withdraw", "CRM-1", "--reason", reason};
}

BadCase option_case(std::string name, std::vector<std::string> args, std::string message,
                    std::string option, std::string code = "bad-input") {
  BadCase c{std::move(name), std::move(args), 2, std::move(message), std::move(code)};
  c.option = std::move(option);
  return c;
}

BadCase file_case(std::string name, std::vector<std::string> args, std::string message,
                  std::string file_name, std::optional<long> line,
                  std::function<void(Sandbox&)> prepare, double max_seconds = 0) {
  BadCase c{std::move(name), std::move(args),      2,    std::move(message),
            "bad-input",     std::move(file_name), line, std::move(prepare)};
  c.max_seconds = max_seconds;
  return c;
}

const std::string kEsc = "\x1b[31mred\x1b[0m";
const std::string kRightToLeftOverride = "\xe2\x80\xae";  // U+202E
const std::string kNoBreakSpace = "\xc2\xa0";             // U+00A0
const std::string kZeroWidthSpace = "\xe2\x80\x8b";       // U+200B

// Line numbers of cw::test::method_toml(): 1 code, 2 title, 3 unit, 4 analytes, 7 model,
// 8 weighting, 9 min_levels, 10 min_r2, 14 valid_for, 19 samples_per_check, 20 check_every.
std::vector<BadCase> cases() {
  return {
      // ------------------------------------------------------------------ method files (TOML)
      file_case("bad TOML syntax", {"method", "add", "syntax.toml"}, "not valid TOML",
                "syntax.toml", 10, method_file("syntax.toml", 10, "min_r2 = ")),
      file_case("unknown key in the method file", {"method", "add", "colour.toml"},
                "unknown key 'calibration.colour'", "colour.toml", 10,
                method_file("colour.toml", 10, R"(colour = "blue")")),
      file_case("value of the wrong type", {"method", "add", "type.toml"},
                "key 'calibration.min_levels' must be a whole number, got a string", "type.toml", 9,
                method_file("type.toml", 9, R"(min_levels = "five")")),
      file_case("unknown weighting", {"method", "add", "weighting.toml"},
                "has unknown weighting '1/z'", "weighting.toml", 8,
                method_file("weighting.toml", 8, R"(weighting = "1/z")")),
      file_case("mean-response-factor with weighting", {"method", "add", "mrf.toml"},
                "must be 'none' for the mean-response-factor model", "mrf.toml", 8,
                method_file("mrf.toml", 7, R"(model = "mean-response-factor")")),
      file_case("duplicate analytes", {"method", "add", "twice.toml"},
                "key 'analytes' lists 'nitrate' twice", "twice.toml", 4,
                method_file("twice.toml", 4, R"(analytes = ["nitrate", "nitrate"])")),
      file_case("bad duration", {"method", "add", "duration.toml"},
                "invalid duration '7 fortnights'", "duration.toml", 14,
                method_file("duration.toml", 14, R"(valid_for = "7 fortnights")")),
      file_case("valid_for beyond 100 years", {"method", "add", "century.toml"},
                "is longer than 100 years", "century.toml", 14,
                method_file("century.toml", 14, R"(valid_for = "1000 years")")),
      file_case("check_every of zero hours", {"method", "add", "zero.toml"},
                "must be longer than zero", "zero.toml", 20,
                method_file("zero.toml", 20, R"(check_every = "0 hours")")),
      file_case("min_levels wider than 32 bits", {"method", "add", "wide.toml"},
                "must be a whole number from 1 to 1000, got 4294967301", "wide.toml", 9,
                method_file("wide.toml", 9, "min_levels = 4294967301")),
      file_case("negative samples_per_check", {"method", "add", "negative.toml"},
                "must be a whole number from 1 to 100000, got -1", "negative.toml", 19,
                method_file("negative.toml", 19, "samples_per_check = -1")),
      file_case("terminal escape in the title", {"method", "add", "escape.toml"},
                "contains the control or formatting character U+001B", "escape.toml", 2,
                method_file("escape.toml", 2, R"(title = "Nitrate \u001b[2J by IC")")),
      file_case("unit of 101 characters", {"method", "add", "unit.toml"}, "is 101 characters long",
                "unit.toml", 3,
                method_file("unit.toml", 3, "unit = \"" + std::string(101, 'm') + "\"")),
      file_case("direction override in an analyte", {"method", "add", "bidi.toml"}, "U+202E",
                "bidi.toml", 4,
                method_file("bidi.toml", 4, R"(analytes = ["nit\u202erate", "sulfate"])")),
      file_case("space in the method code", {"method", "add", "code.toml"},
                "method code 'ANION IC' contains the character ' '", "code.toml", 1,
                method_file("code.toml", 1, R"(code = "ANION IC")")),
      file_case("method file that is not UTF-8", {"method", "add", "latin1.toml"},
                "is not UTF-8 text", "latin1.toml", 2,
                method_file("latin1.toml", 2, "title = \"Nitrat \xe4\"")),
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
       "method file 'nowhere.toml': no such file",
       "bad-input",
       "nowhere.toml"},
      file_case("method file that is a named pipe", {"method", "add", "pipe.toml"},
                "method file 'pipe.toml': is a named pipe (FIFO)", "pipe.toml", std::nullopt,
                fifo("pipe.toml"), 1.0),
      file_case(
          "method file that is a directory", {"method", "add", "folder"}, "is a directory",
          "folder", std::nullopt,
          [](Sandbox& box) { std::filesystem::create_directory(box.path("folder")); }, 1.0),
      file_case(
          "method file one byte over 1 MiB", {"method", "add", "big.toml"},
          "is 1048577 bytes, more than the limit of 1 MiB", "big.toml", std::nullopt,
          file("big.toml", cw::test::method_toml() + "#" +
                               std::string((1u << 20) - cw::test::method_toml().size(), 'x'))),

      // ------------------------------------------------------------------------ points files
      [] {
        // calibration-practice.md §6.5: a curve traces to a certified value of its analyte.
        BadCase c =
            option_case("a calibration with an analyte no lot certifies",
                        {"curve", "log", "--method", "ANION-IC", "--instrument", "IC-02", "--lot",
                         "CRM-N", "--points", "good.csv"},
                        "no lot given (CRM-N) certifies a value for analyte 'sulfate'", "--lot");
        return c;
      }(),
      file_case("points file that is a named pipe", curve_log("pipe.csv"),
                "--points 'pipe.csv': is a named pipe (FIFO)", "pipe.csv", std::nullopt,
                fifo("pipe.csv"), 1.0),
      file_case("points file that is a character device", curve_log("/dev/zero"),
                "is a character device", "/dev/zero", std::nullopt, nullptr, 1.0),
      file_case(
          "points file that is a directory", curve_log("folder"), "is a directory", "folder",
          std::nullopt, [](Sandbox& box) { std::filesystem::create_directory(box.path("folder")); },
          1.0),
      file_case("points file one byte over 16 MiB", curve_log("huge.csv"),
                "is 16777217 bytes, more than the limit of 16 MiB", "huge.csv", std::nullopt,
                file("huge.csv", std::string(kPoints) + "#" +
                                     std::string((16u << 20) - std::string(kPoints).size(), 'x'))),
      file_case("points file that is not UTF-8", curve_log("latin1.csv"), "is not UTF-8 text",
                "latin1.csv", 3, file("latin1.csv", points_with(3, "nitrate,2,2,0.199\xff"))),
      option_case("points path that is not UTF-8", curve_log("points\xff.csv"),
                  "--points is not valid UTF-8 text", "--points"),
      option_case("points path with an escape sequence", curve_log("points" + kEsc + ".csv"),
                  "--points contains the control or formatting character U+001B", "--points"),
      option_case("method path with a line break", {"method", "add", "anion\n.toml"},
                  "file contains the control or formatting character U+000A", "file"),
      file_case("missing points file", curve_log("nowhere.csv"),
                "--points 'nowhere.csv': no such file", "nowhere.csv", std::nullopt, nullptr),
      file_case("hexadecimal response in a points file", curve_log("hex.csv"),
                "'response' '0x1A' is not a plain decimal number", "hex.csv", 4,
                file("hex.csv", points_with(4, "nitrate,3,5,0x1A"))),
      file_case("overflowing response in a points file", curve_log("overflow.csv"),
                "'response' '1e999' is out of range", "overflow.csv", 5,
                file("overflow.csv", points_with(5, "nitrate,4,10,1e999"))),
      file_case("nan nominal in a points file", curve_log("nan.csv"),
                "'nominal' 'nan' is not a plain decimal number", "nan.csv", 2,
                file("nan.csv", points_with(2, "nitrate,1,nan,0.101"))),
      file_case("subnormal nominal in a points file", curve_log("tiny.csv"),
                "'nominal' '1e-320' is out of range", "tiny.csv", 2,
                file("tiny.csv", points_with(2, "nitrate,1,1e-320,0.101"))),
      file_case("empty response in a points file", curve_log("empty.csv"), "'response' is empty",
                "empty.csv", 3, file("empty.csv", points_with(3, "nitrate,2,2,"))),
      file_case("terminal escape in an exclude reason", curve_log("escape.csv"),
                "'exclude' contains the control or formatting character U+001B", "escape.csv", 3,
                file("escape.csv",
                     "analyte,level,nominal,response,exclude\n"
                     "nitrate,1,1,0.101,\n"
                     "nitrate,2,2,0.199,spilt " +
                         kEsc +
                         "\n"
                         "nitrate,3,5,0.502,\nnitrate,4,10,1.001,\n"
                         "nitrate,5,20,1.998,\n")),
      file_case("exclude reason over the reason cap", curve_log("long.csv"),
                "'exclude' is 2001 characters long", "long.csv", 2,
                file("long.csv",
                     "analyte,level,nominal,response,exclude\n"
                     "nitrate,0,0.5,0.05," +
                         std::string(2001, 'r') +
                         "\nnitrate,1,1,0.101,\nnitrate,2,2,0.199,\n"
                         "nitrate,3,5,0.502,\nnitrate,4,10,1.001,\n"
                         "nitrate,5,20,1.998,\n")),
      file_case("control character in a level label", curve_log("label.csv"),
                "'level' contains the control or formatting character U+0007", "label.csv", 3,
                file("label.csv", points_with(3, "nitrate,L\a2,2,0.199"))),
      file_case("responses that are all zero", curve_log("zero.csv"),
                "the responses do not change with concentration", "zero.csv", std::nullopt,
                file("zero.csv",
                     "analyte,level,nominal,response\nnitrate,1,1,0\nnitrate,2,2,0\n"
                     "nitrate,3,5,0\nnitrate,4,10,0\nnitrate,5,20,0\n")),
      file_case("responses that do not change", curve_log("flat.csv"),
                "the responses do not change with concentration", "flat.csv", std::nullopt,
                file("flat.csv",
                     "analyte,level,nominal,response\nnitrate,1,1,5\nnitrate,2,2,5\n"
                     "nitrate,3,5,5\nnitrate,4,10,5\nnitrate,5,20,5\n")),
      file_case("unknown analyte with an escape sequence", curve_log("ghost.csv"),
                "unknown analyte", "ghost.csv", 2,
                file("ghost.csv", points_with(2, "nit\x1b[2Jrate,1,1,0.101"))),

      // ------------------------------------------------------------- numbers on the command line
      option_case("hexadecimal response", quantify({"--response", "0x10"}),
                  "--response '0x10' is not a plain decimal number", "--response"),
      option_case("empty response", quantify({"--response", ""}), "--response is empty",
                  "--response"),
      option_case("infinite response", quantify({"--response", "inf"}),
                  "--response 'inf' is not a plain decimal number", "--response"),
      option_case("nan response", quantify({"--response", "nan"}),
                  "--response 'nan' is not a plain decimal number", "--response"),
      option_case("overflowing response", quantify({"--response", "1e999"}),
                  "--response '1e999' is out of range", "--response"),
      option_case("decimal comma", quantify({"--response", "1,5"}),
                  "--response '1,5' is not a plain decimal number", "--response"),
      option_case("response with a unit", quantify({"--response", "12 mAU"}),
                  "--response '12 mAU' is not a plain decimal number", "--response"),
      option_case("second replicate reading not a number",
                  quantify({"--response", "0.5", "--response", "0.5x"}),
                  "--response '0.5x' is not a plain decimal number", "--response"),
      option_case("dilution of zero", quantify({"--response", "0.5", "--dilution", "0"}),
                  "--dilution must be above 0", "--dilution", "bad-usage"),
      option_case("negative dilution", quantify({"--response", "0.5", "--dilution", "-2"}),
                  "--dilution must be above 0", "--dilution", "bad-usage"),
      option_case("dilution whose product overflows",
                  quantify({"--response", "0.5", "--dilution", "1e308"}),
                  "is not a finite number (it overflows)", "--dilution"),
      option_case("internal-standard response without an internal standard",
                  quantify({"--response", "0.5", "--is-response", "2"}),
                  "has no internal standard; --is-response does not apply", "--is-response"),
      option_case("zero replicates", quantify({"--response", "0.5", "--replicates", "0"}),
                  "--replicates '0' is out of range", "--replicates"),
      option_case("replicates beyond any range",
                  quantify({"--response", "0.5", "--replicates", "99999999999999999999"}),
                  "--replicates '99999999999999999999' is out of range", "--replicates"),
      option_case("fractional replicates", quantify({"--response", "0.5", "--replicates", "2.5"}),
                  "--replicates '2.5' is not a whole number", "--replicates"),
      option_case("curve id zero", {"quantify", "--curve", "0", "--sample", "S", "--response", "1"},
                  "--curve '0' is out of range", "--curve"),
      option_case("curve id in exponent form",
                  {"quantify", "--curve", "1e3", "--sample", "S", "--response", "1"},
                  "--curve '1e3' is not a whole number", "--curve"),
      option_case("curve id that is text", {"curve", "show", "first"},
                  "id 'first' is not a whole number", "id"),
      {"unknown curve",
       {"quantify", "--curve", "99", "--sample", "S", "--response", "1"},
       2,
       "no curve 99",
       "not-found"},
      option_case("hexadecimal nominal", check({"--nominal", "0x1p3", "--response", "1"}),
                  "--nominal '0x1p3' is not a plain decimal number", "--nominal"),
      option_case("subnormal nominal", check({"--nominal", "1e-320", "--response", "1"}),
                  "--nominal '1e-320' is out of range", "--nominal"),
      option_case("zero nominal of a check", check({"--nominal", "0", "--response", "1"}),
                  "--nominal must be above 0, got 0", "--nominal"),
      option_case("check nominal below the curve's working range (1 to 20)",
                  check({"--nominal", "1e-307", "--response", "1"}),
                  "--nominal 1e-307 mg/L lies outside the curve's working range, 1 to 20 mg/L",
                  "--nominal"),
      option_case("check nominal above the curve's working range (1 to 20)",
                  check({"--nominal", "20.5", "--response", "1"}),
                  "--nominal 20.5 mg/L lies outside the curve's working range", "--nominal"),
      option_case("check without a nominal", check({"--response", "1"}),
                  "a check needs --nominal CONC", "--nominal"),
      option_case("blank with a nominal",
                  check({"--kind", "blank", "--nominal", "5", "--response", "0.001"}),
                  "a blank has nominal 0", "--nominal"),
      option_case("unknown kind of check", check({"--kind", "purple", "--response", "1"}),
                  "--kind 'purple' is not a kind of check", "--kind", "bad-usage"),
      option_case("hexadecimal certified value", lot_add({"--value", "nitrate=0x10"}),
                  "'0x10' is not a plain decimal number", "--value"),
      option_case("infinite certified value", lot_add({"--value", "nitrate=inf"}),
                  "'inf' is not a plain decimal number", "--value"),
      option_case("nan uncertainty", lot_add({"--value", "nitrate=1000±nan"}),
                  "'nan' is not a plain decimal number", "--value"),
      option_case("negative certified value", lot_add({"--value", "nitrate=-5"}),
                  "the certified value must be above 0", "--value"),
      option_case("--value without '='", lot_add({"--value", "nitrate1000"}),
                  "--value 'nitrate1000' has no '='", "--value"),
      option_case("non-numeric certified value", lot_add({"--value", "nitrate=lots"}),
                  "'lots' is not a plain decimal number", "--value"),
      option_case("negative uncertainty", lot_add({"--value", "nitrate=1000±-5"}),
                  "the uncertainty cannot be negative", "--value"),
      option_case("in-use days beyond any range",
                  lot_add({"--opened", "2026-03-01", "--in-use-days", "99999999999999999999",
                           "--value", "nitrate=1"}),
                  "--in-use-days '99999999999999999999' is out of range", "--in-use-days"),
      option_case(
          "negative --in-use-days",
          lot_add({"--opened", "2026-03-01", "--in-use-days", "-3", "--value", "nitrate=1"}),
          "--in-use-days '-3' is out of range", "--in-use-days"),
      option_case("zero --in-use-days",
                  lot_add({"--opened", "2026-03-01", "--in-use-days", "0", "--value", "nitrate=1"}),
                  "--in-use-days '0' is out of range", "--in-use-days"),
      option_case("method version zero", {"method", "show", "ANION-IC", "--version", "0"},
                  "--version '0' is out of range", "--version"),

      // ------------------------------------------------------------------ times and durations
      option_case("time in the year 0",
                  {"instrument", "add", "IC-09", "--at", "0000-01-01T00:00:00Z"},
                  "lies outside the years 0001 to 9999", "--at"),
      option_case("offset carrying a time past 9999",
                  {"instrument", "add", "IC-09", "--at", "9999-12-31T23:00:00-14:00"},
                  "lies outside the years 0001 to 9999", "--at"),
      option_case("offset carrying a time before year 1",
                  {"instrument", "list", "--at", "0001-01-01T00:30:00+14:00"},
                  "lies outside the years 0001 to 9999", "--at"),
      option_case("an event a century ahead (typo in the year)",
                  {"instrument", "add", "IC-09", "--at", "2126-03-02T09:00:00Z"},
                  "lies more than 5 minutes after now", "--at"),
      option_case("an event ten minutes ahead",
                  {"lot", "withdraw", "CRM-1", "--reason", "x", "--at", "2026-03-02T09:10:00Z"},
                  "lies more than 5 minutes after now", "--at"),
      option_case("a check dated tomorrow",
                  check({"--nominal", "10", "--response", "1", "--at", "2026-03-03T09:00:00Z"}),
                  "lies more than 5 minutes after now", "--at"),
      option_case("time that is a word", {"curve", "list", "--at", "yesterday"},
                  "invalid --at 'yesterday'", "--at"),
      option_case("expiry in the year 0",
                  {"lot", "add", "CRM-2", "--material", "M", "--expires", "0000-05-01", "--value",
                   "nitrate=1"},
                  "--expires '0000-05-01' is not a calendar date", "--expires"),
      option_case("expiry in month 13",
                  {"lot", "add", "CRM-2", "--material", "M", "--expires", "2027-13-01", "--value",
                   "nitrate=1"},
                  "--expires '2027-13-01' is not a calendar date", "--expires"),
      option_case("expiry with a five-digit year",
                  {"lot", "add", "CRM-2", "--material", "M", "--expires", "12027-01-01", "--value",
                   "nitrate=1"},
                  "invalid --expires '12027-01-01'", "--expires"),
      option_case("lot opened in the future",
                  lot_add({"--opened", "2030-01-01", "--value", "nitrate=1"}),
                  "--opened 2030-01-01 lies in the future", "--opened"),
      option_case("since with a five-digit year", {"audit", "log", "--since", "99999-01-01T00:00Z"},
                  "invalid --since", "--since"),
      option_case("window of more than 100 years", {"expiring", "--within", "101 years"},
                  "is longer than 100 years", "--within"),
      option_case("window of zero days", {"expiring", "--within", "0 days"},
                  "must be longer than zero", "--within"),
      option_case("window beyond any count", {"expiring", "--within", "9999999999 days"},
                  "invalid --within '9999999999 days'", "--within"),
      {"window running past the year 9999",
       {"expiring", "--within", "100 years", "--at", "9950-01-01T00:00:00Z"},
       2,
       "lies beyond the year 9999",
       "bad-input"},
      {"CURVEWARDEN_NOW with a five-digit year",
       {"instrument", "list"},
       2,
       "invalid CURVEWARDEN_NOW",
       "bad-input",
       std::nullopt,
       std::nullopt,
       nullptr,
       EnvOverrides{{"CURVEWARDEN_NOW", "10000-01-01T00:00:00Z"}},
       std::nullopt,
       "CURVEWARDEN_NOW"},
      {"CURVEWARDEN_NOW that is not a time",
       {"instrument", "add", "IC-09"},
       2,
       "CURVEWARDEN_NOW '2026-03-02T10:00' does not name its zone",
       "bad-input",
       std::nullopt,
       std::nullopt,
       nullptr,
       EnvOverrides{{"CURVEWARDEN_NOW", "2026-03-02T10:00"}},
       std::nullopt,
       "CURVEWARDEN_NOW"},
      option_case("invalid zone on init", {"init", "--tz", "Mars/Olympus"},
                  "unknown time zone 'Mars/Olympus'", "--tz"),
      option_case("zone that is a path", {"init", "--tz", "../../etc/passwd"},
                  "unknown time zone '../../etc/passwd'", "--tz"),
      option_case("expiry date 2026-02-30",
                  {"lot", "add", "CRM-2", "--material", "M", "--expires", "2026-02-30", "--value",
                   "nitrate=1"},
                  "--expires '2026-02-30' is not a calendar date", "--expires"),
      option_case("malformed opening date",
                  lot_add({"--opened", "2026-3-1", "--value", "nitrate=1"}),
                  "invalid --opened '2026-3-1'", "--opened"),
      option_case("--at without a zone", {"--at", "2026-03-02T10:00", "instrument", "add", "IC-09"},
                  "--at '2026-03-02T10:00' does not name its zone", "--at"),
      option_case("--at at 24:00", {"instrument", "add", "IC-09", "--at", "2026-03-02T24:00:00Z"},
                  "is not a valid time of day", "--at"),
      option_case("--at on 2026-02-30",
                  {"instrument", "add", "IC-09", "--at", "2026-02-30T10:00:00Z"},
                  "--at '2026-02-30T10:00:00Z' is not a calendar date", "--at"),
      option_case("--since without a time of day", {"audit", "log", "--since", "2026-03-01"},
                  "--since '2026-03-01' has no time of day and zone", "--since"),

      // ------------------------------------------------------------------------- free text
      option_case("terminal escape in a reason", withdraw_because("recall " + kEsc),
                  "--reason contains the control or formatting character U+001B", "--reason"),
      option_case("direction override in a reason",
                  withdraw_because("recall " + kRightToLeftOverride + "llaceR"),
                  "--reason contains the control or formatting character U+202E", "--reason"),
      option_case("reason that is not UTF-8", withdraw_because("recall \xff\xfe"),
                  "--reason is not valid UTF-8 text", "--reason"),
      option_case("reason with a line break", withdraw_because("recall\nsecond line"), "U+000A",
                  "--reason"),
      option_case("reason over 2000 characters", withdraw_because(std::string(2001, 'r')),
                  "--reason is 2001 characters long", "--reason"),
      option_case("blank --reason", withdraw_because("   "), "--reason is empty", "--reason"),
      option_case("reason of no-break spaces", withdraw_because(kNoBreakSpace + kNoBreakSpace),
                  "--reason is empty", "--reason"),
      option_case("actor name of one no-break space", {"--as", kNoBreakSpace, "instrument", "list"},
                  "--as is empty", "--as"),
      option_case("empty --as", {"--as", "", "instrument", "add", "IC-09"}, "--as is empty",
                  "--as"),
      option_case("actor name with an escape sequence",
                  {"--as", "bob" + kEsc, "instrument", "list"},
                  "--as contains the control or formatting character U+001B", "--as"),
      {"CURVEWARDEN_USER that is not UTF-8",
       {"instrument", "list"},
       2,
       "CURVEWARDEN_USER is not valid UTF-8 text",
       "bad-input",
       std::nullopt,
       std::nullopt,
       nullptr,
       EnvOverrides{{"CURVEWARDEN_USER", "r\xe9my"}},
       std::nullopt,
       "CURVEWARDEN_USER"},
      option_case("instrument name over 200 characters",
                  {"instrument", "add", "IC-09", "--name", std::string(201, 'n')},
                  "--name is 201 characters long", "--name"),
      option_case("empty sample id",
                  {"quantify", "--curve", "1", "--response", "0.5", "--sample", ""},
                  "--sample is empty", "--sample"),
      option_case("tab in a sample id",
                  {"quantify", "--curve", "1", "--response", "0.5", "--sample", "S\t2"},
                  "--sample contains the control or formatting character U+0009", "--sample"),
      option_case("line break in a material",
                  {"lot", "add", "CRM-2", "--material", "Nitrate\nCRM", "--expires", "2027-03-31",
                   "--value", "nitrate=1"},
                  "--material contains the control or formatting character U+000A", "--material"),
      option_case("invisible space in a note",
                  {"curve", "log", "--method", "ANION-IC", "--instrument", "IC-02", "--lot",
                   "CRM-1", "--points", "good.csv", "--note", "ok" + kZeroWidthSpace + "ok"},
                  "--note contains the control or formatting character U+200B", "--note"),
      option_case("escape sequence in a lab name", {"init", "--lab", "Lab" + kEsc},
                  "--lab contains the control or formatting character U+001B", "--lab"),
      option_case("bell character in an analyte",
                  {"quantify", "--method", "ANION-IC", "--instrument", "IC-02", "--analyte",
                   "nitrate\a", "--response", "1", "--sample", "S"},
                  "--analyte contains the control or formatting character U+0007", "--analyte"),
      option_case("state that is not a state", {"curve", "list", "--state", "valid"},
                  "--state 'valid' is not a state", "--state", "bad-usage"),
      {"no-break space in an instrument code",
       {"instrument", "add", "IC" + kNoBreakSpace + "02"},
       2,
       "instrument code contains the character U+00A0 (character 3)",
       "bad-input"},
      {"lot code that is not UTF-8",
       {"lot", "show", "CRM\xff"},
       2,
       "lot code is not valid UTF-8 text",
       "bad-input"},
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
       "instrument code 'x' OR '1'='1' contains the character '''",
       "bad-input"},
      option_case("lot list with an empty code",
                  {"curve", "log", "--method", "ANION-IC", "--instrument", "IC-02", "--lot",
                   "CRM-1,,X", "--points", "good.csv"},
                  "--lot has an empty code", "--lot", "bad-usage"),

      // ------------------------------------------------------------------------------ lots
      {"--in-use-days without --opened", lot_add({"--in-use-days", "30", "--value", "nitrate=1"}),
       2, "--in-use-days needs --opened DATE", "bad-usage"},
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

      // ------------------------------------------------------------------------ instruments
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
       "give --out or --back, not both",
       "bad-usage"},
      {"unknown method version",
       {"method", "show", "ANION-IC", "--version", "7"},
       2,
       "method 'ANION-IC' has no version 7",
       "not-found"},

      // ------------------------------------------------------------------------ command line
      {"unknown subcommand", {"frobnicate"}, 2, "unknown command 'frobnicate'", "bad-usage"},
      {"unknown option", {"instrument", "list", "--colour"}, 2, "--colour", "bad-usage"},
      {"missing required option", lot_add({}), 2, "--value is required", "bad-usage"},
      {"missing required --material",
       {"lot", "add", "CRM-2", "--expires", "2027-03-31", "--value", "nitrate=1"},
       2,
       "--material is required",
       "bad-usage"},
      {"missing argument", {"instrument", "add"}, 2, "code is required", "bad-usage"},
      {"an extra argument", {"instrument", "add", "IC-09", "IC-10"}, 2, "code", "bad-usage"},
      {"an option given twice",
       {"curve", "list", "--method", "ANION-IC", "--method", "OTHER"},
       2,
       "--method",
       "bad-usage"},
      {"--curve together with --method",
       {"quantify", "--curve", "1", "--method", "ANION-IC", "--response", "1", "--sample", "S"},
       2,
       "give either --curve ID or --method, --instrument and --analyte, not both",
       "bad-usage"},
      {"quantify without a curve or a group",
       {"quantify", "--response", "1", "--sample", "S"},
       2,
       "give --curve ID, or --method CODE --instrument CODE --analyte NAME",
       "bad-usage"},
      {"review with --approve and --reject",
       {"curve", "review", "1", "--approve", "--reject", "--reason", "x"},
       2,
       "give --approve or --reject, not both",
       "bad-usage"},
      {"review with neither --approve nor --reject",
       {"curve", "review", "1", "--reason", "x"},
       2,
       "give --approve or --reject",
       "bad-usage"},
      {"rename of the lab without a reason",
       {"init", "--lab", "Another lab"},
       2,
       "needs --reason TEXT",
       "bad-usage"},

      // ------------------------------------------------------------------------- run files
      file_case("run file: position not a whole number", run_import("pos.csv"),
                "'position' '2.5' is not a whole number", "pos.csv", 3,
                file("pos.csv", run_with(3, "2.5,sample,W-1,nitrate,0.3,"))),
      file_case("run file: positions out of order", run_import("order.csv"),
                "'position' 1 does not come after position 1 (line 2)", "order.csv", 3,
                file("order.csv", run_with(3, "1,sample,W-1,nitrate,0.3,"))),
      file_case("run file: unknown kind", run_import("kind.csv"),
                "'kind' 'standard' is not a kind of row", "kind.csv", 2,
                file("kind.csv", run_with(2, "1,standard,CCV,nitrate,0.5,5"))),
      file_case("run file: empty kind", run_import("nokind.csv"), "'kind' is empty", "nokind.csv",
                3, file("nokind.csv", run_with(3, "2,,W-1,nitrate,0.3,"))),
      file_case("run file: unknown analyte with an escape sequence", run_import("ghost.csv"),
                "contains the control or formatting character U+001B", "ghost.csv", 3,
                file("ghost.csv", run_with(3, "2,sample,W-1,nit\x1b[2Jrate,0.3,"))),
      file_case("run file: unknown analyte", run_import("analyte.csv"),
                "unknown analyte 'chloride' for method 'ANION-IC'", "analyte.csv", 3,
                file("analyte.csv", run_with(3, "2,sample,W-1,chloride,0.3,"))),
      file_case("run file: empty sample id", run_import("sample.csv"), "'sample' is empty",
                "sample.csv", 3, file("sample.csv", run_with(3, "2,sample,,nitrate,0.3,"))),
      file_case(
          "run file: sample id over 200 characters", run_import("long.csv"),
          "'sample' is 201 characters long", "long.csv", 3,
          file("long.csv", run_with(3, "2,sample," + std::string(201, 's') + ",nitrate,0.3,"))),
      file_case("run file: hexadecimal response", run_import("hex.csv"),
                "'response' '0x1A' is not a plain decimal number", "hex.csv", 3,
                file("hex.csv", run_with(3, "2,sample,W-1,nitrate,0x1A,"))),
      file_case("run file: overflowing response", run_import("huge.csv"),
                "'response' '1e999' is out of range", "huge.csv", 3,
                file("huge.csv", run_with(3, "2,sample,W-1,nitrate,1e999,"))),
      file_case("run file: nominal on a sample row", run_import("nominal.csv"),
                "'nominal' is given on a sample row", "nominal.csv", 3,
                file("nominal.csv", run_with(3, "2,sample,W-1,nitrate,0.3,5"))),
      file_case("run file: check without a nominal", run_import("nonom.csv"),
                "a check standard needs its nominal concentration", "nonom.csv", 2,
                file("nonom.csv", run_with(2, "1,check,CCV,nitrate,0.5,"))),
      file_case("run file: blank with a nominal", run_import("blank.csv"),
                "a blank has nominal 0, got 5", "blank.csv", 2,
                file("blank.csv", run_with(2, "1,blank,CCB,nitrate,0.001,5"))),
      file_case("run file: zero dilution", run_import("dil.csv"), "'dilution' must be above 0",
                "dil.csv", 3,
                file("dil.csv",
                     "position,kind,sample,analyte,response,dilution,nominal\n"
                     "1,check,CCV,nitrate,0.5,,5\n2,sample,W-1,nitrate,0.3,0,\n")),
      file_case("run file: dilution on a check", run_import("dilcheck.csv"),
                "'dilution' is given on a check row", "dilcheck.csv", 2,
                file("dilcheck.csv",
                     "position,kind,sample,analyte,response,dilution,nominal\n"
                     "1,check,CCV,nitrate,0.5,2,5\n")),
      file_case("run file: internal-standard response without an internal standard",
                run_import("is.csv"), "has no internal standard; 'is_response' does not apply",
                "is.csv", 2,
                file("is.csv",
                     "position,kind,sample,analyte,response,is_response\n"
                     "1,sample,W-1,nitrate,0.3,2\n")),
      file_case("run file: not UTF-8", run_import("latin1.csv"), "is not UTF-8 text", "latin1.csv",
                3, file("latin1.csv", run_with(3, "2,sample,W-\xe4,nitrate,0.3,"))),
      file_case("run file: a named pipe", run_import("pipe.csv"),
                "run file 'pipe.csv': is a named pipe (FIFO)", "pipe.csv", std::nullopt,
                fifo("pipe.csv"), 1.0),
      file_case(
          "run file: a directory", run_import("folder"), "is a directory", "folder", std::nullopt,
          [](Sandbox& box) { std::filesystem::create_directory(box.path("folder")); }, 1.0),
      file_case("run file: missing", run_import("nowhere.csv"),
                "run file 'nowhere.csv': no such file", "nowhere.csv", std::nullopt, nullptr),
      file_case("run file: empty", run_import("empty.csv"), "'empty.csv' is empty", "empty.csv", 1,
                file("empty.csv", "")),
      file_case("run file: a header without rows", run_import("header.csv"),
                "has a header but no rows", "header.csv", 2,
                file("header.csv", "position,kind,sample,analyte,response,nominal\n")),
      file_case("run file: unknown column", run_import("unknown.csv"), "unknown column 'Area'",
                "unknown.csv", 1,
                file("unknown.csv", run_with(1, "position,kind,sample,analyte,Area,nominal"))),
      // Another separator: the header is one field, named with its tabs visible, and the hint
      // says what to do (no raw tab in the message: the check below finds none).
      file_case("run file: tab-separated", run_import("tabs.csv"),
                "unknown column 'position\\x09kind\\x09sample", "tabs.csv", 1,
                file("tabs.csv",
                     "position\tkind\tsample\tanalyte\tresponse\n"
                     "1\tsample\tW-1\tnitrate\t0.3\n")),
      file_case(
          "run file: semicolon-separated", run_import("semi.csv"),
          "unknown column 'position;kind;sample;analyte;response'", "semi.csv", 1,
          file("semi.csv", "position;kind;sample;analyte;response\n1;sample;W-1;nitrate;0.3\n")),
      file_case(
          "run file: missing column", run_import("missing.csv"), "missing column 'response'",
          "missing.csv", 1,
          file("missing.csv", "position,kind,sample,analyte,nominal\n1,check,CCV,nitrate,5\n")),
      file_case("run file: unterminated quote", run_import("quote.csv"),
                "a quoted field starting on this line is never closed", "quote.csv", 3,
                file("quote.csv", run_with(3, "2,sample,\"W-1,nitrate,0.3,"))),
      file_case("run file: a row with too few fields", run_import("short.csv"),
                "has 3 fields, the header has 6", "short.csv", 3,
                file("short.csv", run_with(3, "2,sample,W-1"))),
      file_case("run file: a check outside the curve's working range, found while deciding "
                "(rolled back)",
                run_import("outside.csv"),
                "'nominal' 1e-307 mg/L lies outside the curve's working range, 1 to 20 mg/L",
                "outside.csv", 4,
                file("outside.csv", run_with(4, "3,check,CCV,nitrate,0.5,1e-307"))),
      file_case("run file: a concentration that overflows with its dilution (rolled back)",
                run_import("product.csv"), "is not a finite number (it overflows)", "product.csv",
                3,
                file("product.csv",
                     "position,kind,sample,analyte,response,dilution,nominal\n"
                     "1,check,CCV,nitrate,0.5,,5\n2,sample,W-1,nitrate,0.3,1e308,\n"
                     "3,check,CCV,nitrate,0.5,,5\n")),
      file_case("--columns: a mapped header missing from the file",
                run_import("mapped.csv", {"--columns", "response=Area"}),
                "no column 'Area' (--columns maps it to 'response')", "mapped.csv", 1,
                file("mapped.csv", run_with(1, "position,kind,sample,analyte,Signal,nominal"))),
      option_case("--columns: an unknown column name",
                  run_import("good-run.csv", {"--columns", "level=Lvl"}),
                  "--columns names the unknown column 'level'", "--columns"),
      option_case("--columns: an entry without '='",
                  run_import("good-run.csv", {"--columns", "position"}),
                  "--columns entry 'position' has no '='", "--columns"),
      option_case("--columns: empty", run_import("good-run.csv", {"--columns", ""}),
                  "--columns is empty", "--columns"),
      option_case("--columns: a header with a control character",
                  run_import("good-run.csv", {"--columns",
                                              "response=Ar\x07"
                                              "ea"}),
                  "contains the control or formatting character U+0007", "--columns"),
      option_case("--columns: one header for two columns",
                  run_import("good-run.csv", {"--columns", "response=Area,nominal=AREA"}),
                  "--columns maps the header 'AREA' to two columns", "--columns"),
      {"--again without --reason", run_import("good-run.csv", {"--again"}), 2,
       "--again needs --reason TEXT", "bad-usage"},
      {"--reason without --again", run_import("good-run.csv", {"--reason", "why"}), 2,
       "--reason goes with --again", "bad-usage"},
      {"--again on a file never imported",
       run_import("good-run.csv", {"--again", "--reason", "again"}), 2, "was never imported",
       "bad-usage"},
      {"run import with an unknown instrument",
       {"run", "import", "good-run.csv", "--method", "ANION-IC", "--instrument", "IC-99"},
       2,
       "no instrument 'IC-99'",
       "not-found"},
      option_case("run import dated a year ahead",
                  run_import("good-run.csv", {"--at", "2027-03-02T09:00:00Z"}),
                  "lies more than 5 minutes after now", "--at"),

      // --------------------------------------------------------------------- listings, trend
      option_case("run show of id 0", {"run", "show", "0"}, "id '0' is out of range", "id"),
      {"run show of an unknown run", {"run", "show", "99"}, 2, "no run 99", "not-found"},
      option_case("result list with an unknown status", {"result", "list", "--status", "valid"},
                  "--status 'valid' is not a result status", "--status", "bad-usage"),
      option_case("result list since a time without a zone",
                  {"result", "list", "--since", "2026-03-01 10:00"}, "--since", "--since"),
      option_case("result list of run 0", {"result", "list", "--run", "0"},
                  "--run '0' is out of range", "--run"),
      {"result list of an unknown run",
       {"result", "list", "--run", "7"},
       2,
       "no run 7",
       "not-found"},
      option_case("result show of a text id", {"result", "show", "last"},
                  "id 'last' is not a whole number", "id"),
      option_case("check list of a curve that is text", {"check", "list", "--curve", "x"},
                  "--curve 'x' is not a whole number", "--curve"),
      option_case("trend with --last 0",
                  {"trend", "--method", "ANION-IC", "--instrument", "IC-02", "--analyte", "nitrate",
                   "--last", "0"},
                  "--last '0' is out of range", "--last"),
      {"trend of an unknown analyte",
       {"trend", "--method", "ANION-IC", "--instrument", "IC-02", "--analyte", "chloride"},
       2,
       "method 'ANION-IC' has no analyte 'chloride'",
       "bad-input"},
      {"trend of an unknown method",
       {"trend", "--method", "NOPE", "--instrument", "IC-02", "--analyte", "nitrate"},
       2,
       "no method 'NOPE'",
       "not-found"},
      {"instrument columns with --set and --clear",
       {"instrument", "columns", "IC-02", "--set", "response=Area", "--clear"},
       2,
       "give --set or --clear, not both",
       "bad-usage"},
      option_case("instrument columns with an unknown name",
                  {"instrument", "columns", "IC-02", "--set", "colour=Farbe"},
                  "--set names the unknown column 'colour'", "--set"),
      {"instrument columns --clear with nothing saved",
       {"instrument", "columns", "IC-02", "--clear"},
       2,
       "instrument 'IC-02' has no saved columns to clear",
       "bad-input"},
      option_case("curve log --columns with a run-file column",
                  {"curve", "log", "--method", "ANION-IC", "--instrument", "IC-02", "--lot",
                   "CRM-1", "--points", "good.csv", "--columns", "position=Seq"},
                  "--columns names the unknown column 'position'", "--columns"),

      // ------------------------------------------------------------------------------ stores
      option_case("empty --db", {"--db", "", "instrument", "list"}, "--db is empty", "--db",
                  "bad-usage"),
      {"a store path that is a directory",
       {"--db", "folder", "instrument", "list"},
       4,
       "'folder' is not a regular file, so it cannot be a store",
       "store",
       std::nullopt,
       std::nullopt,
       [](Sandbox& box) { std::filesystem::create_directory(box.path("folder")); }},
      {"a store path that is a named pipe",
       {"--db", "pipe.db", "instrument", "list"},
       4,
       "'pipe.db' is not a regular file",
       "store",
       std::nullopt,
       std::nullopt,
       fifo("pipe.db"),
       {},
       std::nullopt,
       std::nullopt,
       1.0},
      {"a store path that is a device",
       {"--db", "/dev/null", "instrument", "list"},
       4,
       "'/dev/null' is not a regular file",
       "store",
       std::nullopt,
       std::nullopt,
       nullptr,
       {},
       std::nullopt,
       std::nullopt,
       1.0},
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
         // A SQLite store file of its own, whatever the sandbox's backend.
         REQUIRE(box.run({"--db", "newer.db", "init", "--tz", "UTC"}).exit_code == 0);
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
  REQUIRE(all.size() >= 80);
  // One populated store, copied for every case (populating takes eight runs of the tool, four of
  // them hashing or checking an Argon2id passphrase). Catch runs this test case once per
  // section: the store is made on the first run only.
  static Sandbox source;
  static const bool populated = (populate(source), true);
  REQUIRE(populated);
  const std::string head_before =
      cw::test::query_text(source, "SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1");
  for (const auto& c : all) {
    DYNAMIC_SECTION(c.name) {
      Sandbox box;
      box.copy_from(source);
      if (c.prepare) c.prepare(box);
      const auto counts = cw::test::table_row_counts(box);
      const std::string watched_before = c.watched ? cw::test::read_file(box.path(*c.watched)) : "";
      const bool missing_store = c.code == "store" && !c.watched;

      // Plain text: the message on stderr, nothing on stdout.
      const RunResult text = box.run(c.args, c.env);
      INFO(text.describe());
      CHECK_FALSE(text.timed_out);
      if (c.max_seconds > 0) CHECK(text.seconds < c.max_seconds);
      CHECK(text.exit_code == c.exit_code);
      CHECK(text.out.empty());
      CHECK_THAT(text.err, Catch::StartsWith("curvewarden: error: "));
      CHECK_THAT(text.err, Catch::Contains(c.message));
      if (c.file) CHECK_THAT(text.err, Catch::Contains(*c.file));
      // Input files are named as file:line[:column] (or "line N" without a file).
      if (c.line) {
        CHECK_THAT(text.err, Catch::Contains((c.file ? *c.file + ":" : std::string("line ")) +
                                             std::to_string(*c.line)));
      }
      // Nothing the tool prints can drive the terminal, or hide a value's tabs as spacing.
      CHECK(text.err.find('\x1b') == std::string::npos);
      CHECK(text.err.find('\t') == std::string::npos);

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
      if (c.option) CHECK(e.at("option") == *c.option);
      CHECK(e.at("exit_code") == c.exit_code);

      // Nothing written: every table of the store has the rows it had, the chain ends where it
      // ended, and files the case points at are byte for byte what they were (or still absent).
      CHECK(cw::test::table_row_counts(box) == counts);
      CHECK(cw::test::query_text(box, "SELECT hash FROM audit_log ORDER BY seq DESC LIMIT 1") ==
            head_before);
      if (c.watched) CHECK(cw::test::read_file(box.path(*c.watched)) == watched_before);
      if (missing_store) {
        CHECK_FALSE(std::filesystem::exists(box.path("missing.db")));
        CHECK_FALSE(std::filesystem::exists(box.path("gone")));
      }
      // And the store is still fully usable.
      for (const auto& after : std::vector<std::vector<std::string>>{
               {"audit", "verify"}, {"curve", "list"}, {"status"}, {"audit", "log"}}) {
        const RunResult r = box.run(after);
        INFO(r.describe());
        CHECK(r.exit_code == 0);
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
  // Nor is a database server's store touched: the zone is refused before it is opened.
  if (box.backend() == cw::test::Backend::Postgresql)
    CHECK(cw::test::table_row_counts(box).empty());
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

TEST_CASE("e2e bad input: help of an unknown command and an unknown entity kind", "[e2e]") {
  Sandbox box;
  const RunResult help = box.run({"help", "nosuch"});
  CHECK(help.exit_code == 2);
  CHECK_THAT(help.err, Catch::Contains("'curvewarden help nosuch': there is no such command"));
  CHECK(box.run({"help", "curve", "log"}).exit_code == 0);
  CHECK(box.run({"help", "curve"}).exit_code == 0);
  CHECK(box.run({"help"}).exit_code == 0);

  REQUIRE(box.run({"init", "--tz", "UTC", "--name", "Ada Quill"}).exit_code == 0);
  const RunResult kind = box.run({"audit", "log", "--entity", "curves", "--json"});
  CHECK(kind.exit_code == 2);
  CHECK_THAT(kind.err, Catch::Contains("--entity 'curves' is not a kind of entity"));
  CHECK(kind.json().at("error").at("option") == "--entity");
  for (const std::string known : {"curve", "sample", "user", "lab"}) {
    INFO(known);
    CHECK(box.run({"audit", "log", "--entity", known}).exit_code == 0);
  }
}
