// SPDX-License-Identifier: Apache-2.0
// One entry of the append-only, hash-chained audit trail, and its canonical serialisation.
//
// Canonical form (what the hash covers), documented in DEVELOPERS.md:
//   header  = compact JSON array
//             [seq, recorded_at, occurred_at, actor, action, entity_kind, entity_id,
//              reason-or-null, clock_overridden, tool_version(, os_login)]
//             (os_login, the operating-system login of the process, only in entries written
//             since schema 7: earlier entries keep their ten-element header and their hash)
//   hash    = hex(SHA-256(prev_hash + "\n" + header + "\n" + payload))
// where payload is the stored canonical JSON text of the rows the entry wrote (an object
// keyed by table name, each a list of rows ordered by id, keys sorted), and prev_hash of
// entry 1 is 64 zeros.
#pragma once

#include <array>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

#include "audit/sha256.h"

namespace cw::audit {

inline const std::string kGenesisHash(64, '0');

/// The kinds of entity an entry names (`entity_kind`), sorted: what `audit log --entity` takes.
/// A refusal of `quantify` names its sample.
inline constexpr std::array<std::string_view, 11> kEntityKinds = {
    "calibration", "check",  "curve", "instrument", "lab", "lot",
    "method",      "result", "run",   "sample",     "user"};

struct AuditEntry {
  std::int64_t seq = 0;
  std::string recorded_at;  ///< UTC ISO-8601
  std::string occurred_at;  ///< UTC ISO-8601
  std::string actor;
  std::string action;       ///< e.g. "lot.withdraw"
  std::string entity_kind;  ///< e.g. "lot"
  std::string entity_id;    ///< e.g. "CRM-NO3-0042" or "17"
  std::optional<std::string> reason;
  bool clock_overridden = false;
  std::string tool_version;
  std::optional<std::string> os_login;  ///< nullopt in entries written before schema 7
  std::string payload;                  ///< canonical JSON text
  std::string prev_hash;
  std::string hash;
};

/// The header line of the canonical form.
std::string canonical_header(const AuditEntry& e);
/// Appends the header line of the canonical form to `out`.
void append_canonical_header(std::string& out, const AuditEntry& e);
/// The hash of `e` given its prev_hash and payload (e.hash is ignored).
std::string compute_hash(const AuditEntry& e);

/// compute_hash for one entry after another (`audit verify`), with one SHA-256 context and one
/// header buffer reused, and the canonical text fed to the digest in pieces, never joined.
class EntryHasher {
 public:
  /// The hash of `e`, as compute_hash(e).
  std::string hash(const AuditEntry& e);

 private:
  Sha256 digest_;
  std::string header_;
};

}  // namespace cw::audit
