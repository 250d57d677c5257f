// SPDX-License-Identifier: Apache-2.0
// Audit trail listing, verification and appending.
#include "store/sqlite/audit_repository.h"

#include <algorithm>
#include <exception>
#include <memory>
#include <set>

#include "audit/chain_check.h"
#include "core/error.h"
#include "store/sqlite/bind.h"
#include "store/sqlite/rows.h"
#include "store/sqlite/scan.h"
#include "store/sqlite/sql.h"

namespace cw::store::sqlite {
namespace {

audit::AuditEntry entry_of(SQLite::Statement& s) {
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

/// Reads the current row of kAuditAll into `e`, reusing its strings' buffers (the C interface
/// directly: `audit verify` reads every entry of the trail).
void read_entry(sqlite3_stmt* s, audit::AuditEntry& e) {
  const auto text = [s](int i, std::string& out) {
    const auto* data = reinterpret_cast<const char*>(sqlite3_column_text(s, i));
    out.assign(data != nullptr ? data : "", static_cast<std::size_t>(sqlite3_column_bytes(s, i)));
  };
  const auto opt = [&](int i, std::optional<std::string>& out) {
    if (sqlite3_column_type(s, i) == SQLITE_NULL) {
      out.reset();
    } else {
      if (!out) out.emplace();
      text(i, *out);
    }
  };
  e.seq = sqlite3_column_int64(s, 0);
  text(1, e.recorded_at);
  text(2, e.occurred_at);
  text(3, e.actor);
  text(4, e.action);
  text(5, e.entity_kind);
  text(6, e.entity_id);
  opt(7, e.reason);
  e.clock_overridden = sqlite3_column_int64(s, 8) != 0;
  text(9, e.tool_version);
  text(10, e.payload);
  text(11, e.prev_hash);
  text(12, e.hash);
  opt(13, e.os_login);
}

std::string describe(const audit::AuditEntry& e) {
  return "entry " + std::to_string(e.seq) + " (" + e.action + " " + e.entity_kind + "/" +
         e.entity_id + ", recorded " + e.recorded_at + ")";
}

/// Streams one fact table in id order; the row under the cursor is copied on demand.
class TableCursor {
 public:
  TableCursor(Database& db, const TableForm& form)
      : form_(form), scan_(*db.db, select_of(form, " ORDER BY id")) {
    for (std::size_t i = 0; i < form.columns.size(); ++i) {
      if (form.columns[i].name == "id") id_column_ = static_cast<int>(i);
      if (form.columns[i].name == "audit_seq") seq_column_ = static_cast<int>(i);
    }
    advance();
  }

  bool done() const { return done_; }
  std::int64_t id() const { return id_; }
  std::int64_t audit_seq() const { return audit_seq_; }
  /// Appends the row under the cursor to `out` (copy_row).
  void copy(std::string& out) const { copy_row(out, scan_.row(), form_); }
  void advance() {
    done_ = !scan_.step();
    if (done_) return;
    id_ = sqlite3_column_int64(scan_.row(), id_column_);
    audit_seq_ = sqlite3_column_int64(scan_.row(), seq_column_);
  }

 private:
  const TableForm& form_;
  Scan scan_;
  int id_column_ = 0;
  int seq_column_ = 0;
  std::int64_t id_ = 0;
  std::int64_t audit_seq_ = 0;
  bool done_ = false;
};

/// What is wrong with the rows an entry names, given as copied by TableCursor::copy (tables by
/// name, rows by id), against its payload: nullopt when their canonical text is the payload (or
/// the reader stopped copying them: it reports why).
/// Runs on the checking thread, with buffers of its own reused from entry to entry.
class RowsCheck {
 public:
  explicit RowsCheck(std::string path) : path_(std::move(path)) {}

  std::optional<std::string> operator()(const audit::ChainCheck::Item& item) {
    const audit::AuditEntry& e = item.entry;
    // The rows written as the payload's text (the canonical form, keys sorted, no spaces) and
    // compared with it.
    actual_text_.assign(1, '{');
    actual_rows_.clear();
    std::string_view rows = item.rows;
    bool first_table = true;
    FactTable table{};
    while (!rows.empty()) {
      read_copied_row(rows, row_);
      if (first_table || row_.table != table) {
        if (!first_table) actual_text_ += "],";
        first_table = false;
        table = row_.table;
        actual_text_ += '"';
        actual_text_ += table_name(table);
        actual_text_ += "\":[";
      } else {
        actual_text_ += ',';
      }
      const std::size_t offset = actual_text_.size();
      append_canonical_row_text(actual_text_, row_, reals_, path_);
      actual_rows_.push_back({table, offset, actual_text_.size() - offset});
    }
    if (!first_table) actual_text_ += ']';
    actual_text_ += '}';
    // Rows the reader stopped at are its to report; those before were written for the damage
    // their text may reveal first.
    if (!item.rows_complete || actual_text_ == e.payload) return std::nullopt;
    return difference(e);
  }

 private:
  /// Where each row of actual_text_ lies: its table, offset and length.
  struct RowSpan {
    FactTable table;
    std::size_t offset;
    std::size_t length;
  };

  /// What differs between the rows and the payload, in the words of the recorded payload.
  std::string difference(const audit::AuditEntry& e) const {
    // Rebuild the rows as JSON to find what differs.
    nlohmann::json actual = nlohmann::json::object();
    for (const RowSpan& row : actual_rows_) {
      actual[std::string(table_name(row.table))].push_back(
          nlohmann::json::parse(actual_text_.substr(row.offset, row.length)));
    }
    nlohmann::json recorded;
    try {
      recorded = nlohmann::json::parse(e.payload);
    } catch (const nlohmann::json::exception&) {
      return describe(e) + " has a payload that is not JSON";
    }
    for (auto& [table, rows] : recorded.items()) {
      const nlohmann::json& now = actual.contains(table) ? actual[table] : nlohmann::json::array();
      for (const auto& row : rows) {
        const auto id = row.value("id", nlohmann::json());
        const auto found = std::find_if(now.begin(), now.end(), [&](const nlohmann::json& r) {
          return r.value("id", nlohmann::json()) == id;
        });
        const std::string name = table + " id " + id.dump();
        if (found == now.end()) return describe(e) + ": row " + name + " is missing from the store";
        if (*found != row) return describe(e) + ": row " + name + " differs from what was recorded";
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
          return "row " + table + " id " + row["id"].dump() +
                 " has no audit entry (it was added behind the tool's back)";
        }
      }
    }
    return describe(e) + ": its rows differ from what was recorded";
  }

  std::string path_;
  CopiedRow row_;
  audit::RealWriter reals_;
  std::string actual_text_;
  std::vector<RowSpan> actual_rows_;
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
  std::set<std::string> present;
  auto& s = db.statement(sql::kTriggerNames);
  while (s.executeStep()) present.insert(s.getColumn(0).getString());
  s.reset();
  std::vector<std::string> tables{"audit_log", "schema_migrations", "settled_tallies",
                                  "settled_totals"};
  for (FactTable t : kAllFactTables) tables.emplace_back(table_name(t));
  std::vector<std::string> missing;
  for (const auto& t : tables) {
    for (const char* what : {"_no_update", "_no_delete"}) {
      if (!present.count(t + what)) missing.push_back(t + what);
    }
  }
  return missing;
}

std::vector<audit::AuditEntry> SqliteAudit::list(const AuditFilter& filter) {
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

VerifyReport SqliteAudit::verify() {
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
    std::vector<std::unique_ptr<TableCursor>> cursors;  // in the order of `tables`
    for (FactTable t : tables) cursors.push_back(std::make_unique<TableCursor>(db_, form_of(t)));

    Scan entries(*db_.db, sql::kAuditAll);
    struct Failure {
      std::int64_t seq;
      std::string problem;
    };
    const auto unlisted = [](FactTable t, const TableCursor& cursor) {
      return Failure{cursor.audit_seq(), "row " + std::string(table_name(t)) + " id " +
                                             std::to_string(cursor.id()) +
                                             " has no audit entry (it was added behind the "
                                             "tool's back)"};
    };
    // Copies the rows that name entry `seq` into `out`, table by table (by name), each in id
    // order; a row claiming an earlier entry (one that did not list it) is a failure.
    const auto copy_rows = [&](std::int64_t seq, std::string& out) -> std::optional<Failure> {
      for (std::size_t k = 0; k < tables.size(); ++k) {
        TableCursor& cursor = *cursors[k];
        for (; !cursor.done() && cursor.audit_seq() <= seq; cursor.advance()) {
          if (cursor.audit_seq() < seq) return unlisted(tables[k], cursor);
          cursor.copy(out);
        }
      }
      return std::nullopt;
    };
    // Rows left after the last entry.
    const auto check_leftover = [&]() -> std::optional<Failure> {
      for (std::size_t k = 0; k < tables.size(); ++k) {
        if (!cursors[k]->done()) return unlisted(tables[k], *cursors[k]);
      }
      return std::nullopt;
    };

    // This thread reads the entries and copies the rows each names; a second checks each
    // entry's link, hash and rows in the trail's order. Of what both find, the first in that
    // order counts (for one entry: a gap, then its link and hash, then its rows), as when one
    // thread checked everything in that order: what this one finds about an entry's rows, it
    // hands the entry over with the rows copied before (rows_complete false) and reports after
    // the second thread has checked its link and hash and written those rows.
    audit::ChainCheck chain(RowsCheck(db_.path));
    std::optional<Failure> found;  // a gap in the sequence or a row claiming an earlier entry
    std::exception_ptr error;      // a damaged store, met while reading the rows
    try {
      std::int64_t expected_seq = 1;
      while (!chain.broken() && entries.step()) {
        audit::ChainCheck::Item& item = chain.next();
        read_entry(entries.row(), item.entry);
        const std::int64_t seq = item.entry.seq;
        if (seq != expected_seq) {
          found = Failure{expected_seq, "entry " + std::to_string(expected_seq) +
                                            " is missing (the next entry is " +
                                            std::to_string(seq) + ")"};
          break;
        }
        try {
          found = copy_rows(seq, item.rows);
        } catch (...) {
          item.rows_complete = false;
          chain.add();
          throw;
        }
        item.rows_complete = !found;
        chain.add();
        if (found) break;
        ++expected_seq;
      }
      if (!found) found = check_leftover();
    } catch (...) {
      error = std::current_exception();
    }
    if (auto broken = chain.finish()) {
      const audit::AuditEntry& e = broken->entry;
      switch (broken->kind) {
        case audit::ChainCheck::Break::Kind::Link:
          return fail(e.seq,
                      describe(e) + " does not link to the entry before it (prev_hash differs)");
        case audit::ChainCheck::Break::Kind::Hash:
          return fail(e.seq,
                      describe(e) + " was changed after it was written (its hash does not match)");
        case audit::ChainCheck::Break::Kind::Rows:
          return fail(e.seq, std::move(broken->problem));
        case audit::ChainCheck::Break::Kind::Error:
          std::rethrow_exception(broken->error);
      }
    }
    if (error) std::rethrow_exception(error);
    if (found) return fail(found->seq, std::move(found->problem));
    report.head_hash = chain.head_hash();
    return report;
  });
}

std::optional<ChainHead> SqliteAudit::head() {
  auto& last = db_.statement(sql::kAuditHead);
  std::optional<ChainHead> out;
  if (last.executeStep())
    out = ChainHead{last.getColumn(0).getInt64(), last.getColumn(1).getString()};
  last.reset();
  return out;
}

std::optional<std::string> SqliteAudit::hash_at(std::int64_t seq) {
  return guarded(db_, [&]() -> std::optional<std::string> {
    auto& s = db_.statement(sql::kAuditHashAt);
    bind_int(s, ":seq", seq);
    std::optional<std::string> out;
    if (s.executeStep()) out = s.getColumn(0).getString();
    s.reset();
    return out;
  });
}

void SqliteAudit::start(WriteState& w) {
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

void SqliteAudit::append(WriteState& w, const Actor& actor, const EntryHeader& header) {
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
    e.payload = payloads_.payload(w.rows);
    e.prev_hash = w.prev_hash;
    e.hash = audit::compute_hash(e);

    auto& insert = db_.statement(sql::kInsertAudit);
    bind_int(insert, ":seq", e.seq);
    bind_text(insert, ":recorded_at", e.recorded_at);
    bind_text(insert, ":occurred_at", e.occurred_at);
    bind_text(insert, ":actor", e.actor);
    bind_text(insert, ":action", e.action);
    bind_text(insert, ":entity_kind", e.entity_kind);
    bind_text(insert, ":entity_id", e.entity_id);
    bind_opt_text(insert, ":reason", e.reason);
    bind_int(insert, ":clock_overridden", e.clock_overridden ? 1 : 0);
    bind_text(insert, ":tool_version", e.tool_version);
    bind_text(insert, ":payload", e.payload);
    bind_text(insert, ":prev_hash", e.prev_hash);
    bind_text(insert, ":hash", e.hash);
    bind_opt_text(insert, ":os_login", e.os_login);
    insert.exec();
    w.prev_hash = e.hash;
    ++w.seq;
    w.rows.clear();
  });
}

}  // namespace cw::store::sqlite
