// SPDX-License-Identifier: Apache-2.0
// Canonical serialisation and hashing of audit entries.
#include "audit/audit_entry.h"

#include <nlohmann/json.hpp>

#include "audit/sha256.h"

namespace cw::audit {

std::string canonical_header(const AuditEntry& e) {
  nlohmann::json header = nlohmann::json::array();
  header.push_back(e.seq);
  header.push_back(e.recorded_at);
  header.push_back(e.occurred_at);
  header.push_back(e.actor);
  header.push_back(e.action);
  header.push_back(e.entity_kind);
  header.push_back(e.entity_id);
  if (e.reason) {
    header.push_back(*e.reason);
  } else {
    header.push_back(nullptr);
  }
  header.push_back(e.clock_overridden);
  header.push_back(e.tool_version);
  if (e.os_login) header.push_back(*e.os_login);
  return header.dump();
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
