// SPDX-License-Identifier: Apache-2.0
// The CSV reader: text split chunk by chunk gives exactly the records of the whole text
// (quotes, doubled quotes, line breaks inside quotes, CRLF and the byte-order mark falling
// across chunks), errors carry the line, and headers are read by name or through a mapping of an
// instrument export's own headers.
#include <catch2/catch.hpp>

#include <set>
#include <string>
#include <vector>

#include "core/error.h"
#include "import/column_map.h"
#include "import/csv.h"

namespace {

using cw::import::CsvHeader;
using cw::import::CsvRecord;
using cw::import::CsvSplitter;
using cw::import::HeaderMapping;

std::vector<CsvRecord> split_whole(const std::string& text) {
  std::vector<CsvRecord> out;
  CsvSplitter s("f.csv");
  s.feed(text, out);
  s.finish(out);
  return out;
}

std::vector<CsvRecord> split_in_chunks(const std::string& text, std::size_t size) {
  std::vector<CsvRecord> out;
  CsvSplitter s("f.csv");
  for (std::size_t i = 0; i < text.size(); i += size) s.feed(text.substr(i, size), out);
  s.finish(out);
  return out;
}

bool same(const std::vector<CsvRecord>& a, const std::vector<CsvRecord>& b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i) {
    if (a[i].line != b[i].line || a[i].fields != b[i].fields) return false;
  }
  return true;
}

cw::SourceLocation location_of(const std::function<void()>& fn) {
  try {
    fn();
  } catch (const cw::ValidationError& e) {
    REQUIRE(e.location());
    return *e.location();
  }
  FAIL("no ValidationError");
  return {};
}

std::string message_of(const std::function<void()>& fn) {
  try {
    fn();
  } catch (const cw::ValidationError& e) {
    return e.what();
  }
  FAIL("no ValidationError");
  return {};
}

const std::set<std::string> kRequired = {"position", "kind", "sample", "analyte", "response"};
const std::set<std::string> kOptional = {"is_response", "dilution", "nominal"};

CsvRecord header(std::vector<std::string> fields) {
  return CsvRecord{1, std::move(fields)};
}

}  // namespace

TEST_CASE("csv: records split chunk by chunk equal the whole text's, at every chunk size",
          "[import]") {
  const std::string text =
      "\xEF\xBB\xBFposition,kind,sample\r\n"
      "1,sample,\"W-01, tap\"\r\n"
      "\r\n"
      "2,check,\"say \"\"hi\"\"\"\n"
      "3,sample,\"two\nlines\"\r"
      "4,  blank  ,  CCB \n"
      "5,sample,last";
  const auto whole = split_whole(text);
  REQUIRE(whole.size() == 6);
  CHECK(whole[0].fields == std::vector<std::string>{"position", "kind", "sample"});
  CHECK(whole[1].fields == std::vector<std::string>{"1", "sample", "W-01, tap"});
  CHECK(whole[2].line == 4);  // the blank line 3 is skipped
  CHECK(whole[2].fields[2] == "say \"hi\"");
  CHECK(whole[3].fields[2] == "two\nlines");
  CHECK(whole[4].line == 7);  // line 5 held the quoted line break; a lone CR ends line 6
  CHECK(whole[4].fields == std::vector<std::string>{"4", "blank", "CCB"});
  CHECK(whole[5].fields == std::vector<std::string>{"5", "sample", "last"});
  for (std::size_t size = 1; size <= text.size(); ++size) {
    INFO("chunk size " << size);
    CHECK(same(split_in_chunks(text, size), whole));
  }
}

TEST_CASE("csv: an unterminated quote and text that is not UTF-8 name their line", "[import]") {
  const auto quote = location_of([] { split_in_chunks("a,b\n1,\"open\n2,3\n", 2); });
  CHECK(quote.line == 2);
  const auto bytes = location_of([] { split_in_chunks("a,b\n1,2\n3,x\xff\n", 3); });
  CHECK(bytes.line == 3);
  CHECK(bytes.column == 2);
}

