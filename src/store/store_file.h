// SPDX-License-Identifier: Apache-2.0
// File hygiene of a store that is a file: created private before the backend writes to it (a
// SQLite store's -wal and -shm files take the store file's mode and group), and never reached
// through a symbolic link by accident.
#pragma once

#include <sys/types.h>
#include <optional>
#include <string>

namespace cw::store {

/// Creates the empty file `path` for a new store with mode 0600, or 0660 owned by `group` (a
/// workstation shared by a group of users). Does nothing when `path` exists. Returns true when
/// this call created the file. Throws StoreError naming the path when it cannot be created or
/// given the group.
bool create_store_file(const std::string& path, std::optional<gid_t> group);

/// Removes a store file this process created and its -wal and -shm side files (an `init` that
/// failed leaves nothing behind). Errors are ignored: the files may not exist.
void remove_new_store_files(const std::string& path);

/// True when `path` is a symbolic link.
bool is_symlink(const std::string& path);

}  // namespace cw::store
