// SPDX-License-Identifier: Apache-2.0
// Audit trail listing, verification and appending, as the SQLite backend does them: the same
// entries, payloads and hashes.
#include "store/postgresql/audit_repository.h"

#include <algorithm>
#include <map>
#include <memory>
#include <set>

#include "core/error.h"
#include "store/postgresql/bind.h"
#include "store/postgresql/sql.h"

namespace cw::store::postgresql {
namespace {

audit::AuditEntry entry_of(Statement& s) {
  audit::AuditEntry e;
  e.seq = s.getColumn(0).getInt64();
  e.recorded_at = s.getColumn(1).getString();
  e.occurred_at = s.getColumn(2).getString();
  e.actor = s.getColumn(3).getString();
  e.action = s.getColumn(4).getString();
  e.entity_kind = s.getColumn(5).getString();
  e.entity_id = s.getColumn(6).getString();
  e.reason = opt_text(s.getColumn(7));
  e.clock_overridden = s.getColumn(8).getInt64() != 0;
  e.tool_version = s.getColumn(9).getString();
  e.payload = s.getColumn(10).getString();
  e.prev_hash = s.getColumn(11).getString();
  e.hash = s.getColumn(12).getString();
  e.os_login = opt_text(s.getColumn(13));
  return e;
}

std::string describe(const audit::AuditEntry& e) {
  return "entry " + std::to_string(e.seq) + " (" + e.action + " " + e.entity_kind + "/" +
         e.entity_id + ", recorded " + e.recorded_at + ")";
}

/// Streams one fact table in id order, one canonical row (as JSON text) at a time.
class TableCursor {
 public:
  TableCursor(Database& db, const TableForm& form)
      : form_(form),
        path_(db.path),
        statement_(db, select_of(form, " ORDER BY id"), Rows::Streamed) {
    for (std::size_t i = 0; i < form.columns.size(); ++i) {
      if (form.columns[i].name == "id") id_column_ = static_cast<int>(i);
      if (form.columns[i].name == "audit_seq") seq_column_ = static_cast<int>(i);
    }
    advance();
  }

  bool done() const { return done_; }
  /// The row under the cursor as canonical JSON text.
  const std::string& text() const { return text_; }
  std::int64_t id() const { return id_; }
  std::int64_t audit_seq() const { return audit_seq_; }
  void advance() {
    done_ = !statement_.executeStep();
    if (done_) return;
    id_ = statement_.getColumn(id_column_).getInt64();
    audit_seq_ = statement_.getColumn(seq_column_).getInt64();
    text_ = canonical_row(statement_, form_, path_).dump();
  }

 private:
  const TableForm& form_;
  std::string path_;
  Statement statement_;
  int id_column_ = 0;
  int seq_column_ = 0;
  std::string text_;
  std::int64_t id_ = 0;
  std::int64_t audit_seq_ = 0;
  bool done_ = false;
};

/// The fact tables sorted by name: the order of a payload's keys.
std::vector<FactTable> tables_by_name() {
  std::vector<FactTable> out(kAllFactTables.begin(), kAllFactTables.end());
  std::sort(out.begin(), out.end(),
            [](FactTable a, FactTable b) { return table_name(a) < table_name(b); });
  return out;
}

}  // namespace

std::vector<std::string> missing_guards(Database& db) {
  // A guard counts only enabled (always or on origin) and on its own table.
  std::set<std::pair<std::string, std::string>> present;
  auto& s = db.statement(sql::kTriggerNames);
  s.bind(":schema", db.schema);
  while (s.executeStep()) present.emplace(s.getColumn(0).getString(), s.getColumn(1).getString());
  s.reset();
  std::vector<std::string> tables{"audit_log", "schema_migrations", "settled_tallies",
                                  "settled_totals"};
  for (FactTable t : kAllFactTables) tables.emplace_back(table_name(t));
  std::vector<std::string> missing;
  for (const auto& t : tables) {
    for (const char* what : {"_no_update", "_no_delete", "_no_truncate"}) {
      if (!present.count({t, t + what})) missing.push_back(t + what);
    }
  }
  return missing;
}

std::vector<audit::AuditEntry> PgAudit::list(const AuditFilter& filter) {
  flush();
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kAuditFiltered);
    if (filter.since) bind_instant(s, ":since", *filter.since);
    bind_opt_text(s, ":kind", filter.entity_kind);
    bind_opt_text(s, ":id", filter.entity_id);
    std::vector<audit::AuditEntry> out;
    while (s.executeStep()) out.push_back(entry_of(s));
    return out;
  });
}

