// SPDX-License-Identifier: Apache-2.0
// Exit codes of the product contract (design/product.md §4).
#pragma once

namespace cw {

enum class ExitCode {
  Ok = 0,           ///< done
  BadInput = 2,     ///< bad usage or bad input; nothing written
  Refused = 3,      ///< refused or rejected by a rule; the refusal itself is recorded
  Store = 4,        ///< store unavailable, locked past the busy timeout, not ours, or corrupt
  AuditBroken = 5,  ///< the audit chain is broken
};

inline int to_int(ExitCode code) {
  return static_cast<int>(code);
}

}  // namespace cw
