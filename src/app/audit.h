// SPDX-License-Identifier: Apache-2.0
// Reading and verifying the audit trail.
#pragma once

#include "app/session.h"
#include "store/audit_repository.h"

namespace cw::app {

std::vector<audit::AuditEntry> audit_log(Session& s, const store::AuditFilter& filter);
store::VerifyReport verify_audit(Session& s);

}  // namespace cw::app
