// SPDX-License-Identifier: Apache-2.0
// SHA-256 through OpenSSL's EVP interface (the SHA256_* calls are deprecated in OpenSSL 3).
#include "audit/sha256.h"

#include <openssl/evp.h>

#include <array>
#include <stdexcept>

namespace cw::audit {

std::string sha256_hex(std::string_view data) {
  std::array<unsigned char, EVP_MAX_MD_SIZE> digest{};
  unsigned int length = 0;
  if (EVP_Digest(data.data(), data.size(), digest.data(), &length, EVP_sha256(), nullptr) != 1) {
    throw std::runtime_error("SHA-256 computation failed");
  }
  static constexpr char kHex[] = "0123456789abcdef";
  std::string out;
  out.reserve(2 * length);
  for (unsigned int i = 0; i < length; ++i) {
    out.push_back(kHex[digest[i] >> 4]);
    out.push_back(kHex[digest[i] & 0x0f]);
  }
  return out;
}

}  // namespace cw::audit
