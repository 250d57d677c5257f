// SPDX-License-Identifier: Apache-2.0
// The run-file reader: rows streamed one at a time in file order, the file's SHA-256, and every
// problem named by file, line and column before the row is handed out.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>
#include <string>

#include "audit/sha256.h"
#include "core/error.h"
#include "import/run_file.h"

namespace {

using cw::import::RunFileReader;
using cw::import::RunRow;

/// A file in a fresh directory, removed with it.
class TempFile {
 public:
  explicit TempFile(const std::string& content) {
    char pattern[] = "/tmp/curvewarden-runfile-XXXXXX";
    dir_ = mkdtemp(pattern);
    path_ = dir_ / "run.csv";
    std::ofstream(path_, std::ios::binary) << content;
  }
  ~TempFile() { std::filesystem::remove_all(dir_); }
  std::string path() const { return path_.string(); }

 private:
  std::filesystem::path dir_, path_;
};

cw::MethodDefinition method(bool internal_standard = false) {
  cw::MethodDefinition d;
  d.code = "ANION-IC";
  d.unit = "mg/L";
  d.analytes = {"nitrate", "sulfate"};
  if (internal_standard) d.internal_standard = "bromide";
  return d;
}

std::vector<RunRow> read_all(RunFileReader& r) {
  std::vector<RunRow> rows;
  while (auto row = r.next()) rows.push_back(*row);
  return rows;
}

struct Failure {
  std::string message;
  cw::SourceLocation where;
};

Failure failure(const std::string& content, const cw::MethodDefinition& m = method()) {
  TempFile f(content);
  try {
    RunFileReader r(f.path(), m);
    read_all(r);
  } catch (const cw::ValidationError& e) {
    return {e.what(), e.location().value_or(cw::SourceLocation{})};
  }
  FAIL("no ValidationError for:\n" << content);
  return {};
}

const std::string kHeader = "position,kind,sample,analyte,response,dilution,nominal\n";

}  // namespace

TEST_CASE("run file: rows in order with their values and the file's SHA-256", "[import]") {
  const std::string content = kHeader +
                              "1,check,CCV-1,nitrate,13.5,,6\n"
                              "2,blank,,nitrate,0.2,,\n"
                              "3,SAMPLE,W-01,nitrate,9.0,2,\n"
                              "5,sample,W-02,sulfate,1e1,,\n";
  TempFile f(content);
  RunFileReader r(f.path(), method());
  const auto rows = read_all(r);
  REQUIRE(rows.size() == 4);
  CHECK(rows[0].kind == cw::RunRowKind::Check);
  CHECK(rows[0].nominal == 6.0);
  CHECK(rows[0].sample == "CCV-1");
  CHECK(rows[1].kind == cw::RunRowKind::Blank);
  CHECK_FALSE(rows[1].nominal);
  CHECK(rows[2].kind == cw::RunRowKind::Sample);  // kinds are read without regard to case
  CHECK(rows[2].dilution == 2.0);
  CHECK(rows[2].line == 4);
  CHECK(rows[3].position == 5);  // positions may skip numbers
  CHECK(rows[3].response == 10.0);
  CHECK(r.rows() == 4);
  CHECK(r.sha256() == cw::audit::sha256_hex(content));
}

TEST_CASE("run file: every problem names the file, line and column", "[import]") {
  struct Case {
    const char* what;
    std::string row;  ///< line 2, after the header
    long column;
    std::string message;
  };
  const std::vector<Case> cases = {
      {"position not a whole number", "1.5,sample,W,nitrate,1,,", 1,
       "'position' '1.5' is not a whole number"},
      {"position zero", "0,sample,W,nitrate,1,,", 1, "'position' '0' is out of range"},
      {"unknown kind", "1,std,W,nitrate,1,,", 2, "'kind' 'std' is not a kind of row"},
      {"empty sample id", "1,sample,,nitrate,1,,", 3, "'sample' is empty"},
      {"control character in a sample id", "1,sample,W\x07,nitrate,1,,", 3, "U+0007"},
      {"unknown analyte", "1,sample,W,chloride,1,,", 4, "unknown analyte 'chloride'"},
      {"hexadecimal response", "1,sample,W,nitrate,0x1A,,", 5,
       "'response' '0x1A' is not a plain decimal number"},
      {"empty response", "1,sample,W,nitrate,,,", 5, "'response' is empty"},
      {"zero dilution", "1,sample,W,nitrate,1,0,", 6, "'dilution' must be above 0"},
      {"dilution on a check", "1,check,C,nitrate,1,2,6", 6, "'dilution' is given on a check row"},
      {"nominal on a sample", "1,sample,W,nitrate,1,,6", 7, "'nominal' is given on a sample row"},
      {"check without nominal", "1,check,C,nitrate,1,,", 7, "a check standard needs its nominal"},
      {"check with a negative nominal", "1,check,C,nitrate,1,,-6", 7, "'nominal' must be above 0"},
      {"blank with a nominal", "1,blank,B,nitrate,1,,5", 7, "a blank has nominal 0"},
  };
  for (const auto& c : cases) {
    INFO(c.what);
    const Failure f = failure(kHeader + c.row + "\n");
    CHECK_THAT(f.message, Catch::Contains(c.message));
    CHECK(f.where.line == 2);
    CHECK(f.where.column == c.column);
    CHECK_THAT(f.where.file, Catch::EndsWith("run.csv"));
  }
}

TEST_CASE("run file: positions must increase from row to row", "[import]") {
  const Failure f = failure(kHeader + "1,sample,A,nitrate,1,,\n" + "3,sample,B,nitrate,1,,\n" +
                            "3,sample,C,nitrate,1,,\n");
  CHECK(f.message == "'position' 3 does not come after position 3 (line 3)");
  CHECK(f.where.line == 4);
  CHECK(f.where.column == 1);
}

TEST_CASE("run file: the internal standard is required exactly when the method uses one",
          "[import]") {
  const Failure missing_column = failure(kHeader + "1,sample,A,nitrate,1,,\n", method(true));
  CHECK_THAT(missing_column.message, Catch::Contains("has no 'is_response' column"));
  const std::string with_is = "position,kind,sample,analyte,response,is_response\n";
  const Failure empty = failure(with_is + "1,sample,A,nitrate,1,\n", method(true));
  CHECK_THAT(empty.message, Catch::Contains("uses the internal standard 'bromide'"));
  CHECK(empty.where.column == 6);
  const Failure stray = failure(with_is + "1,sample,A,nitrate,1,2\n", method(false));
  CHECK_THAT(stray.message, Catch::Contains("has no internal standard"));
  CHECK(stray.where.column == 6);
}

TEST_CASE("run file: empty files, headers without rows and short rows are refused", "[import]") {
  CHECK_THAT(failure("").message, Catch::Contains("is empty"));
  CHECK_THAT(failure(kHeader).message, Catch::Contains("has a header but no rows"));
  const Failure short_row = failure(kHeader + "1,sample,A\n");
  CHECK_THAT(short_row.message, Catch::Contains("has 3 fields, the header has 7"));
  CHECK(short_row.where.line == 2);
}