TEST_CASE("csv header: columns by name, unknown ones refused without a mapping", "[import]") {
  const CsvHeader h = CsvHeader::read(
      "f.csv", header({"Position", "kind", "sample", "analyte", "response", "nominal"}), kRequired,
      kOptional);
  CHECK(h.column_number("position") == 1);
  CHECK(h.column_number("nominal") == 6);
  CHECK_FALSE(h.has_column("dilution"));
  const auto unknown = location_of([] {
    CsvHeader::read("f.csv", header({"position", "kind", "sample", "analyte", "response", "Area"}),
                    kRequired, kOptional);
  });
  CHECK(unknown.column == 6);
  CHECK(message_of([] {
          CsvHeader::read("f.csv", header({"position", "kind", "sample", "analyte"}), kRequired,
                          kOptional);
        }) == "missing column 'response'");
}

TEST_CASE("csv header: an export's own headers read through a mapping", "[import]") {
  const HeaderMapping mapping{
      {{"position", "Seq"}, {"sample", "Sample Name"}, {"response", "Area"}, {"kind", "Type"}},
      "--columns"};
  const CsvHeader h = CsvHeader::read(
      "f.csv",
      header({"Seq", "sample name", "Type", "Retention Time", "analyte", "AREA", "Operator"}),
      kRequired, kOptional, &mapping);
  CHECK(h.column_number("position") == 1);
  CHECK(h.column_number("sample") == 2);  // matched without regard to case
  CHECK(h.column_number("response") == 6);
  CHECK(h.header_of("response") == "AREA");
  CHECK(h.ignored() == std::vector<std::string>{"Retention Time", "Operator"});

  SECTION("a mapped header that is missing is named with the mapping's source") {
    const HeaderMapping dilution{{{"dilution", "Dil. Factor"}}, "the saved columns of IC-02"};
    const std::string m = message_of([&] {
      CsvHeader::read("f.csv", header({"position", "kind", "sample", "analyte", "response"}),
                      kRequired, kOptional, &dilution);
    });
    CHECK(m == "no column 'Dil. Factor' (the saved columns of IC-02 maps it to 'dilution')");
  }
  SECTION("a column present under its own name needs no mapped header") {
    const CsvHeader own =
        CsvHeader::read("f.csv", header({"Seq", "Sample Name", "Type", "analyte", "response"}),
                        kRequired, kOptional, &mapping);
    CHECK(own.column_number("response") == 5);
  }
  SECTION("the mapped header and the column's own name together are ambiguous") {
    const std::string m = message_of([&] {
      CsvHeader::read("f.csv",
                      header({"Seq", "Sample Name", "Type", "analyte", "response", "Area"}),
                      kRequired, kOptional, &mapping);
    });
    CHECK(m ==
          "column 'response' appears twice in the header (as 'response' and as 'Area', which "
          "--columns maps to it)");
  }
  SECTION("names of the other kind of file in a saved mapping are left alone") {
    const HeaderMapping saved{{{"position", "Seq"}, {"level", "Lvl"}}, "saved"};
    const CsvHeader other =
        CsvHeader::read("f.csv", header({"Seq", "kind", "sample", "analyte", "response"}),
                        kRequired, kOptional, &saved);
    CHECK(other.column_number("position") == 1);
  }
}

TEST_CASE("column mapping: NAME=HEADER pairs parsed strictly", "[import]") {
  const std::set<std::string> names = {"position", "sample", "response"};
  const auto m =
      cw::import::parse_column_mapping(" Position = Seq ,sample=Sample Name", names, "--columns");
  CHECK(m == cw::ColumnMapping{{"position", "Seq"}, {"sample", "Sample Name"}});
  const auto fails = [&](const std::string& text) {
    return message_of([&] { cw::import::parse_column_mapping(text, names, "--columns"); });
  };
  CHECK(fails("") == "--columns is empty");
  CHECK(fails("position=Seq,") == "--columns has an empty entry");
  CHECK(fails("position") == "--columns entry 'position' has no '='");
  CHECK(fails("level=L") == "--columns names the unknown column 'level'");
  CHECK(fails("position=Seq,position=Pos") == "--columns maps the column 'position' twice");
  CHECK(fails("position=Seq,sample=SEQ") == "--columns maps the header 'SEQ' to two columns");
  CHECK_THAT(fails("position=Se\x1bq"), Catch::Contains("U+001B"));
  CHECK_THAT(fails("position="), Catch::Contains("is empty"));
}
