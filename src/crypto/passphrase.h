// SPDX-License-Identifier: Apache-2.0
// Passphrases of electronic signatures (21 CFR 11.300): only an Argon2id hash is ever stored
// (libsodium's crypto_pwhash_str form, which carries its own salt and limits).
#pragma once

#include <string>
#include <string_view>

namespace cw::crypto {

/// Shortest and longest passphrase accepted (characters are bytes of UTF-8 here).
inline constexpr std::size_t kMinPassphraseBytes = 10;
inline constexpr std::size_t kMaxPassphraseBytes = 1024;

/// The Argon2id hash of `passphrase` with libsodium's interactive limits (2 passes over 64 MiB):
/// a fraction of a second per signature on a workstation, and each guess costs an attacker as
/// much. Throws std::runtime_error when memory cannot be had.
std::string hash_passphrase(std::string_view passphrase);

/// True when `passphrase` matches `hash` (constant-time comparison inside libsodium); false for
/// a hash that is not of this form.
bool passphrase_matches(const std::string& hash, std::string_view passphrase);

/// Overwrites `secret` with zeros before it is released (sodium_memzero).
void wipe(std::string& secret);

}  // namespace cw::crypto
