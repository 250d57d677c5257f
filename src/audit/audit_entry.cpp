// SPDX-License-Identifier: Apache-2.0
// Canonical serialisation and hashing of audit entries.
#include "audit/audit_entry.h"

#include "audit/json_text.h"
#include "audit/sha256.h"

namespace cw::audit {

std::string canonical_header(const AuditEntry& e) {
  // The compact dump of a JSON array, written directly (one per entry written or verified).
  std::string out;
  out.reserve(160 + e.actor.size() + e.action.size() + e.entity_id.size() +
              (e.reason ? e.reason->size() : 0));
  out += '[';
  out += std::to_string(e.seq);
  for (const std::string* text :
       {&e.recorded_at, &e.occurred_at, &e.actor, &e.action, &e.entity_kind, &e.entity_id}) {
    out += ',';
    append_json_string(out, *text);
  }
  out += ',';
  if (e.reason) {
    append_json_string(out, *e.reason);
  } else {
    out += "null";
  }
  out += e.clock_overridden ? ",true," : ",false,";
  append_json_string(out, e.tool_version);
  if (e.os_login) {
    out += ',';
    append_json_string(out, *e.os_login);
  }
  out += ']';
  return out;
}

std::string compute_hash(const AuditEntry& e) {
  std::string text;
  text.reserve(e.prev_hash.size() + e.payload.size() + 256);
  text += e.prev_hash;
  text += '\n';
  text += canonical_header(e);
  text += '\n';
  text += e.payload;
  return sha256_hex(text);
}

}  // namespace cw::audit
