// SPDX-License-Identifier: Apache-2.0
// Migration 0007's step: the free-text names of an earlier store's trail become users.
#include "domain/user.h"
#include "store/sqlite/audit_repository.h"
#include "store/sqlite/database.h"
#include "store/sqlite/registry_repository.h"

namespace cw::store::sqlite {

void register_legacy_actors(Database& db, const Clock& clock) {
  SqliteRegistry registry(db, nullptr);
  const std::vector<std::string> names = registry.unregistered_actors();
  if (names.empty()) return;
  WriteState w;
  SqliteRegistry writer(db, &w);
  SqliteAudit audit(db);
  audit.start(w);
  const Actor actor{"curvewarden", &clock, "curvewarden migration 0007", db.os_login};
  const Instant now = clock.now();
  const std::string reason =
      "recorded as a free-text name before users were registered; disabled until an admin "
      "enables it";
  for (const std::string& name : names) {
    const std::string code = canonical_user_code(name);
    const UserId id = writer.add_user(code, name, now);
    writer.add_user_event(id, {UserStatus::Disabled, Role::Analyst, reason, "curvewarden", now});
    audit.append(w, actor, {"user.register-legacy", "user", code, reason, now});
  }
}

}  // namespace cw::store::sqlite
