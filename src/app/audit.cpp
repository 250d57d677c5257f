// SPDX-License-Identifier: Apache-2.0
// Audit trail use cases.
#include "app/audit.h"

namespace cw::app {

std::vector<audit::AuditEntry> audit_log(Session& s, const store::AuditFilter& filter) {
  return store::list_audit(s.db(), filter);
}

store::VerifyReport verify_audit(Session& s) {
  return store::verify_audit(s.db());
}

}  // namespace cw::app
