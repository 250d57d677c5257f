// SPDX-License-Identifier: Apache-2.0
// `store copy` over the store seam (store/copy.h): no SQL and no backend here.
#include "app/store_copy.h"

#include "core/error.h"
#include "store/copy.h"
#include "store/store.h"

namespace cw::app {
namespace {

/// The source is only read (never migrated); the destination is created when missing.
std::unique_ptr<store::Store> open_store(const std::string& location, bool destination,
                                         const std::string& os_login) {
  store::OpenOptions o;
  o.location = location;
  o.create = destination;
  o.migrate = destination;
  o.os_login = os_login;
  return store::Store::open(o);
}

std::string joined(const std::vector<std::string>& names) {
  std::string list;
  for (const auto& n : names) list += (list.empty() ? "" : ", ") + n;
  return list;
}

/// Refuses (StoreError, exit 4) a store that is not at the latest migration this program knows
/// for its backend. The source is opened without migrating (refused when it needs it) and the
/// destination with, so this fails only when a migration did not leave a store where it should.
void require_current(store::Store& s, const std::string& location) {
  const int version = s.schema_version();
  const int latest = s.latest_schema_version();
  if (version != latest) {
    throw StoreError("store '" + location + "' is at schema version " + std::to_string(version) +
                         ", not at " + std::to_string(latest) +
                         ", the latest this program knows for its backend; nothing was copied",
                     "open it once with this version of curvewarden, then copy again");
  }
}

}  // namespace

StoreCopyOutcome copy_store(const StoreCopyRequest& request) {
  StoreCopyOutcome out;
  // A URI's password never reaches a message or the outcome.
  const std::string from = store::shown_location(request.from);
  const std::string to = store::shown_location(request.to);
  out.from = from;
  out.to = to;
  // A backend module that is missing shows before the source is verified, not after.
  store::require_backend(request.from);
  store::require_backend(request.to);
  auto source = open_store(request.from, false, request.os_login);
  if (const auto missing = source->missing_guards(); !missing.empty()) {
    throw StoreError("store '" + from + "' has lost its append-only guards (" + joined(missing) +
                         "); nothing was copied",
                     "run 'curvewarden audit verify' on it and restore it from a backup");
  }
  // Each backend numbers its own migrations, so the numbers of a SQLite and a PostgreSQL store
  // never match; what a verbatim copy needs is that both hold the tables and columns of
  // copy_tables(), which every store at its backend's latest migration does.
  out.schema_version = source->schema_version();
  require_current(*source, from);

  // One snapshot of the source: what is verified is what is copied. Verified before the
  // destination is opened, so that a source that cannot be copied leaves nothing there.
  auto reading = source->read();
  const store::VerifyReport chain = reading->audit().verify();
  if (!chain.ok) {
    throw AuditBrokenError(
        "store '" + from + "' does not verify: audit trail broken at entry " +
            (chain.first_broken ? std::to_string(*chain.first_broken) : "?") + ": " +
            chain.problem + "; nothing was copied",
        "a copy would carry the damage: restore the store from a backup and compare");
  }
  out.entries = chain.entries;
  out.source_head_hash = chain.head_hash;

  auto destination = open_store(request.to, true, request.os_login);
  require_current(*destination, to);
  auto loader = destination->load();
  if (!loader->empty()) {
    throw UsageError("store '" + to +
                         "' already holds entries or facts; store copy writes only into an "
                         "empty store, and nothing was copied",
                     "give the path of a new file, or an empty database");
  }
  for (const store::CopyTable& table : store::copy_tables()) {
    TableCount count{std::string(table.name), 0};
    reading->table_rows().each_row(table, [&](const store::CopyRow& row) {
      loader->append_row(table, row);
      ++count.rows;
    });
    if (count.table != "audit_log") out.rows += count.rows;
    out.tables.push_back(std::move(count));
  }
  loader->commit();
  loader.reset();
  reading.reset();

  if (const auto missing = destination->missing_guards(); !missing.empty()) {
    throw StoreError("the copy '" + to + "' has no append-only guards (" + joined(missing) + ")");
  }
  const store::VerifyReport copied = destination->read()->audit().verify();
  out.destination_head_hash = copied.head_hash;
  if (!copied.ok || copied.entries != chain.entries || copied.head_hash != chain.head_hash) {
    throw StoreError(
        "the copy '" + to + "' does not verify as the source does (" +
            (copied.ok ? std::to_string(copied.entries) + " entries, head hash " + copied.head_hash
                       : copied.problem) +
            ")",
        "report this: the copy's trail must be the source's");
  }
  return out;
}

}  // namespace cw::app
