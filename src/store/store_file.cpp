// SPDX-License-Identifier: Apache-2.0
// Creating a store file with the right mode.
#include "store/store_file.h"

#include <fcntl.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cstring>
#include <filesystem>
#include <thread>

#include "core/error.h"

namespace cw::store {

namespace {

/// An empty file already at `path` (made ready by someone beforehand) becomes the store only
/// when it belongs to this account, and then with the mode of a new store: a file another
/// account made keeps that account's owner and mode, so it could read every fact, passphrase
/// hashes included.
void claim_empty_file(const std::string& path, mode_t mode, std::optional<gid_t> group) {
  const int fd = ::open(path.c_str(), O_WRONLY | O_NOFOLLOW | O_NONBLOCK | O_CLOEXEC);
  if (fd < 0) return;  // opening the store reports what is wrong with it
  struct stat st {};
  if (::fstat(fd, &st) != 0 || !S_ISREG(st.st_mode) || st.st_size != 0) {
    ::close(fd);
    return;
  }
  if (st.st_uid != ::geteuid()) {
    ::close(fd);
    throw StoreError("'" + path + "' is an empty file of another account (uid " +
                         std::to_string(st.st_uid) +
                         "): a store made in it would keep that owner and mode; nothing was "
                         "written",
                     "remove the file, or let its owner run the command: a store is created "
                     "private to the account that makes it");
  }
  std::string why;
  if (group && ::fchown(fd, static_cast<uid_t>(-1), *group) != 0) {
    why = std::string("cannot give it the group: ") + std::strerror(errno);
  } else if (::fchmod(fd, mode) != 0) {
    why = std::strerror(errno);
  }
  ::close(fd);
  if (!why.empty()) {
    throw StoreError("cannot make the empty file '" + path + "' private for the store: " + why +
                         "; nothing was written",
                     "remove the file and run the command again, or choose another path");
  }
}

}  // namespace

bool create_store_file(const std::string& path, std::optional<gid_t> group) {
  struct stat st {};
  const mode_t mode = group ? 0660 : 0600;
  if (::lstat(path.c_str(), &st) == 0) {
    if (S_ISREG(st.st_mode) && st.st_size == 0) claim_empty_file(path, mode, group);
    return false;
  }
  const int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_NOFOLLOW | O_CLOEXEC, mode);
  if (fd < 0) {
    if (errno == EEXIST) return false;  // another init created it meanwhile
    throw StoreError("cannot create the store '" + path + "': " + std::strerror(errno),
                     "check the folder exists and can be written");
  }
  bool ok = true;
  std::string why;
  if (group && ::fchown(fd, static_cast<uid_t>(-1), *group) != 0) {
    ok = false;
    why = std::string("cannot give it the group: ") + std::strerror(errno);
  }
  // The umask may have taken bits off the mode asked for: set it exactly.
  if (ok && ::fchmod(fd, mode) != 0) {
    ok = false;
    why = std::strerror(errno);
  }
  ::close(fd);
  if (!ok) {
    ::unlink(path.c_str());
    throw StoreError("cannot create the store '" + path + "': " + why,
                     "give a group you belong to (see the 'id' command)");
  }
  return true;
}

void remove_new_store_files(const std::string& path) {
  for (const char* suffix : {"-wal", "-shm", ""}) ::unlink((path + suffix).c_str());
}

FolderLock::FolderLock(const std::string& path_in_folder, int timeout_ms) {
  const std::filesystem::path folder = std::filesystem::path(path_in_folder).parent_path().empty()
                                           ? std::filesystem::path(".")
                                           : std::filesystem::path(path_in_folder).parent_path();
  fd_ = ::open(folder.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
  if (fd_ < 0) return;
  const auto deadline = std::chrono::steady_clock::now() + std::chrono::milliseconds(timeout_ms);
  while (::flock(fd_, LOCK_EX | LOCK_NB) != 0) {
    if (errno != EWOULDBLOCK && errno != EINTR) {
      ::close(fd_);  // a folder that cannot be locked (some network file systems): go on as before
      fd_ = -1;
      return;
    }
    if (std::chrono::steady_clock::now() >= deadline) {
      ::close(fd_);
      fd_ = -1;
      throw StoreError("another 'curvewarden init' is creating a store in '" + folder.string() +
                           "' and still busy after " + std::to_string(timeout_ms / 1000) +
                           " s; nothing was written",
                       "wait for it to finish (it may be asking for a passphrase), then try again");
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
  }
}

FolderLock::~FolderLock() {
  if (fd_ >= 0) ::close(fd_);  // closing releases the flock
}

bool is_symlink(const std::string& path) {
  struct stat st {};
  return ::lstat(path.c_str(), &st) == 0 && S_ISLNK(st.st_mode);
}

}  // namespace cw::store
