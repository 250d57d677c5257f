// SPDX-License-Identifier: Apache-2.0
// The store seam. A Store is opened from a location (a file path today); every command works in
// one unit of work: a read snapshot, or a write transaction that appends facts, closes each
// change with its audit entry and commits. Nothing above this folder sees SQL or a database
// library; each backend lives in its own folder (store/sqlite/).
//
//   auto unit = store.write(actor);                  // BEGIN IMMEDIATE (SQLite)
//   auto lot = unit->registry().lot("CRM-1");        // reads see the transaction's snapshot
//   unit->registry_writer().add_lot_withdrawal(...); // facts join the current entry
//   unit->append_entry({"lot.withdraw", "lot", "CRM-1", reason, at});
//   unit->commit();                                  // destroyed without commit: rolled back
#pragma once

#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/clock.h"
#include "store/audit_trail.h"
#include "store/copy.h"
#include "store/curves.h"
#include "store/registry.h"
#include "store/runs.h"

namespace cw::store {

/// True when `location` is a libpq connection URI (postgresql://... or postgres://...): the
/// store is a PostgreSQL database. Anything else is the path of a SQLite file.
bool is_server_location(const std::string& location);

/// `location` as messages show it: a URI's password replaced by "***".
std::string shown_location(const std::string& location);

/// Loads the backend `location` needs, when it is one the binary loads as a module (PostgreSQL),
/// without connecting: an InstallationError (exit 4) before any long work for a missing or
/// mismatched module.
void require_backend(const std::string& location);

struct OpenOptions {
  std::string location;        ///< a file path (SQLite) or a libpq URI (PostgreSQL)
  bool create = false;         ///< create the store when missing (init only)
  int busy_timeout_ms = 5000;  ///< how long a writer waits for another writer
  std::string os_login;        ///< the process's login, for entries written by a migration
  /// Apply pending migrations; when false, a store that needs one is refused (StoreError,
  /// nothing written), as a source that is only to be read (`store copy`).
  bool migrate = true;
};

/// Who acts and what "now" is, for every entry written in a unit.
struct Actor {
  std::string name;
  const Clock* clock = nullptr;
  std::string tool_version;
  std::string os_login;  ///< the operating-system login of the process, in every entry
};

/// The header of an audit entry; its payload is every row appended since the previous entry.
struct EntryHeader {
  std::string action;       ///< e.g. "instrument.add"
  std::string entity_kind;  ///< e.g. "instrument"
  std::string entity_id;    ///< e.g. "IC-02"
  std::optional<std::string> reason;
  Instant occurred_at;
};

/// A consistent snapshot for reading.
class ReadUnit {
 public:
  virtual ~ReadUnit() = default;
  virtual RegistryReader& registry() = 0;
  virtual CurveReader& curves() = 0;
  virtual RunReader& runs() = 0;
  virtual AuditReader& audit() = 0;
  /// Every row of every table, for `store copy` (store/copy.h).
  virtual TableRowReader& table_rows() = 0;
};

/// One write transaction: reads see its own snapshot (taken with the write lock held), appends
/// join the current audit entry, commit() makes everything durable at once.
class WriteUnit : public ReadUnit {
 public:
  virtual RegistryWriter& registry_writer() = 0;
  virtual CurveWriter& curve_writer() = 0;
  virtual RunWriter& run_writer() = 0;
  /// Writes the audit entry holding every row appended since the previous entry.
  virtual void append_entry(const EntryHeader& header) = 0;
  /// Commits; every appended row must belong to an entry.
  virtual void commit() = 0;
  /// Now, per the actor's clock.
  virtual Instant now() const = 0;
};

class Store {
 public:
  /// Opens (and with `create`, creates) the store at `options.location` and applies pending
  /// migrations. Throws StoreError (exit 4) when it is missing, not a Curvewarden store, newer
  /// than this program, damaged or locked.
  static std::unique_ptr<Store> open(const OpenOptions& options);

  virtual ~Store() = default;
  virtual std::unique_ptr<ReadUnit> read() = 0;
  /// Refused with StoreError when the store's append-only guards are missing.
  virtual std::unique_ptr<WriteUnit> write(const Actor& actor) = 0;

  /// The location as the user gave it (a path), for messages; a URI with its password masked.
  virtual const std::string& location() const = 0;
  /// The number of the last migration applied. Each backend numbers its own migrations (a
  /// SQLite store is at 8 when a PostgreSQL store built by the same program is at 2): compare
  /// numbers only between stores of one backend.
  virtual int schema_version() = 0;
  /// The number of the last migration this program knows for the store's backend. A store whose
  /// schema_version() equals it is current: every current store, on either backend, holds the
  /// tables and columns of copy_tables() (the hashed row form of row_form.h).
  virtual int latest_schema_version() const = 0;
  /// True when this open created the store.
  virtual bool was_created() const = 0;
  /// The append-only guards (triggers) that should exist and do not: a damaged store.
  virtual std::vector<std::string> missing_guards() = 0;
  /// The statements a database administrator applies so that the workstations' role may only
  /// read and append (a server store); empty for a file, whose guard is its file mode.
  virtual std::string privilege_statements() { return {}; }
  /// Starts the one write transaction of `store copy` into this store (store/copy.h); refused
  /// with StoreError, as write() is, when the append-only guards are missing.
  virtual std::unique_ptr<StoreLoader> load() = 0;
};

}  // namespace cw::store
