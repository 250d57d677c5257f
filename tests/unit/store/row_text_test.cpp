// SPDX-License-Identifier: Apache-2.0
// The canonical text of fact rows, written by hand for speed (append_canonical_row_text, from a
// statement or from a row copied by copy_row), against the JSON object nlohmann builds and dumps
// for the same row (canonical_row(...).dump(), the form every store so far was hashed with): on
// many random rows of every fact table, with awkward reals, integers near the ends of their range,
// text beyond ASCII and control characters, and NULLs.
#include <SQLiteCpp/SQLiteCpp.h>
#include <sqlite3.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <nlohmann/json.hpp>
#include <random>
#include <string>
#include <string_view>

#include "audit/json_text.h"
#include "core/error.h"
#include "store/row_form.h"
#include "store/sqlite/rows.h"
#include "store/sqlite/scan.h"

namespace {

using cw::store::Column;
using cw::store::ColumnType;
using cw::store::TableForm;

class Random {
 public:
  explicit Random(std::uint64_t seed) : engine_(seed) {}

  std::uint64_t below(std::uint64_t n) { return engine_() % n; }
  bool one_in(std::uint64_t n) { return below(n) == 0; }

  double real() {
    static const double kAwkward[] = {0.1,
                                      0.2,
                                      0.30000000000000004,
                                      1e300,
                                      -1e300,
                                      1e-300,
                                      5e-324,
                                      -5e-324,
                                      2.2250738585072014e-308,
                                      1.7976931348623157e308,
                                      -0.0,
                                      0.0,
                                      1.0,
                                      -1.0,
                                      7.0,
                                      1000.0,
                                      1e15,
                                      1e16,
                                      1e17,
                                      123456789012345680.0,
                                      2.5e21,
                                      1e-4,
                                      1e-5,
                                      9.999999999999999e22,
                                      0.5073796687666039,
                                      9007199254740993.0,
                                      4.940656458412465e-324};
    switch (below(4)) {
      case 0:
        return kAwkward[below(std::size(kAwkward))];
      case 1: {
        // Any finite bit pattern.
        for (;;) {
          const std::uint64_t bits = engine_();
          double d = 0;
          std::memcpy(&d, &bits, sizeof d);
          if (std::isfinite(d)) return d;
        }
      }
      case 2:
        return static_cast<double>(static_cast<std::int64_t>(below(2000000)) - 1000000) / 1000.0;
      default:
        return std::ldexp(static_cast<double>(engine_() >> 11), static_cast<int>(below(120)) - 100);
    }
  }

  std::int64_t integer() {
    constexpr auto kMax = std::numeric_limits<std::int64_t>::max();
    constexpr auto kMin = std::numeric_limits<std::int64_t>::min();
    switch (below(5)) {
      case 0:
        return kMax - static_cast<std::int64_t>(below(1000));
      case 1:
        return kMin + static_cast<std::int64_t>(below(1000));
      case 2:
        return static_cast<std::int64_t>(below(3)) - 1;
      case 3:
        return static_cast<std::int64_t>(engine_());
      default:
        return static_cast<std::int64_t>(below(100000));
    }
  }

  std::string text() {
    // ASCII first (half the texts are made of these only), then text beyond ASCII.
    static const char* const kPieces[] = {"a",
                                          "Z",
                                          " ",
                                          "\"",
                                          "\\",
                                          "/",
                                          "\n",
                                          "\r",
                                          "\t",
                                          "\b",
                                          "\f",
                                          "\x01",
                                          "\x1f",
                                          "\x7f",
                                          "{\"k\":[",
                                          "]}",
                                          "g/L",
                                          "0.1",
                                          "nitrate",
                                          "ICH Q2: sigma = response SD",
                                          "\xc3\xa9",
                                          "\xc2\xb5",
                                          "\xe2\x82\xac",
                                          "\xe2\x9c\x93",
                                          "\xf0\x9f\xa7\xaa",
                                          "\xef\xbf\xbd",
                                          "\u2028"};
    constexpr std::size_t kAscii = 20;
    const std::size_t choices = one_in(2) ? kAscii : std::size(kPieces);
    std::string out;
    const std::uint64_t pieces = one_in(5) ? 0 : below(40);
    for (std::uint64_t i = 0; i < pieces; ++i) out += kPieces[below(choices)];
    if (one_in(8)) out.append(static_cast<std::size_t>(below(3000)), 'x');
    return out;
  }

