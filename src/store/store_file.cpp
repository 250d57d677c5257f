// SPDX-License-Identifier: Apache-2.0
// Creating a store file with the right mode.
#include "store/store_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

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

bool is_symlink(const std::string& path) {
  struct stat st {};
  return ::lstat(path.c_str(), &st) == 0 && S_ISLNK(st.st_mode);
}

}  // namespace cw::store
