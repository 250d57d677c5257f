// SPDX-License-Identifier: Apache-2.0
// Canonical serialisation and hashing of audit entries.
#include "audit/audit_entry.h"

#include "audit/json_text.h"

namespace cw::audit {

void append_canonical_header(std::string& out, const AuditEntry& e) {
  // The compact JSON array nlohmann's dump() wrote when the chain was first hashed.
  out += '[';
  append_json_integer(out, e.seq);
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
}

std::string canonical_header(const AuditEntry& e) {
  std::string out;
  append_canonical_header(out, e);
  return out;
}

std::string compute_hash(const AuditEntry& e) {
  return EntryHasher().hash(e);
}

std::string EntryHasher::hash(const AuditEntry& e) {
  header_.clear();
  append_canonical_header(header_, e);
  digest_.restart();
  digest_.update(e.prev_hash);
  digest_.update("\n");
  digest_.update(header_);
  digest_.update("\n");
  digest_.update(e.payload);
  return digest_.hex();
}

}  // namespace cw::audit
