// SPDX-License-Identifier: Apache-2.0
// The store: one SQLite file in WAL mode. Opening it checks that it is a Curvewarden store
// (application_id), refuses a store written by a newer version, and applies pending
// migrations. Writes go through WriteTransaction (BEGIN IMMEDIATE) and end with their audit
// entry; reads go through ReadTransaction for one consistent snapshot.
//
// This header does not expose SQLiteCpp: only store/*.cpp sees the SQL.
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/clock.h"
#include "store/fact_table.h"

namespace cw::store {

/// SQLite application_id of a Curvewarden store ('CWRD').
inline constexpr std::int32_t kApplicationId = 0x43575244;

struct OpenOptions {
  std::string path;
  bool create = false;         ///< create the file when missing (init only)
  int busy_timeout_ms = 5000;  ///< how long a writer waits for another writer
};

struct MigrationSpec {
  int version;
  std::string name;
  std::string sql;
};

/// Who acts and what "now" is, for every entry written through this connection.
struct Actor {
  std::string name;
  const Clock* clock = nullptr;
  std::string tool_version;
};

class Connection {
 public:
  /// Opens (and with `create`, creates) the store and applies pending migrations.
  static Connection open(const OpenOptions& options);
  /// Opens with an explicit migration list (tests of the migrator).
  static Connection open(const OpenOptions& options, const std::vector<MigrationSpec>& migrations);

  Connection(Connection&&) noexcept;
  Connection& operator=(Connection&&) noexcept;
  ~Connection();

  const std::string& path() const;
  /// PRAGMA user_version: the number of the last migration applied.
  int schema_version() const;
  /// True when this open created the file or applied its first migration.
  bool was_created() const;

  /// Every migration compiled into this binary, in order.
  static std::vector<MigrationSpec> embedded_migrations();

  struct Impl;
  Impl& impl() { return *impl_; }

 private:
  explicit Connection(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

/// The header of an audit entry; the rows come from WriteTransaction::add_row.
struct EntryHeader {
  std::string action;       ///< e.g. "instrument.add"
  std::string entity_kind;  ///< e.g. "instrument"
  std::string entity_id;    ///< e.g. "IC-02"
  std::optional<std::string> reason;
  Instant occurred_at;
};

/// One write use case: BEGIN IMMEDIATE ... audit entry(ies) ... COMMIT. Rolls back when
/// destroyed without commit().
class WriteTransaction {
 public:
  WriteTransaction(Connection& connection, const Actor& actor);
  WriteTransaction(const WriteTransaction&) = delete;
  WriteTransaction& operator=(const WriteTransaction&) = delete;
  ~WriteTransaction();

  /// The sequence number of the audit entry the rows written now will belong to.
  std::int64_t seq() const { return seq_; }
  /// Records that row `id` of `table` was written for the current entry.
  void add_row(FactTable table, std::int64_t id);
  /// Writes the audit entry holding every row added since the previous entry.
  void append_entry(const EntryHeader& header);
  /// Commits; every added row must belong to an appended entry.
  void commit();

  Connection& connection() { return connection_; }
  const Actor& actor() const { return actor_; }
  /// Now, per the actor's clock.
  Instant now() const { return actor_.clock->now(); }

 private:
  Connection& connection_;
  Actor actor_;
  std::int64_t seq_ = 0;
  std::string prev_hash_;
  std::vector<std::pair<FactTable, std::int64_t>> rows_;
  bool open_ = false;
};

/// A consistent snapshot for reads (BEGIN DEFERRED ... COMMIT).
class ReadTransaction {
 public:
  explicit ReadTransaction(Connection& connection);
  ReadTransaction(const ReadTransaction&) = delete;
  ReadTransaction& operator=(const ReadTransaction&) = delete;
  ~ReadTransaction();

 private:
  Connection& connection_;
  bool open_ = false;
};

}  // namespace cw::store
