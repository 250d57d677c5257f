// SPDX-License-Identifier: Apache-2.0
// Audit trail use cases.
#include "app/audit.h"

#include <filesystem>

#include "core/error.h"
#include "store/backup.h"

namespace cw::app {

std::vector<audit::AuditEntry> audit_log(Session& s, const store::AuditFilter& filter) {
  auto unit = s.read();
  return unit->audit().list(filter);
}

VerifyOutcome verify_audit(Session& s) {
  VerifyOutcome out;
  out.missing_guards = s.store().missing_guards();
  auto unit = s.read();
  out.chain = unit->audit().verify();
  if (out.chain.ok) out.derived_problem = unit->curves().settled_tallies_disagreement();
  return out;
}

VerifyOutcome backup(Session& s, const std::string& destination) {
  store::backup_store(s.location(), destination);
  VerifyOutcome out;
  {
    store::OpenOptions o;
    o.location = destination;
    auto copy = store::Store::open(o);
    out.missing_guards = copy->missing_guards();
    auto unit = copy->read();
    out.chain = unit->audit().verify();
    if (out.chain.ok) out.derived_problem = unit->curves().settled_tallies_disagreement();
  }
  if (!out.ok()) {
    std::error_code ec;
    for (const char* suffix : {"", "-wal", "-shm"}) {
      std::filesystem::remove(destination + suffix, ec);
    }
    throw StoreError(
        "the copy of '" + s.location() + "' does not verify (" +
            (!out.chain.ok         ? out.chain.problem
             : out.derived_problem ? "derived counts of settled curves: " + *out.derived_problem
                                   : std::string("append-only guards missing")) +
            "); it was removed",
        "run 'curvewarden audit verify' on the store itself");
  }
  return out;
}

}  // namespace cw::app
