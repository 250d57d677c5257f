// SPDX-License-Identifier: Apache-2.0
// `store copy` on SQLite: rows read as they are stored and appended as they were read.
#include "store/sqlite/copy.h"

#include <string>

#include "store/sqlite/settled_tallies.h"

namespace cw::store::sqlite {
namespace {

std::string column_list(const CopyTable& table) {
  std::string list;
  for (std::size_t i = 0; i < table.columns.size(); ++i) {
    list += (i ? ", " : "") + std::string(table.columns[i].name);
  }
  return list;
}

}  // namespace

void SqliteTableRows::each_row(const CopyTable& table,
                               const std::function<void(const CopyRow&)>& row) {
  guarded(db_, [&] {
    SQLite::Statement s(*db_.db, "SELECT " + column_list(table) + " FROM " +
                                     std::string(table.name) + " ORDER BY " +
                                     std::string(table.columns.front().name));
    CopyRow values(table.columns.size());
    while (s.executeStep()) {
      for (std::size_t i = 0; i < table.columns.size(); ++i) {
        const SQLite::Column c = s.getColumn(static_cast<int>(i));
        if (c.isInteger()) {
          values[i] = c.getInt64();
        } else if (c.isFloat()) {
          values[i] = c.getDouble();
        } else if (c.isText()) {
          values[i] = c.getString();
        } else if (c.isNull()) {
          values[i] = std::monostate{};
        } else {
          damaged(db_.path, std::string(table.name) + "." + std::string(table.columns[i].name) +
                                " holds a blob");
        }
      }
      row(values);
    }
  });
}

SqliteLoader::SqliteLoader(Database& db) : db_(db) {
  guarded(db_, [&] {
    db_.release_statements();
    db_.db->exec("BEGIN IMMEDIATE");
    open_ = true;
    // Rows reference rows of the same copy: check every key once, at commit.
    db_.db->exec("PRAGMA defer_foreign_keys = ON");
  });
}

SqliteLoader::~SqliteLoader() {
  inserts_.clear();
  if (open_) {
    try {
      db_.release_statements();
      db_.db->exec("ROLLBACK");
    } catch (...) {
      // A destructor must not throw; SQLite rolls back an unfinished transaction anyway.
    }
  }
}

bool SqliteLoader::empty() {
  return guarded(db_, [&] {
    for (const CopyTable& table : copy_tables()) {
      SQLite::Statement s(*db_.db, "SELECT EXISTS (SELECT 1 FROM " + std::string(table.name) + ")");
      if (s.executeStep() && s.getColumn(0).getInt64() != 0) return false;
    }
    return true;
  });
}

void SqliteLoader::append_row(const CopyTable& table, const CopyRow& row) {
  guarded(db_, [&] {
    auto& insert = inserts_[table.name];
    if (!insert) {
      std::string marks;
      for (std::size_t i = 0; i < table.columns.size(); ++i) marks += i ? ", ?" : "?";
      insert = std::make_unique<SQLite::Statement>(
          *db_.db, "INSERT INTO " + std::string(table.name) + " (" + column_list(table) +
                       ") VALUES (" + marks + ")");
    }
    insert->reset();
    insert->clearBindings();
    for (std::size_t i = 0; i < row.size(); ++i) {
      const int index = static_cast<int>(i) + 1;
      if (const auto* n = std::get_if<std::int64_t>(&row[i])) {
        insert->bind(index, *n);
      } else if (const auto* d = std::get_if<double>(&row[i])) {
        insert->bind(index, *d);
      } else if (const auto* t = std::get_if<std::string>(&row[i])) {
        insert->bind(index, *t);
      } else {
        insert->bind(index);
      }
    }
    insert->exec();
  });
}

void SqliteLoader::commit() {
  guarded(db_, [&] {
    inserts_.clear();
    // The derived steps of settled curves are not copied: they are built from the copied facts.
    build_settled_tallies(db_);
    build_settled_totals(db_);
    db_.release_statements();
    db_.db->exec("COMMIT");
    open_ = false;
  });
}

}  // namespace cw::store::sqlite
