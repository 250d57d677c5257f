// SPDX-License-Identifier: Apache-2.0
// A consistent copy of a store while others may be writing to it (SQLite's online backup API
// copies one snapshot, so the copy holds whole transactions only).
#pragma once

#include <string>

namespace cw::store {

/// Copies the store at `location` to the new file `destination` (created with mode 0600; an
/// existing file is never replaced). Throws StoreError (exit 4) when the store cannot be read or
/// the copy cannot be written; the partial copy is removed.
void backup_store(const std::string& location, const std::string& destination,
                  int busy_timeout_ms = 5000);

}  // namespace cw::store
