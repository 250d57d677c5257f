// SPDX-License-Identifier: Apache-2.0
// Reading and verifying the audit trail.
#pragma once

#include <string>
#include <vector>

#include "app/session.h"
#include "store/audit_trail.h"

namespace cw::app {

std::vector<audit::AuditEntry> audit_log(Session& s, const store::AuditFilter& filter);

struct VerifyOutcome {
  store::VerifyReport chain;                ///< the hash chain and every fact row
  std::vector<std::string> missing_guards;  ///< append-only triggers that are gone
};
/// Verifies the chain and checks the append-only guards.
VerifyOutcome verify_audit(Session& s);

}  // namespace cw::app
