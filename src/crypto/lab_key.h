// SPDX-License-Identifier: Apache-2.0
// The lab's Ed25519 key: it signs checkpoints of the audit trail (anchors), so that a trail
// rewritten inside the store file no longer matches what was signed outside it. The key lives in
// a file of its own, never in the store (mode 0600).
#pragma once

#include <string>
#include <string_view>

namespace cw::crypto {

struct LabKey {
  std::string public_hex;  ///< 32 bytes, lowercase hex
  std::string secret_hex;  ///< 64 bytes (libsodium's seed + public key), lowercase hex
};

/// A new key pair from the system's random source.
LabKey generate_lab_key();

/// Writes `key` to `path`, created with mode 0600 (never replacing an existing file): throws
/// std::runtime_error naming the path otherwise.
void write_lab_key(const std::string& path, const LabKey& key);
/// Reads a key file written by write_lab_key; throws std::runtime_error naming the path and what
/// is wrong (missing, group- or world-readable, damaged).
LabKey read_lab_key(const std::string& path);

/// The Ed25519 signature of `message`, lowercase hex (64 bytes).
std::string sign(const LabKey& key, std::string_view message);
/// True when `signature_hex` is `public_hex`'s signature of `message`.
bool signature_valid(const std::string& public_hex, std::string_view message,
                     const std::string& signature_hex);

/// Lowercase hex of the SHA-256 (libsodium) of a public key: a short name to compare keys by.
std::string key_fingerprint(const std::string& public_hex);

}  // namespace cw::crypto
