// SPDX-License-Identifier: Apache-2.0
// Internal to the PostgreSQL backend: the audit trail (listing, verification, appending entries).
#pragma once

#include <cstdint>
#include <string>
#include <utility>
#include <vector>

#include "store/audit_trail.h"
#include "store/postgresql/database.h"
#include "store/postgresql/rows.h"
#include "store/sqlite/settled_scan.h"
#include "store/store.h"

namespace cw::store::postgresql {

/// What a write unit knows of the chain while it appends.
struct WriteState {
  std::int64_t seq = 0;   ///< the entry the rows being written belong to
  std::string prev_hash;  ///< hash of the entry before it
  std::vector<std::pair<FactTable, std::int64_t>> rows;
  /// The settled running totals this unit appended (settled_scan.h).
  sqlite::LatestTotals settled_totals;
  /// The canonical form of those rows whose INSERT returned them (returning_canonical()): the
  /// entry's payload takes them as they are instead of reading them back.
  ReturnedRows returned;
  void add_row(FactTable table, std::int64_t id) { rows.emplace_back(table, id); }
  /// Runs `insert` (made with returning_canonical() for `table`) and adds every row it returned;
  /// returns their ids in the order returned.
  std::vector<std::int64_t> insert_rows(Statement& insert, FactTable table,
                                        const std::string& path);
  /// insert_rows() of an INSERT of exactly one row; its id.
  std::int64_t insert_row(Statement& insert, FactTable table, const std::string& path);
};

class PgAudit final : public AuditReader {
 public:
  explicit PgAudit(Database& db) : db_(db), payloads_(db) {}

  std::vector<audit::AuditEntry> list(const AuditFilter& filter) override;
  VerifyReport verify() override;
  std::optional<ChainHead> head() override;
  std::optional<std::string> hash_at(std::int64_t seq) override;

  /// Reads the head of the chain into `w` (inside the write transaction).
  void start(WriteState& w);
  /// Makes the entry holding `w.rows` (its payload and hash now); its row is written by the
  /// next flush(), with the entries made before it.
  void append(WriteState& w, const Actor& actor, const EntryHeader& header);
  /// Inserts the entries made and not yet written, in one statement. Called when enough have
  /// gathered, before COMMIT, and before the trail is read in the same transaction, so that
  /// a run import sends one entry statement per 256 rows instead of one per row.
  void flush();

 private:
  static constexpr std::size_t kFlushEntries = 256;
  static constexpr std::size_t kFlushBytes = 1 << 20;  ///< payload text held at most, about

  Database& db_;
  PayloadBuilder payloads_;
  std::vector<audit::AuditEntry> pending_;
  std::size_t pending_bytes_ = 0;
};

/// The append-only triggers the store should have and does not.
std::vector<std::string> missing_guards(Database& db);

}  // namespace cw::store::postgresql
