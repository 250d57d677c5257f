// SPDX-License-Identifier: Apache-2.0
// SHA-256 (OpenSSL EVP), as lowercase hex: of a whole text, or of a stream fed piece by piece.
#pragma once

#include <memory>
#include <string>
#include <string_view>

namespace cw::audit {

std::string sha256_hex(std::string_view data);

/// SHA-256 of data fed in pieces (a file read in chunks): the same digest as sha256_hex() of
/// the pieces joined.
class Sha256 {
 public:
  Sha256();
  ~Sha256();
  Sha256(const Sha256&) = delete;
  Sha256& operator=(const Sha256&) = delete;

  /// Starts a new digest with the same context (cheaper than a new object per digest).
  void restart();
  void update(std::string_view data);
  /// The digest of everything fed so far, as lowercase hex; the object is then spent.
  std::string hex();

 private:
  struct Context;
  std::unique_ptr<Context> context_;
};

}  // namespace cw::audit
