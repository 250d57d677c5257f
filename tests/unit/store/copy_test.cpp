// SPDX-License-Identifier: Apache-2.0
// store/copy.h: the tables a copy carries are every table of a migrated store that holds facts or
// entries, with the migrated columns in order; a new store is empty for the loader, which
// rolls back when not committed.
#include <catch2/catch.hpp>
#include <set>
#include <string>

#include "store/copy.h"
#include "store/store.h"
#include "store_test_support.h"

namespace {

using cw::store_test::RawDb;
using cw::store_test::TempDir;

std::unique_ptr<cw::store::Store> create(const std::filesystem::path& path) {
  cw::store::OpenOptions o;
  o.location = path.string();
  o.create = true;
  return cw::store::Store::open(o);
}

}  // namespace

// The derived tally steps of settled curves are not copied: the copy builds them from its facts.
TEST_CASE("store copy: the copied tables are every table of the schema, column for column",
          "[store][copy]") {
  TempDir dir;
  const auto path = dir / "s.db";
  create(path);
  RawDb raw(path);
  std::set<std::string> schema;
  for (const auto& row :
       raw.rows("SELECT name FROM sqlite_master WHERE type = 'table' AND name "
                "NOT IN ('schema_migrations', 'sqlite_sequence', 'settled_tallies', "
                "'settled_totals')")) {
    schema.insert(row.at(0));
  }
  std::set<std::string> carried;
  for (const auto& table : cw::store::copy_tables()) {
    const std::string name(table.name);
    INFO("table " << name);
    carried.insert(name);
    const auto columns = raw.rows("SELECT name, \"notnull\", pk FROM pragma_table_info('" + name +
                                  "') ORDER BY cid");
    REQUIRE(columns.size() == table.columns.size());
    for (std::size_t i = 0; i < columns.size(); ++i) {
      CHECK(columns[i].at(0) == table.columns[i].name);
      // An INTEGER PRIMARY KEY is the rowid: never NULL, although SQLite reports notnull 0.
      const bool nullable = columns[i].at(1) == "0" && columns[i].at(2) == "0";
      CHECK(nullable == table.columns[i].nullable);
    }
  }
  CHECK(carried == schema);
  CHECK(cw::store::copy_tables().front().name == "audit_log");
}

TEST_CASE("store copy: a new store is empty, and rows appended without commit are rolled back",
          "[store][copy]") {
  TempDir dir;
  const auto path = dir / "s.db";
  auto store = create(path);
  const auto& audit = cw::store::copy_tables().front();
  const std::string hash(64, 'a');
  {
    auto loader = store->load();
    CHECK(loader->empty());
    loader->append_row(
        audit, {std::int64_t{1}, std::string("2026-03-02T09:00:00Z"),
                std::string("2026-03-02T09:00:00Z"), std::string("alice"), std::string("lab.init"),
                std::string("lab"), std::string("lab"), std::monostate{}, std::int64_t{0},
                std::string("0.1.0"), std::string("{}"), hash, hash, std::monostate{}});
    CHECK_FALSE(loader->empty());
  }
  {
    auto loader = store->load();
    CHECK(loader->empty());
  }
  RawDb raw(path);
  CHECK(raw.integer("SELECT count(*) FROM audit_log") == 0);
}
