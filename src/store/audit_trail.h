// SPDX-License-Identifier: Apache-2.0
// Reading and verifying the audit trail.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "audit/audit_entry.h"
#include "core/time.h"

namespace cw::store {

struct AuditFilter {
  std::optional<Instant> since;  ///< recorded at or after
  std::optional<std::string> entity_kind;
  std::optional<std::string> entity_id;
};

struct VerifyReport {
  std::int64_t entries = 0;
  bool ok = true;
  std::optional<std::int64_t> first_broken;  ///< seq of the first entry that does not hold
  std::string problem;                       ///< what is wrong there, in plain words
  std::string head_hash;                     ///< hash of the last entry (anchor it elsewhere)
};

/// The newest entry of the trail: what a printed record is checked against.
struct ChainHead {
  std::int64_t seq = 0;
  std::string hash;
};

class AuditReader {
 public:
  virtual ~AuditReader() = default;
  virtual std::vector<audit::AuditEntry> list(const AuditFilter& filter) = 0;
  /// The newest entry; nullopt for an empty trail.
  virtual std::optional<ChainHead> head() = 0;
  /// The hash of entry `seq`; nullopt when the trail has no such entry.
  virtual std::optional<std::string> hash_at(std::int64_t seq) = 0;
  /// Walks the chain: sequence without gaps, each prev_hash linking, each hash recomputed, and
  /// every fact row equal to the row recorded in its entry's payload (rows changed, deleted or
  /// added behind the tool's back are found).
  virtual VerifyReport verify() = 0;
};

}  // namespace cw::store
