// SPDX-License-Identifier: Apache-2.0
// Online backup of a SQLite store.
#include <SQLiteCpp/Backup.h>
#include <fcntl.h>
#include <sqlite3.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <filesystem>

#include "core/error.h"
#include "store/backup.h"
#include "store/sqlite/database.h"

namespace cw::store {

void backup_store(const std::string& location, const std::string& destination,
                  int busy_timeout_ms) {
  // The copy is created here, empty and private, so that SQLite fills a file nobody else can
  // read (its -wal and -shm files take the same mode).
  const int fd =
      ::open(destination.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_NOFOLLOW | O_CLOEXEC, 0600);
  if (fd < 0) {
    throw StoreError("cannot create the backup '" + destination + "': " + std::strerror(errno),
                     "give the path of a new file in a folder you can write");
  }
  ::close(fd);
  try {
    SQLite::Database source(location, SQLite::OPEN_READONLY, busy_timeout_ms);
    SQLite::Database target(destination, SQLite::OPEN_READWRITE, busy_timeout_ms);
    SQLite::Backup backup(target, "main", source, "main");
    // One step copies every page from one read snapshot: the copy is a committed state.
    backup.executeStep(-1);
  } catch (const SQLite::Exception& e) {
    std::error_code ec;
    std::filesystem::remove(destination, ec);
    std::filesystem::remove(destination + "-wal", ec);
    std::filesystem::remove(destination + "-shm", ec);
    sqlite::rethrow(e, location);
  }
}

}  // namespace cw::store