VerifyReport PgAudit::verify() {
  flush();
  return guarded(db_, [&] {
    VerifyReport report;
    auto fail = [&](std::int64_t seq, std::string problem) {
      report.ok = false;
      report.first_broken = seq;
      report.problem = std::move(problem);
      return report;
    };
    {
      auto& count = db_.statement(sql::kAuditCount);
      count.executeStep();
      report.entries = count.getColumn(0).getInt64();
      count.reset();
    }
    const std::vector<FactTable> tables = tables_by_name();
    std::map<FactTable, std::unique_ptr<TableCursor>> cursors;
    for (FactTable t : tables) cursors.emplace(t, std::make_unique<TableCursor>(db_, form_of(t)));

    Statement entries(db_, sql::kAuditAll, Rows::Streamed);
    audit::EntryHasher hasher;
    std::string actual_text;
    std::vector<std::pair<FactTable, std::string>> actual_rows;
    std::string prev_hash = audit::kGenesisHash;
    std::int64_t expected_seq = 1;
    while (entries.executeStep()) {
      const audit::AuditEntry e = entry_of(entries);
      if (e.seq != expected_seq) {
        return fail(expected_seq, "entry " + std::to_string(expected_seq) +
                                      " is missing (the next entry is " + std::to_string(e.seq) +
                                      ")");
      }
      if (e.prev_hash != prev_hash) {
        return fail(e.seq,
                    describe(e) + " does not link to the entry before it (prev_hash differs)");
      }
      if (hasher.hash(e) != e.hash) {
        return fail(e.seq,
                    describe(e) + " was changed after it was written (its hash does not match)");
      }
      // The rows that name this entry, table by table, as they are stored now, written as the
      // payload's text (the canonical form, keys sorted, no spaces) and compared with it.
      actual_text = "{";
      actual_rows.clear();
      for (FactTable t : tables) {
        TableCursor& cursor = *cursors.at(t);
        bool first_row = true;
        while (!cursor.done() && cursor.audit_seq() <= e.seq) {
          if (cursor.audit_seq() < e.seq) {
            // A row claiming an earlier entry that did not list it.
            return fail(cursor.audit_seq(), "row " + std::string(table_name(t)) + " id " +
                                                std::to_string(cursor.id()) +
                                                " has no audit entry (it was added behind the "
                                                "tool's back)");
          }
          if (first_row) {
            if (actual_text.size() > 1) actual_text += ',';
            actual_text += '"';
            actual_text += table_name(t);
            actual_text += "\":[";
          } else {
            actual_text += ',';
          }
          first_row = false;
          actual_text += cursor.text();
          actual_rows.emplace_back(t, cursor.text());
          cursor.advance();
        }
        if (!first_row) actual_text += ']';
      }
      actual_text += '}';
      if (actual_text != e.payload) {
        // Rebuild the rows as JSON to find what differs.
        nlohmann::json actual = nlohmann::json::object();
        for (const auto& [t, text] : actual_rows) {
          actual[std::string(table_name(t))].push_back(nlohmann::json::parse(text));
        }
        // Find what differs, in the words of the recorded payload.
        nlohmann::json recorded;
        try {
          recorded = nlohmann::json::parse(e.payload);
        } catch (const nlohmann::json::exception&) {
          return fail(e.seq, describe(e) + " has a payload that is not JSON");
        }
        for (auto& [table, rows] : recorded.items()) {
          const nlohmann::json& now =
              actual.contains(table) ? actual[table] : nlohmann::json::array();
          for (const auto& row : rows) {
            const auto id = row.value("id", nlohmann::json());
            const auto found = std::find_if(now.begin(), now.end(), [&](const nlohmann::json& r) {
              return r.value("id", nlohmann::json()) == id;
            });
            const std::string name = table + " id " + id.dump();
            if (found == now.end()) {
              return fail(e.seq, describe(e) + ": row " + name + " is missing from the store");
            }
            if (*found != row) {
              return fail(e.seq, describe(e) + ": row " + name + " differs from what was recorded");
            }
          }
        }
        for (auto& [table, rows] : actual.items()) {
          for (const auto& row : rows) {
            const bool listed = recorded.contains(table) &&
                                std::any_of(recorded[table].begin(), recorded[table].end(),
                                            [&](const nlohmann::json& r) {
                                              return r.value("id", nlohmann::json()) == row["id"];
                                            });
            if (!listed) {
              return fail(e.seq, "row " + table + " id " + row["id"].dump() +
                                     " has no audit entry (it was added behind the tool's back)");
            }
          }
        }
        return fail(e.seq, describe(e) + ": its rows differ from what was recorded");
      }
      prev_hash = e.hash;
      ++expected_seq;
    }
    for (FactTable t : tables) {
      const TableCursor& cursor = *cursors.at(t);
      if (!cursor.done()) {
        return fail(cursor.audit_seq(), "row " + std::string(table_name(t)) + " id " +
                                            std::to_string(cursor.id()) +
                                            " has no audit entry (it was added behind the tool's "
                                            "back)");
      }
    }
    report.head_hash = prev_hash;
    return report;
  });
}

