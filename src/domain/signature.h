// SPDX-License-Identifier: Apache-2.0
// Electronic signatures (21 CFR 11.50, 11.200): a registered user's passphrase-confirmed act with
// its meaning, shown with the signer's full name and the time in the lab's zone wherever the
// signed record is shown; and the lockout after repeated wrong passphrases (11.300(d)).
#pragma once

#include <string>

#include "core/time.h"
#include "domain/user.h"

namespace cw {

/// Wrong passphrases in a row (since the user's last good signature, passphrase change or an
/// admin's unlock) after which the user is locked.
inline constexpr int kMaxFailedSignatures = 5;

/// True when `failures_in_a_row` wrong passphrases lock the user.
constexpr bool signature_locked(int failures_in_a_row) {
  return failures_in_a_row >= kMaxFailedSignatures;
}

struct Signature {
  UserId user;
  std::string code;     ///< the signer's user code
  std::string name;     ///< the signer's full name when signing
  std::string meaning;  ///< "approved", "rejected", "retired", "withdrawn", ...
  std::string entity_kind;
  std::string entity_id;
  Instant signed_at;
};

}  // namespace cw
