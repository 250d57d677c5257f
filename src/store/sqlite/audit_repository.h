// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: the audit trail (listing, verification, appending entries).
#pragma once

#include <cstdint>
#include <string>
#include <utility>
#include <vector>

#include "store/audit_trail.h"
#include "store/sqlite/database.h"
#include "store/sqlite/rows.h"
#include "store/sqlite/settled_scan.h"
#include "store/store.h"

namespace cw::store::sqlite {

/// What a write unit knows of the chain while it appends.
struct WriteState {
  std::int64_t seq = 0;   ///< the entry the rows being written belong to
  std::string prev_hash;  ///< hash of the entry before it
  std::vector<std::pair<FactTable, std::int64_t>> rows;
  /// The settled running totals this unit appended (settled_scan.h).
  LatestTotals settled_totals;
  void add_row(FactTable table, std::int64_t id) { rows.emplace_back(table, id); }
};

class SqliteAudit final : public AuditReader {
 public:
  explicit SqliteAudit(Database& db) : db_(db), payloads_(db) {}

  std::vector<audit::AuditEntry> list(const AuditFilter& filter) override;
  VerifyReport verify() override;
  std::optional<ChainHead> head() override;
  std::optional<std::string> hash_at(std::int64_t seq) override;

  /// Reads the head of the chain into `w` (inside the write transaction).
  void start(WriteState& w);
  /// Writes the entry holding `w.rows`.
  void append(WriteState& w, const Actor& actor, const EntryHeader& header);

 private:
  Database& db_;
  PayloadBuilder payloads_;
};

/// The append-only triggers the store should have and does not.
std::vector<std::string> missing_guards(Database& db);

}  // namespace cw::store::sqlite