std::optional<ChainHead> PgAudit::head() {
  flush();
  auto& last = db_.statement(sql::kAuditHead);
  std::optional<ChainHead> out;
  if (last.executeStep())
    out = ChainHead{last.getColumn(0).getInt64(), last.getColumn(1).getString()};
  last.reset();
  return out;
}

std::optional<std::string> PgAudit::hash_at(std::int64_t seq) {
  flush();
  return guarded(db_, [&]() -> std::optional<std::string> {
    auto& s = db_.statement(sql::kAuditHashAt);
    bind_int(s, ":seq", seq);
    std::optional<std::string> out;
    if (s.executeStep()) out = s.getColumn(0).getString();
    s.reset();
    return out;
  });
}

std::vector<std::int64_t> WriteState::insert_rows(Statement& insert, FactTable table,
                                                  const std::string& path) {
  std::vector<std::int64_t> ids;
  const TableForm& form = form_of(table);
  while (insert.executeStep()) {
    nlohmann::json row = canonical_row(insert, form, path);
    const std::int64_t id = row.at("id").get<std::int64_t>();
    add_row(table, id);
    returned.emplace(std::make_pair(table, id), std::move(row));
    ids.push_back(id);
  }
  insert.reset();
  return ids;
}

std::int64_t WriteState::insert_row(Statement& insert, FactTable table, const std::string& path) {
  const auto ids = insert_rows(insert, table, path);
  if (ids.size() != 1) {
    throw std::logic_error("an INSERT of one " + std::string(table_name(table)) + " row returned " +
                           std::to_string(ids.size()));
  }
  return ids.front();
}

void PgAudit::start(WriteState& w) {
  auto& last = db_.statement(sql::kAuditHead);
  if (last.executeStep()) {
    w.seq = last.getColumn(0).getInt64() + 1;
    w.prev_hash = last.getColumn(1).getString();
  } else {
    w.seq = 1;
    w.prev_hash = audit::kGenesisHash;
  }
  last.reset();
}

void PgAudit::append(WriteState& w, const Actor& actor, const EntryHeader& header) {
  guarded(db_, [&] {
    audit::AuditEntry e;
    e.seq = w.seq;
    e.recorded_at = format_utc(actor.clock->now());
    e.occurred_at = format_utc(header.occurred_at);
    e.actor = actor.name;
    e.action = header.action;
    e.entity_kind = header.entity_kind;
    e.entity_id = header.entity_id;
    e.reason = header.reason;
    e.clock_overridden = actor.clock->is_overridden();
    e.tool_version = actor.tool_version;
    e.os_login = actor.os_login;
    e.payload = payloads_.payload(w.rows, w.returned);
    e.prev_hash = w.prev_hash;
    e.hash = audit::compute_hash(e);

    w.prev_hash = e.hash;
    ++w.seq;
    pending_bytes_ += e.payload.size();
    pending_.push_back(std::move(e));
    if (pending_.size() >= kFlushEntries || pending_bytes_ >= kFlushBytes) flush();
    w.rows.clear();
    w.returned.clear();
  });
}

void PgAudit::flush() {
  if (pending_.empty()) return;
  guarded(db_, [&] {
    ArrayLiteral seq, recorded_at, occurred_at, actor, action, entity_kind, entity_id, reason,
        clock_overridden, tool_version, payload, prev_hash, hash, os_login;
    for (const auto& e : pending_) {
      seq.add(e.seq);
      recorded_at.add(e.recorded_at);
      occurred_at.add(e.occurred_at);
      actor.add(e.actor);
      action.add(e.action);
      entity_kind.add(e.entity_kind);
      entity_id.add(e.entity_id);
      reason.add(e.reason);
      clock_overridden.add(e.clock_overridden ? 1 : 0);
      tool_version.add(e.tool_version);
      payload.add(e.payload);
      prev_hash.add(e.prev_hash);
      hash.add(e.hash);
      os_login.add(e.os_login);
    }
    auto& insert = db_.statement(sql::kInsertAudits);
    seq.bind(insert, ":seqs");
    recorded_at.bind(insert, ":recorded_ats");
    occurred_at.bind(insert, ":occurred_ats");
    actor.bind(insert, ":actors");
    action.bind(insert, ":actions");
    entity_kind.bind(insert, ":entity_kinds");
    entity_id.bind(insert, ":entity_ids");
    reason.bind(insert, ":reasons");
    clock_overridden.bind(insert, ":clock_overriddens");
    tool_version.bind(insert, ":tool_versions");
    payload.bind(insert, ":payloads");
    prev_hash.bind(insert, ":prev_hashes");
    hash.bind(insert, ":hashes");
    os_login.bind(insert, ":os_logins");
    const auto inserted = static_cast<std::size_t>(insert.exec());
    if (inserted != pending_.size()) {
      throw std::logic_error(std::to_string(inserted) + " of " + std::to_string(pending_.size()) +
                             " audit entries were inserted");
    }
  });
  pending_.clear();
  pending_bytes_ = 0;
}

}  // namespace cw::store::postgresql
