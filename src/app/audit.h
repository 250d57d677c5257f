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
  /// Where the derived counts of settled curves (what `status` adds up) disagree with the facts;
  /// only looked at when the chain holds.
  std::optional<std::string> derived_problem;
  bool ok() const { return chain.ok && missing_guards.empty() && !derived_problem; }
};
/// Verifies the chain, checks the append-only guards and the derived counts of settled curves.
VerifyOutcome verify_audit(Session& s);

/// Copies the session's store to the new file `destination` while others may write (one
/// consistent snapshot), then opens the copy and verifies it as `audit verify` does; a copy that
/// does not verify is removed and StoreError (exit 4) thrown. Returns the copy's verification.
VerifyOutcome backup(Session& s, const std::string& destination);

}  // namespace cw::app
