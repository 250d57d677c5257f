// SPDX-License-Identifier: Apache-2.0
// `store copy` on PostgreSQL: rows read in their columns' logical types and appended as they
// were read, ids and audit_seq included. Ids given afterwards are max(id) + 1, so they continue
// after the copied ones without a sequence to set.
#include "store/postgresql/copy.h"

#include <cmath>
#include <stdexcept>
#include <string>

#include "store/postgresql/settled_tallies.h"

namespace cw::store::postgresql {
namespace {

std::string column_list(const CopyTable& table) {
  std::string list;
  for (std::size_t i = 0; i < table.columns.size(); ++i) {
    list += (i ? ", " : "") + std::string(table.columns[i].name);
  }
  return list;
}

/// The parameter of the i-th column.
std::string parameter(std::size_t i) {
  return ":c" + std::to_string(i);
}

}  // namespace

void PgTableRows::each_row(const CopyTable& table, const std::function<void(const CopyRow&)>& row) {
  guarded(db_, [&] {
    Statement s(db_,
                "SELECT " + column_list(table) + " FROM " + std::string(table.name) + " ORDER BY " +
                    std::string(table.columns.front().name),
                Rows::Streamed);
    CopyRow values(table.columns.size());
    while (s.executeStep()) {
      for (std::size_t i = 0; i < table.columns.size(); ++i) {
        const store::Column& column = table.columns[i];
        const postgresql::Column c = s.getColumn(static_cast<int>(i));
        if (c.isNull()) {
          values[i] = std::monostate{};
          continue;
        }
        try {
          switch (column.type) {
            case ColumnType::Integer:
            case ColumnType::Boolean:
              values[i] = c.getInt64();
              break;
            case ColumnType::Real:
              values[i] = c.getDouble();
              break;
            case ColumnType::Text:
            case ColumnType::Instant:
            case ColumnType::Date:
            case ColumnType::Json:
              values[i] = c.getString();
              break;
          }
        } catch (const std::logic_error& e) {
          // A value of the wrong kind (pqxx::conversion_error is one too).
          damaged(db_.path,
                  std::string(table.name) + "." + std::string(column.name) + ": " + e.what());
        }
      }
      row(values);
    }
  });
}

PgLoader::PgLoader(Database& db) : db_(db) {
  // The audit_seq references are DEFERRABLE INITIALLY DEFERRED: checked at commit. The other
  // references point at tables copied earlier, or at lower ids of the same table.
  guarded(db_, [&] {
    db_.begin_write();
    open_ = true;
  });
}

PgLoader::~PgLoader() {
  inserts_.clear();
  if (open_) {
    try {
      db_.run("ROLLBACK");
    } catch (...) {
      // A destructor must not throw; the server rolls back when the connection closes.
    }
  }
}

bool PgLoader::empty() {
  return guarded(db_, [&] {
    for (const CopyTable& table : copy_tables()) {
      const pqxx::result r =
          db_.run("SELECT EXISTS (SELECT 1 FROM " + std::string(table.name) + ")");
      if (r[0][0].as<bool>()) return false;
    }
    return true;
  });
}

void PgLoader::append_row(const CopyTable& table, const CopyRow& row) {
  if (row.size() != table.columns.size()) {
    throw std::logic_error("a row of " + std::string(table.name) + " with the wrong column count");
  }
  guarded(db_, [&] {
    auto& insert = inserts_[table.name];
    if (!insert) {
      std::string marks;
      for (std::size_t i = 0; i < table.columns.size(); ++i) {
        marks += (i ? ", " : "") + parameter(i);
      }
      insert =
          std::make_unique<Statement>(db_, "INSERT INTO " + std::string(table.name) + " (" +
                                               column_list(table) + ") VALUES (" + marks + ")");
    }
    insert->clearBindings();
    for (std::size_t i = 0; i < row.size(); ++i) {
      const std::string name = parameter(i);
      if (const auto* n = std::get_if<std::int64_t>(&row[i])) {
        insert->bind(name.c_str(), *n);
      } else if (const auto* d = std::get_if<double>(&row[i])) {
        if (!std::isfinite(*d)) {
          throw std::logic_error("a non-finite value was about to be stored in " +
                                 std::string(table.name) + "." +
                                 std::string(table.columns[i].name));
        }
        insert->bind(name.c_str(), *d);
      } else if (const auto* t = std::get_if<std::string>(&row[i])) {
        insert->bind(name.c_str(), *t);
      } else {
        insert->bind(name.c_str());
      }
    }
    insert->exec();
  });
}

void PgLoader::commit() {
  open_ = false;
  inserts_.clear();
  guarded(db_, [&] {
    // The derived steps of settled curves are not copied: they are built from the copied facts.
    build_settled_tallies(db_);
    build_settled_totals(db_);
    // The statistics of migration 5 are gathered by ANALYZE only: without this the first
    // commands after a move would plan a group's look-ups as if each held one curve, until
    // autovacuum's first analyze. It sees this transaction's rows.
    db_.run_bulk("ANALYZE curves");
    db_.run_bulk("COMMIT");
  });
}

}  // namespace cw::store::postgresql
