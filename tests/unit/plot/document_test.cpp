// SPDX-License-Identifier: Apache-2.0
// Checks render_document(): tables broken across pages under repeated headers, wrapped text
// kept whole, figures drawn as vector graphics, page breaks, footers on every page, the PDF's
// metadata and reproducible bytes.
#include <catch2/catch.hpp>
#include <chrono>
#include <cmath>
#include <filesystem>
#include <string>
#include <vector>

#include "core/error.h"
#include "plot/document.h"
#include "plot_test_support.h"

namespace {

using Catch::Matchers::Contains;
using cw::plot::Banner;
using cw::plot::Document;
using cw::plot::Heading;
using cw::plot::KeyValueList;
using cw::plot::PageBreak;
using cw::plot::Paragraph;
using cw::plot::Table;
using namespace plot_test;

const cw::Instant kCreated =
    std::chrono::sys_days{std::chrono::year{2024} / 4 / 2} + std::chrono::hours{8};

std::string squeeze(const std::string& text) {
  std::string out;
  for (char c : text) {
    if (c == ' ' && !out.empty() && out.back() == ' ') continue;
    out += c;
  }
  return out;
}

// Text without any whitespace: words a wrapped cell split over lines join up again.
std::string joined(const std::string& text) {
  std::string out;
  for (char c : text) {
    if (c != ' ' && c != '\n' && c != '\f') out += c;
  }
  return out;
}

Document base() {
  Document d;
  d.title = "Document engine check";
  d.subtitle = "Tables, text and figures on A4";
  d.running_head_left = "Test laboratory";
  d.running_head_right = "Engine check";
  d.generated_text = "Generated 2024-04-02 10:00 +02:00";
  d.footer_caution = "A qualified person reviews results before release.";
  d.created_at = kCreated;
  d.author = "Test laboratory";
  return d;
}

Table long_table(int rows) {
  Table t;
  t.caption = "Readings";
  t.columns = {{"Row", true}, {"Label"}, {"Amount", true}, {"Comment", false, true}};
  for (int i = 1; i <= rows; ++i) {
    Table::Row row{{std::to_string(i), "item-" + std::to_string(i),
                    std::to_string(i * 7 % 1000) + ".25", i % 9 == 0 ? "checked twice" : ""}};
    if (i % 50 == 0) row.style = Table::Row::Style::Strong;
    if (i % 45 == 0) row.style = Table::Row::Style::Muted;
    t.rows.push_back(row);
  }
  return t;
}

int pages_of(const std::string& path) {
  const std::string pages = pdf_info(path, "Pages");
  return pages.empty() ? 0 : std::stoi(pages);
}

}  // namespace

TEST_CASE("render_document: a long table repeats its header on every page", "[plot][document]") {
  Document d = base();
  d.blocks.push_back(Heading{"1  Readings"});
  d.blocks.push_back(long_table(300));
  const std::string path = out_path("document-long-table.pdf");
  const int pages = cw::plot::render_document(d, path);
  CHECK(pages >= 4);
  if (!have_tool("pdftotext")) return;
  CHECK(pages_of(path) == pages);
  for (int p = 1; p <= pages; ++p) {
    INFO("page " << p);
    const std::string text = squeeze(pdf_text(path, p));
    CHECK_THAT(text, Contains("Row Label Amount Comment"));
    if (p > 1) CHECK_THAT(text, Contains("Readings (continued)"));
    CHECK_THAT(text, Contains("page " + std::to_string(p) + " of " + std::to_string(pages)));
    CHECK_THAT(text, Contains("Generated 2024-04-02 10:00 +02:00"));
    CHECK_THAT(text, Contains("A qualified person reviews results before release."));
    CHECK_THAT(text, Contains("Test laboratory"));
    CHECK_THAT(text, Contains("Engine check"));
  }
  // No row lost or repeated at a page break.
  const std::string all = pdf_text(path);
  for (int i = 1; i <= 300; ++i) {
    const std::string label = "item-" + std::to_string(i) + " ";
    std::size_t count = 0;
    for (std::size_t at = all.find(label); at != std::string::npos; at = all.find(label, at + 1)) {
      ++count;
    }
    CHECK(count == 1);
  }
}

TEST_CASE("render_document: long text wraps without losing a word", "[plot][document]") {
  Document d = base();
  std::string paragraph;
  for (int i = 0; i < 120; ++i) paragraph += "word" + std::to_string(i) + " ";
  d.blocks.push_back(Paragraph{paragraph});
  d.blocks.push_back(Paragraph{paragraph, Paragraph::Style::Notice});
  Table t;
  t.columns = {{"Key"}, {"Reason", false, true}, {"Value", true}};
  t.rows.push_back({{"a", paragraph, "1.5"}});
  // An unbreakable token wider than its column is broken within the word.
  t.rows.push_back({{"b", std::string(150, 'x') + "END", ""}});
  d.blocks.push_back(t);
  KeyValueList kv;
  kv.entries.push_back({"Hash", std::string(64, 'f') + std::string(64, 'e'), true});
  d.blocks.push_back(kv);
  const std::string path = out_path("document-wrapping.pdf");
  cw::plot::render_document(d, path);
  if (!have_tool("pdftotext")) return;
  const std::string all = joined(pdf_text(path));
  for (int i = 0; i < 120; ++i) CHECK_THAT(all, Contains("word" + std::to_string(i)));
  CHECK_THAT(all, Contains(std::string(150, 'x') + "END"));
  CHECK_THAT(all, Contains(std::string(64, 'f') + std::string(64, 'e')));
}

