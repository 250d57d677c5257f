// SPDX-License-Identifier: Apache-2.0
// Audit trail listing and verification.
#include "store/audit_repository.h"

#include <map>
#include <memory>
#include <nlohmann/json.hpp>

#include "store/connection_impl.h"
#include "store/row_json.h"

namespace cw::store {
namespace {

audit::AuditEntry entry_of(SQLite::Statement& s) {
  audit::AuditEntry e;
  e.seq = s.getColumn("seq").getInt64();
  e.recorded_at = s.getColumn("recorded_at").getString();
  e.occurred_at = s.getColumn("occurred_at").getString();
  e.actor = s.getColumn("actor").getString();
  e.action = s.getColumn("action").getString();
  e.entity_kind = s.getColumn("entity_kind").getString();
  e.entity_id = s.getColumn("entity_id").getString();
  e.reason = opt_text(s.getColumn("reason"));
  e.clock_overridden = s.getColumn("clock_overridden").getInt64() != 0;
  e.tool_version = s.getColumn("tool_version").getString();
  e.payload = s.getColumn("payload").getString();
  e.prev_hash = s.getColumn("prev_hash").getString();
  e.hash = s.getColumn("hash").getString();
  return e;
}

std::string describe(const audit::AuditEntry& e) {
  return "entry " + std::to_string(e.seq) + " (" + e.action + " " + e.entity_kind + "/" +
         e.entity_id + ", recorded " + e.recorded_at + ")";
}

/// Streams one fact table in id order.
class TableCursor {
 public:
  TableCursor(SQLite::Database& db, std::string_view table)
      : statement_(db, "SELECT * FROM " + std::string(table) + " ORDER BY id") {}

  /// The next row, or nullptr at the end.
  const nlohmann::json* next() {
    if (!statement_.executeStep()) return nullptr;
    row_ = row_to_json(statement_);
    return &row_;
  }

 private:
  SQLite::Statement statement_;
  nlohmann::json row_;
};

}  // namespace

std::vector<audit::AuditEntry> list_audit(Connection& c, const AuditFilter& filter) {
  auto& impl = c.impl();
  try {
    ReadTransaction read(c);
    auto& s = impl.statement(
        "SELECT * FROM audit_log WHERE (:since IS NULL OR recorded_at >= :since) "
        "AND (:kind IS NULL OR entity_kind = :kind) AND (:id IS NULL OR entity_id = :id) "
        "ORDER BY seq");
    if (filter.since) {
      bind_instant(s, ":since", *filter.since);
    }
    bind_opt_text(s, ":kind", filter.entity_kind);
    bind_opt_text(s, ":id", filter.entity_id);
    std::vector<audit::AuditEntry> out;
    while (s.executeStep()) out.push_back(entry_of(s));
    return out;
  } catch (const SQLite::Exception& e) {
    rethrow_sqlite(e, impl.path);
  }
}

VerifyReport verify_audit(Connection& c) {
  auto& impl = c.impl();
  VerifyReport report;
  try {
    ReadTransaction read(c);
    std::map<std::string, std::unique_ptr<TableCursor>, std::less<>> cursors;
    for (FactTable t : kAllFactTables) {
      cursors.emplace(std::string(table_name(t)),
                      std::make_unique<TableCursor>(*impl.db, table_name(t)));
    }
    auto fail = [&](std::int64_t seq, std::string problem) {
      report.ok = false;
      report.first_broken = seq;
      report.problem = std::move(problem);
    };

    {
      SQLite::Statement count(*impl.db, "SELECT count(*) FROM audit_log");
      count.executeStep();
      report.entries = count.getColumn(0).getInt64();
    }
    SQLite::Statement entries(*impl.db, "SELECT * FROM audit_log ORDER BY seq");
    std::string prev_hash = audit::kGenesisHash;
    std::int64_t expected_seq = 1;
    while (entries.executeStep()) {
      const audit::AuditEntry e = entry_of(entries);
      if (e.seq != expected_seq) {
        fail(expected_seq, "entry " + std::to_string(expected_seq) +
                               " is missing (the next entry is " + std::to_string(e.seq) + ")");
        return report;
      }
      if (e.prev_hash != prev_hash) {
        fail(e.seq, describe(e) + " does not link to the entry before it (prev_hash differs)");
        return report;
      }
      if (audit::compute_hash(e) != e.hash) {
        fail(e.seq, describe(e) + " was changed after it was written (its hash does not match)");
        return report;
      }
      nlohmann::json payload;
      try {
        payload = nlohmann::json::parse(e.payload);
      } catch (const nlohmann::json::exception&) {
        fail(e.seq, describe(e) + " has a payload that is not JSON");
        return report;
      }
      for (auto& [table, rows] : payload.items()) {
        auto cursor = cursors.find(table);
        if (cursor == cursors.end()) {
          fail(e.seq, describe(e) + " names an unknown table '" + table + "'");
          return report;
        }
        for (const auto& recorded : rows) {
          const nlohmann::json* actual = cursor->second->next();
          const std::string row_name =
              table + " id " + recorded.value("id", nlohmann::json()).dump();
          if (actual == nullptr ||
              actual->value("id", nlohmann::json()) != recorded.value("id", nlohmann::json())) {
            fail(e.seq, describe(e) + ": row " + row_name + " is missing from the store");
            return report;
          }
          if (*actual != recorded) {
            fail(e.seq, describe(e) + ": row " + row_name + " differs from what was recorded");
            return report;
          }
        }
      }
      prev_hash = e.hash;
      ++expected_seq;
    }
    report.head_hash = prev_hash;
    for (auto& [table, cursor] : cursors) {
      if (const nlohmann::json* extra = cursor->next()) {
        const auto seq = extra->value("audit_seq", nlohmann::json());
        report.ok = false;
        if (seq.is_number_integer()) report.first_broken = seq.get<std::int64_t>();
        report.problem = "row " + table + " id " + extra->value("id", nlohmann::json()).dump() +
                         " has no audit entry (it was added behind the tool's back)";
        return report;
      }
    }
    return report;
  } catch (const SQLite::Exception& e) {
    rethrow_sqlite(e, impl.path);
  }
}

}  // namespace cw::store
