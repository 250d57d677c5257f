// SPDX-License-Identifier: Apache-2.0
// Regular-file checks and capped reading.
#include "import/input_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
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
    fd_ = STDIN_FILENO;
    owned_ = false;
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
  if (fd_ >= 0 && owned_) ::close(fd_);
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
