// SPDX-License-Identifier: Apache-2.0
// Audit trail use cases.
#include "app/audit.h"

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
  return out;
}

}  // namespace cw::app
