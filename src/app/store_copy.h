// SPDX-License-Identifier: Apache-2.0
// `store copy`: a whole store (every fact table and the audit trail) copied into an empty store,
// on the same backend or another, verbatim: the copy's trail is the source's, entry for entry,
// and verifies with the same head hash. Nothing is added to either trail (an entry recording the
// copy would change the destination's head hash, and the source is only read); the outcome names
// both head hashes for the person who moves the lab to write down.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace cw::app {

struct StoreCopyRequest {
  std::string from;      ///< the source store's location (must exist)
  std::string to;        ///< the destination's location (opened with create: a new store)
  std::string os_login;  ///< for entries a migration of either store writes
};

struct TableCount {
  std::string table;
  std::int64_t rows = 0;
};

struct StoreCopyOutcome {
  std::string from;
  std::string to;
  int schema_version = 0;
  std::int64_t entries = 0;        ///< audit entries copied (the trail's length on both ends)
  std::int64_t rows = 0;           ///< fact rows copied
  std::vector<TableCount> tables;  ///< rows copied per table (the audit trail first)
  std::string source_head_hash;
  std::string destination_head_hash;  ///< equal to the source's (else the copy failed)
};

/// Verifies the source (its chain and append-only guards, in the snapshot the copy reads: exit
/// 5, or 4 for missing guards, before anything is written), checks the destination is at the
/// same schema version (else StoreError, exit 4) and empty (else UsageError, exit 2), appends
/// every row in one transaction, then verifies the destination as `audit verify` does and
/// compares its entry count and head hash with the source's (StoreError, exit 4, otherwise).
/// The caller removes a destination file it created when this throws.
StoreCopyOutcome copy_store(const StoreCopyRequest& request);

}  // namespace cw::app
