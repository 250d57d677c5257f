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

bool create_store_file(const std::string& path, std::optional<gid_t> group) {
  struct stat st {};
  if (::lstat(path.c_str(), &st) == 0) return false;
  const mode_t mode = group ? 0660 : 0600;
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