 private:
  std::mt19937_64 engine_;
};

std::string sql_type(ColumnType t) {
  switch (t) {
    case ColumnType::Integer:
    case ColumnType::Boolean:
      return "INTEGER";
    case ColumnType::Real:
      return "REAL";
    default:
      return "TEXT";
  }
}

/// A table of `form`'s columns in a fresh in-memory database, filled with `rows` random rows.
void fill(SQLite::Database& db, const TableForm& form, Random& random, int rows) {
  std::string create = "CREATE TABLE " + std::string(form.name) + " (";
  std::string insert = "INSERT INTO " + std::string(form.name) + " VALUES (";
  for (std::size_t i = 0; i < form.columns.size(); ++i) {
    create +=
        (i ? ", " : "") + std::string(form.columns[i].name) + " " + sql_type(form.columns[i].type);
    insert += i ? ", ?" : "?";
  }
  db.exec(create + ")");
  SQLite::Statement s(db, insert + ")");
  for (int r = 0; r < rows; ++r) {
    s.reset();
    for (std::size_t i = 0; i < form.columns.size(); ++i) {
      const Column& c = form.columns[i];
      const int index = static_cast<int>(i) + 1;
      if (c.nullable && random.one_in(3)) {
        s.bind(index);
        continue;
      }
      switch (c.type) {
        case ColumnType::Integer:
          s.bind(index, static_cast<std::int64_t>(random.integer()));
          break;
        case ColumnType::Boolean:
          s.bind(index, static_cast<int>(random.below(2)));
          break;
        case ColumnType::Real:
          s.bind(index, random.real());
          break;
        default:
          s.bind(index, random.text());
      }
    }
    s.exec();
  }
}

}  // namespace

TEST_CASE("audit: the hand-written canonical row is nlohmann's dump of the row, on random rows",
          "[store][audit]") {
  Random random(20261203);
  std::size_t compared = 0;
  for (const cw::store::FactTable t : cw::store::kAllFactTables) {
    const TableForm& form = cw::store::form_of(t);
    SQLite::Database db(":memory:", SQLite::OPEN_READWRITE | SQLite::OPEN_CREATE);
    fill(db, form, random, 300);
    SQLite::Statement json_rows(db, cw::store::sqlite::select_of(form, " ORDER BY rowid"));
    cw::store::sqlite::Scan text_rows(db, cw::store::sqlite::select_of(form, " ORDER BY rowid"));
    cw::store::sqlite::CopiedRow copied;
    cw::audit::RealWriter reals;
    std::string copy;
    while (json_rows.executeStep()) {
      REQUIRE(text_rows.step());
      const std::string expected = cw::store::sqlite::canonical_row(json_rows, form, "x").dump();
      std::string text = "[";
      cw::store::sqlite::append_canonical_row_text(text, text_rows.row(), form, "x");
      CHECK(text.substr(1) == expected);

      copy.clear();
      cw::store::sqlite::copy_row(copy, text_rows.row(), form);
      std::string_view rest = copy;
      cw::store::sqlite::read_copied_row(rest, copied);
      CHECK(rest.empty());
      CHECK(copied.table == t);
      text = "[";
      cw::store::sqlite::append_canonical_row_text(text, copied, reals, "x");
      CHECK(text.substr(1) == expected);
      ++compared;
    }
    CHECK_FALSE(text_rows.step());
  }
  CHECK(compared == 300 * cw::store::kAllFactTables.size());
}

TEST_CASE("audit: JSON text pieces are nlohmann's dump of the same values, on random values",
          "[store][audit]") {
  Random random(7);
  cw::audit::RealWriter reals;
  for (int i = 0; i < 20000; ++i) {
    const double d = random.real();
    std::string real;
    cw::audit::append_json_real(real, d);
    CHECK(real == nlohmann::json(d).dump());
    std::string remembered = "x";  // appended, not assigned; often a value met before
    reals.append(remembered, d);
    CHECK(remembered.substr(1) == real);

    const std::int64_t n = random.integer();
    std::string integer;
    cw::audit::append_json_integer(integer, n);
    CHECK(integer == nlohmann::json(n).dump());

    const std::string t = random.text();
    std::string text = "x";  // appended, not assigned
    cw::audit::append_json_string(text, t);
    CHECK(text.substr(1) == nlohmann::json(t).dump());
  }
  for (const double d :
       {std::numeric_limits<double>::infinity(), -std::numeric_limits<double>::infinity(),
        std::numeric_limits<double>::quiet_NaN()}) {
    std::string real;
    cw::audit::append_json_real(real, d);
    CHECK(real == nlohmann::json(d).dump());
  }
  std::string text;
  CHECK_THROWS(cw::audit::append_json_string(text, "\xff\xfe"));  // not UTF-8, as nlohmann
  CHECK_THROWS(cw::audit::append_json_string(text, "ok \xc3"));   // cut short
}
