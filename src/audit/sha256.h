// SPDX-License-Identifier: Apache-2.0
// SHA-256 (OpenSSL EVP), as lowercase hex.
#pragma once

#include <string>
#include <string_view>

namespace cw::audit {

std::string sha256_hex(std::string_view data);

}  // namespace cw::audit
