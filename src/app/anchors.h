// SPDX-License-Identifier: Apache-2.0
// Anchors: checkpoints of the audit trail (entry count, head hash, time) signed with the lab's
// Ed25519 key and kept outside the store (printed, mailed, on a second medium). A trail that is
// rewritten and re-hashed, has an entry forged before a checkpoint, or has lost its tail no
// longer contains the checkpoint, whatever its own hashes say.
//
// The anchor file is plain text, to be read by a person as well as by `audit verify --anchor`:
//
//   curvewarden anchor 1
//   lab: Millbrook Water Laboratory
//   entries: 42
//   head: <64 hex digits: the hash of entry 42>
//   at: 2026-11-30T17:00:00Z
//   key: <64 hex digits: the lab's Ed25519 public key>
//   signature: <128 hex digits: Ed25519 over the first five lines, each ended by \n>
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "app/session.h"

namespace cw::app {

struct Anchor {
  std::string lab;
  std::int64_t entries = 0;
  std::string head_hash;
  Instant at;
  std::string public_key;
  std::string signature;
};

/// The text the signature covers (the first five lines).
std::string anchor_message(const Anchor& a);
/// The whole anchor file.
std::string anchor_text(const Anchor& a);
/// Parses an anchor file's text; ValidationError naming `file` and the line otherwise.
Anchor parse_anchor(const std::string& text, const std::string& file);

/// Creates the lab key at `key_path` (0600) unless a file is there; true when created.
bool ensure_lab_key(const std::string& key_path);

/// A checkpoint of the trail as it stands, signed with the key at `key_path`. StoreError (exit 4)
/// when the key cannot be read; an empty trail cannot be anchored (UsageError).
Anchor make_anchor(Session& s, const std::string& key_path);

struct AnchorCheck {
  std::string file;
  Anchor anchor;
  bool signature_ok = false;  ///< signed by the lab key (or, without it, by the key it names)
  bool key_matches = true;    ///< the anchor names the lab key's public key
  bool contained = false;     ///< the trail still has the entry with the anchored hash
  std::string problem;        ///< what is wrong, in plain words ("" when it holds)
};

/// Checks each anchor against the trail: a valid signature, and entry `entries` present with the
/// anchored hash. `key_path` names the lab key when it can be read (nullopt: the anchors' own
/// keys are used, and said so).
std::vector<AnchorCheck> check_anchors(
    Session& s, const std::vector<std::pair<std::string, std::string>>& files,
    const std::optional<std::string>& key_path);

}  // namespace cw::app
