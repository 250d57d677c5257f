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
/// workstation shared by a group of users). An empty file already there is given that mode
/// when it belongs to this account and refused (StoreError) when it belongs to another; any
/// other existing path is left alone. Returns true when this call created the file. Throws
/// StoreError naming the path when it cannot be created or given the group.
bool create_store_file(const std::string& path, std::optional<gid_t> group);

/// Removes a store file this process created and its -wal and -shm side files (an `init` that
/// failed leaves nothing behind). Errors are ignored: the files may not exist.
void remove_new_store_files(const std::string& path);

/// Serializes the making of new store files in one folder across processes (an flock on the
/// folder, held for the object's life), so that an `init` which fails and removes the file it
/// created never removes one that another `init` has meanwhile written and reported. Waits up to
/// `timeout_ms` for another holder, then throws StoreError (exit 4). Locks nothing when the
/// folder cannot be opened: creating the file then fails with its own message.
class FolderLock {
 public:
  FolderLock(const std::string& path_in_folder, int timeout_ms);
  ~FolderLock();
  FolderLock(const FolderLock&) = delete;
  FolderLock& operator=(const FolderLock&) = delete;

 private:
  int fd_ = -1;
};

/// True when `path` is a symbolic link.
bool is_symlink(const std::string& path);

}  // namespace cw::store
