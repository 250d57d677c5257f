// SPDX-License-Identifier: Apache-2.0
// SHA-256 through OpenSSL's EVP interface (the SHA256_* calls are deprecated in OpenSSL 3).
#include "audit/sha256.h"

#include <openssl/evp.h>

#include <array>
#include <stdexcept>

namespace cw::audit {
namespace {

std::string to_hex(const unsigned char* digest, unsigned int length) {
  static constexpr char kHex[] = "0123456789abcdef";
  std::string out(2 * static_cast<std::size_t>(length), '0');
  for (unsigned int i = 0; i < length; ++i) {
    out[2 * i] = kHex[digest[i] >> 4];
    out[2 * i + 1] = kHex[digest[i] & 0x0f];
  }
  return out;
}

/// SHA-256 as fetched from the default provider once (an implicit fetch per digest otherwise).
const EVP_MD* sha256_md() {
  static const EVP_MD* const md = [] {
    const EVP_MD* fetched = EVP_MD_fetch(nullptr, "SHA256", nullptr);
    return fetched != nullptr ? fetched : EVP_sha256();
  }();
  return md;
}

}  // namespace

std::string sha256_hex(std::string_view data) {
  std::array<unsigned char, EVP_MAX_MD_SIZE> digest{};
  unsigned int length = 0;
  if (EVP_Digest(data.data(), data.size(), digest.data(), &length, sha256_md(), nullptr) != 1) {
    throw std::runtime_error("SHA-256 computation failed");
  }
  return to_hex(digest.data(), length);
}

struct Sha256::Context {
  EVP_MD_CTX* ctx = nullptr;
  bool spent = false;
};

Sha256::Sha256() : context_(std::make_unique<Context>()) {
  context_->ctx = EVP_MD_CTX_new();
  if (context_->ctx == nullptr || EVP_DigestInit_ex(context_->ctx, sha256_md(), nullptr) != 1) {
    EVP_MD_CTX_free(context_->ctx);
    throw std::runtime_error("SHA-256 initialisation failed");
  }
}

Sha256::~Sha256() {
  EVP_MD_CTX_free(context_->ctx);
}

void Sha256::restart() {
  if (EVP_DigestInit_ex(context_->ctx, sha256_md(), nullptr) != 1) {
    throw std::runtime_error("SHA-256 initialisation failed");
  }
  context_->spent = false;
}

void Sha256::update(std::string_view data) {
  if (context_->spent) throw std::logic_error("SHA-256 fed after its digest was taken");
  if (EVP_DigestUpdate(context_->ctx, data.data(), data.size()) != 1) {
    throw std::runtime_error("SHA-256 computation failed");
  }
}

std::string Sha256::hex() {
  if (context_->spent) throw std::logic_error("SHA-256 digest taken twice");
  std::array<unsigned char, EVP_MAX_MD_SIZE> digest{};
  unsigned int length = 0;
  if (EVP_DigestFinal_ex(context_->ctx, digest.data(), &length) != 1) {
    throw std::runtime_error("SHA-256 computation failed");
  }
  context_->spent = true;
  return to_hex(digest.data(), length);
}

}  // namespace cw::audit
