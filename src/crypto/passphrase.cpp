// SPDX-License-Identifier: Apache-2.0
// Argon2id passphrase hashes with libsodium.
#include "crypto/passphrase.h"

#include <sodium.h>

#include <stdexcept>

namespace cw::crypto {
namespace {

void ready() {
  if (sodium_init() < 0) throw std::runtime_error("libsodium could not be initialised");
}

}  // namespace

std::string hash_passphrase(std::string_view passphrase) {
  ready();
  char out[crypto_pwhash_STRBYTES];
  if (crypto_pwhash_str_alg(out, passphrase.data(), passphrase.size(),
                            crypto_pwhash_OPSLIMIT_INTERACTIVE, crypto_pwhash_MEMLIMIT_INTERACTIVE,
                            crypto_pwhash_ALG_ARGON2ID13) != 0) {
    throw std::runtime_error("not enough memory to hash the passphrase (Argon2id, 64 MiB)");
  }
  return out;
}

bool passphrase_matches(const std::string& hash, std::string_view passphrase) {
  ready();
  if (hash.size() >= crypto_pwhash_STRBYTES) return false;
  return crypto_pwhash_str_verify(hash.c_str(), passphrase.data(), passphrase.size()) == 0;
}

void wipe(std::string& secret) {
  if (!secret.empty()) sodium_memzero(secret.data(), secret.size());
  secret.clear();
}

}  // namespace cw::crypto
