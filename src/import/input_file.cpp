// SPDX-License-Identifier: Apache-2.0
// Regular-file checks and capped reading.
#include "import/input_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>

#include "core/error.h"
#include "core/utf8.h"

namespace cw::import {
namespace {

std::string kind_of(mode_t mode) {
  if (S_ISDIR(mode)) return "a directory";
  if (S_ISFIFO(mode)) return "a named pipe (FIFO)";
  if (S_ISCHR(mode)) return "a character device";
  if (S_ISBLK(mode)) return "a block device";
  if (S_ISSOCK(mode)) return "a socket";
  return "not a regular file";
}

std::string size_text(std::size_t bytes) {
  if (bytes >= (1u << 20) && bytes % (1u << 20) == 0) return std::to_string(bytes >> 20) + " MiB";
  return std::to_string(bytes) + " bytes";
}

/// Standard input as it can be read again from its start: a descriptor of its own (closed at
/// exit by the system) and the offset its content starts at.
struct RereadableInput {
  int fd = -1;
  off_t start = 0;
};

/// An unnamed temporary file in $TMPDIR (else /tmp), gone when its descriptor closes.
int unnamed_temporary_file() {
  const char* dir = std::getenv("TMPDIR");
  const std::string folder = dir != nullptr && *dir != '\0' ? dir : "/tmp";
  int fd = ::open(folder.c_str(), O_TMPFILE | O_RDWR | O_CLOEXEC, 0600);
  if (fd >= 0) return fd;
  std::string name = folder + "/curvewarden-stdin-XXXXXX";
  fd = ::mkostemp(name.data(), O_CLOEXEC);
  if (fd >= 0) ::unlink(name.c_str());
  return fd;
}

/// Standard input, made readable again from its start the first time it is asked for: a
/// redirected regular file is used where it stands; a pipe is copied into an unnamed temporary
/// file, at most `max_bytes` (more is refused as the reading itself would refuse it).
const RereadableInput& rereadable_stdin(std::size_t max_bytes, const SourceLocation& where,
                                        const std::string& prefix) {
  static RereadableInput input;
  if (input.fd >= 0) return input;
  struct stat st {};
  if (::fstat(STDIN_FILENO, &st) == 0 && S_ISREG(st.st_mode)) {
    const off_t at = ::lseek(STDIN_FILENO, 0, SEEK_CUR);
    if (at >= 0) {
      input = {STDIN_FILENO, at};
      return input;
    }
  }
  const int copy = unnamed_temporary_file();
  if (copy < 0) {
    throw ValidationError(where,
                          prefix +
                              "standard input cannot be kept for reading: no temporary "
                              "file could be made (" +
                              std::strerror(errno) + ")",
                          "set TMPDIR to a writable folder, or give the path of the file");
  }
  std::string buffer(1u << 16, '\0');
  std::size_t total = 0;
  for (;;) {
    const ssize_t n = ::read(STDIN_FILENO, buffer.data(), buffer.size());
    if (n < 0 && errno == EINTR) continue;
    if (n < 0) {
      const int err = errno;
      ::close(copy);
      throw ValidationError(where, prefix + "read error: " + std::strerror(err));
    }
    if (n == 0) break;
    total += static_cast<std::size_t>(n);
    if (total > max_bytes) {
      ::close(copy);
      throw ValidationError(where, prefix + "is larger than the limit of " + size_text(max_bytes),
                            "split the file, or check that it is the file you meant");
    }
    for (ssize_t written = 0; written < n;) {
      const ssize_t w =
          ::write(copy, buffer.data() + written, static_cast<std::size_t>(n - written));
      if (w < 0 && errno == EINTR) continue;
      if (w <= 0) {
        const int err = errno;
        ::close(copy);
        throw ValidationError(
            where, prefix + "standard input cannot be kept for reading: " + std::strerror(err),
            "set TMPDIR to a folder with room, or give the path of the file");
      }
      written += w;
    }
  }
  input = {copy, 0};
  return input;
}

}  // namespace

std::string recorded_name(const std::string& path) {
  return path == "-" ? "(standard input)" : path;
}

InputFile::InputFile(const std::string& path, std::size_t max_bytes, std::string_view option)
    : path_(path), option_(option), max_bytes_(max_bytes) {
  const SourceLocation where{recorded_name(path), std::nullopt, std::nullopt, {}};
  const std::string prefix = option_ + " '" + path + "': ";
  if (path == "-") {
    if (::isatty(STDIN_FILENO)) {
      throw ValidationError(where, prefix + "standard input is a terminal",
                            "pipe the file in, e.g. curvewarden ... " + option_ + " - < FILE");
    }
    const RereadableInput& input = rereadable_stdin(max_bytes_, where, prefix);
    fd_ = ::dup(input.fd);
    if (fd_ < 0 || ::lseek(fd_, input.start, SEEK_SET) < 0) {
      throw ValidationError(
          where, prefix + "standard input cannot be read again: " + std::strerror(errno));
    }
    return;
  }
  struct stat before {};
  if (::stat(path.c_str(), &before) != 0) {
    const int err = errno;
    throw ValidationError(where, prefix + (err == ENOENT ? "no such file" : std::strerror(err)),
                          "check the path (relative paths start from the current directory)");
  }
  if (!S_ISREG(before.st_mode)) {
    throw ValidationError(where, prefix + "is " + kind_of(before.st_mode),
                          "give the path of an ordinary file");
  }
  fd_ = ::open(path.c_str(), O_RDONLY | O_NONBLOCK | O_NOCTTY | O_CLOEXEC);
  if (fd_ < 0) {
    throw ValidationError(where, prefix + "cannot be opened: " + std::strerror(errno),
                          "check the file's permissions");
  }
  struct stat after {};
  if (::fstat(fd_, &after) != 0 || !S_ISREG(after.st_mode) || after.st_ino != before.st_ino ||
      after.st_dev != before.st_dev) {
    ::close(fd_);
    fd_ = -1;
    throw ValidationError(where, prefix + "changed while it was being opened",
                          "give the path of an ordinary file that is not being replaced");
  }
  if (static_cast<std::size_t>(after.st_size) > max_bytes_) {
    ::close(fd_);
    fd_ = -1;
    throw ValidationError(where,
                          prefix + "is " + std::to_string(after.st_size) +
                              " bytes, more than the limit of " + size_text(max_bytes_),
                          "split the file, or check that it is the file you meant");
  }
}

InputFile::~InputFile() {
  if (fd_ >= 0) ::close(fd_);
}

bool InputFile::read_some(std::string& out, std::size_t chunk) {
  const std::size_t start = out.size();
  out.resize(start + chunk);
  ssize_t n = 0;
  do {
    n = ::read(fd_, out.data() + start, chunk);
  } while (n < 0 && errno == EINTR);
  if (n < 0) {
    const int err = errno;
    out.resize(start);
    throw ValidationError(SourceLocation{recorded_name(path_), std::nullopt, std::nullopt, {}},
                          option_ + " '" + path_ + "': read error: " + std::strerror(err));
  }
  out.resize(start + static_cast<std::size_t>(n));
  read_ += static_cast<std::size_t>(n);
  if (read_ > max_bytes_) {
    throw ValidationError(
        SourceLocation{path_, std::nullopt, std::nullopt, {}},
        option_ + " '" + path_ + "': is larger than the limit of " + size_text(max_bytes_),
        "split the file, or check that it is the file you meant");
  }
  return n > 0;
}

std::string InputFile::read_all() {
  std::string text;
  while (read_some(text)) {
  }
  return text;
}

std::string read_text_file(const std::string& path, std::size_t max_bytes,
                           std::string_view option) {
  InputFile file(path, max_bytes, option);
  std::string text = file.read_all();
  if (!is_valid_utf8(text)) {
    // Name the line of the first bad byte, so that the user can find it.
    long line = 1;
    for (std::size_t pos = 0; pos < text.size();) {
      const std::size_t at = pos;
      if (!next_code_point(text, pos)) break;
      if (text[at] == '\n') ++line;
    }
    throw ValidationError(SourceLocation{recorded_name(path), line, std::nullopt, {}},
                          std::string(option) + " '" + path + "' is not UTF-8 text",
                          "save the file as UTF-8 (plain CSV or TOML text)");
  }
  return text;
}

}  // namespace cw::import