TEST_CASE("render_document: figures are vector drawings in the page", "[plot][document]") {
  Document d = base();
  cw::plot::ControlChart chart;
  chart.title = "Check CS-10 on the page";
  chart.analyte = "nitrate";
  chart.low_3s = 94;
  chart.low_2s = 96;
  chart.high_2s = 104;
  chart.high_3s = 106;
  for (int i = 0; i < 20; ++i) {
    chart.points.push_back({"C" + std::to_string(i), "03-" + std::to_string(10 + i), std::nullopt,
                            100 + 3 * std::sin(i * 2.4)});
  }
  chart.page.created_at = kCreated;
  d.blocks.push_back(Heading{"1  Control chart"});
  d.blocks.push_back(cw::plot::Figure{chart, "Figure 1: recoveries of the check standard."});
  d.blocks.push_back(PageBreak{});
  d.blocks.push_back(Heading{"2  After the break"});
  d.blocks.push_back(
      Banner{{{"Outcome", "all within limits", false}, {"Action", "none needed", true}}});
  const std::string path = out_path("document-figure.pdf");
  CHECK(cw::plot::render_document(d, path) == 2);
  if (!have_tool("pdftotext")) return;
  const std::string first = squeeze(pdf_text(path, 1));
  // The chart's own text is text in the PDF, not pixels.
  CHECK_THAT(first, Contains("Check CS-10 on the page"));
  CHECK_THAT(first, Contains("Figure 1: recoveries of the check standard."));
  CHECK_THAT(squeeze(pdf_text(path, 2)), Contains("2 After the break"));
  CHECK_THAT(squeeze(pdf_text(path, 2)), Contains("all within limits"));
  if (have_tool("pdfimages")) {
    // No embedded raster image: the header and rule lines of the listing only.
    const auto images = run("pdfimages -list '" + path + "'");
    REQUIRE(images);
    int lines = 0;
    for (char c : *images) lines += c == '\n' ? 1 : 0;
    CHECK(lines == 2);
  }
}

TEST_CASE("render_document: the same document gives the same bytes", "[plot][document]") {
  Document d = base();
  d.blocks.push_back(Heading{"1  Readings"});
  d.blocks.push_back(long_table(120));
  const std::string a = out_path("document-repeat-a.pdf");
  const std::string b = out_path("document-repeat-b.pdf");
  cw::plot::render_document(d, a);
  cw::plot::render_document(d, b);
  CHECK(read_bytes(a) == read_bytes(b));
  if (!have_tool("pdfinfo")) return;
  CHECK(pdf_info(a, "CreationDate") == "2024-04-02T08:00:00Z");
  CHECK(pdf_info(a, "Title") == "Document engine check");
  CHECK(pdf_info(a, "Author") == "Test laboratory");
  CHECK(pdf_info(a, "Page size").rfind("595 x 842 pts (A4)", 0) == 0);
}

TEST_CASE("render_document: a heading is never the last thing on a page", "[plot][document]") {
  Document d = base();
  // Fill most of page 1 so that the second heading would fall at its foot.
  std::string text;
  for (int i = 0; i < 60; ++i) text += "filler" + std::to_string(i) + " text for the page ";
  for (int k = 0; k < 5; ++k) d.blocks.push_back(Paragraph{text});
  d.blocks.push_back(Heading{"9  Kept with its table"});
  d.blocks.push_back(long_table(3));
  const std::string path = out_path("document-keep.pdf");
  const int pages = cw::plot::render_document(d, path);
  if (!have_tool("pdftotext")) return;
  for (int p = 1; p <= pages; ++p) {
    const std::string page = squeeze(pdf_text(path, p));
    if (page.find("9 Kept with its table") == std::string::npos) continue;
    CHECK_THAT(page, Contains("item-1 "));
  }
}

TEST_CASE("render_document: text that is not UTF-8 and an empty table", "[plot][document]") {
  Document d = base();
  d.title = "Caf\xe9 report";
  Table t;
  t.columns = {{"Only"}};
  t.empty_text = "nothing recorded";
  d.blocks.push_back(t);
  const std::string path = out_path("document-odd-text.pdf");
  CHECK(cw::plot::render_document(d, path) == 1);
  if (!have_tool("pdftotext")) return;
  CHECK_THAT(pdf_text(path), Contains("nothing recorded"));
}

TEST_CASE("render_document: refuses a path that is not a PDF", "[plot][document]") {
  const std::string path = out_path("document.svg");
  std::filesystem::remove(path);
  CHECK_THROWS_AS(cw::plot::render_document(base(), path), cw::ValidationError);
  CHECK_FALSE(std::filesystem::exists(path));
}

TEST_CASE("render_document: short wrapping columns are not squeezed by a long one",
          "[plot][document]") {
  Document d = base();
  Table t;
  t.columns = {{"Position", true},      {"Sample code"},        {"Value", true},
               {"Uncertainty", true},   {"Flags", false, true}, {"Status"},
               {"Reasons", false, true}};
  std::string reason;
  for (int i = 0; i < 40; ++i) reason += "because" + std::to_string(i) + " ";
  for (int i = 0; i < 30; ++i) {
    t.rows.push_back({{std::to_string(i), "WS-24-" + std::to_string(1000 + i), "12.25 mg/L",
                       "± 0.75", "diluted ×10", "reported", i % 5 == 0 ? reason : ""}});
  }
  d.blocks.push_back(t);
  const std::string path = out_path("document-column-share.pdf");
  cw::plot::render_document(d, path);
  if (!have_tool("pdftotext")) return;
  const std::string text = squeeze(pdf_text(path));
  // Every flag stays on its row's line: the long reasons column gives way, not the short one.
  std::size_t rows_with_flag = 0;
  for (std::size_t at = text.find("± 0.75 diluted ×10 reported"); at != std::string::npos;
       at = text.find("± 0.75 diluted ×10 reported", at + 1)) {
    ++rows_with_flag;
  }
  CHECK(rows_with_flag == 30);
}
