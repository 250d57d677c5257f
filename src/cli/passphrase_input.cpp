// SPDX-License-Identifier: Apache-2.0
// Reading passphrases from a descriptor or the terminal.
#include "cli/passphrase_input.h"

#include <fcntl.h>
#include <termios.h>
#include <unistd.h>

#include <cerrno>

#include "core/error.h"
#include "crypto/passphrase.h"

namespace cw::cli {
namespace {

/// One line from `fd`, read byte by byte so that the next call starts at the next line; nullopt
/// at the end of input with nothing read.
std::optional<std::string> read_line(int fd) {
  std::string line;
  bool any = false;
  char c = 0;
  for (;;) {
    const ssize_t n = ::read(fd, &c, 1);
    if (n < 0) {
      if (errno == EINTR) continue;
      return std::nullopt;
    }
    if (n == 0) break;
    any = true;
    if (c == '\n') break;
    line.push_back(c);
    if (line.size() > crypto::kMaxPassphraseBytes + 1) break;  // longer is refused by the caller
  }
  if (!any) return std::nullopt;
  if (!line.empty() && line.back() == '\r') line.pop_back();
  return line;
}

class Terminal {
 public:
  Terminal() : fd_(::open("/dev/tty", O_RDWR | O_NOCTTY | O_CLOEXEC)) {}
  ~Terminal() {
    if (fd_ >= 0) ::close(fd_);
  }
  Terminal(const Terminal&) = delete;
  Terminal& operator=(const Terminal&) = delete;
  bool open() const { return fd_ >= 0; }

  std::string ask(const std::string& prompt) {
    say(prompt);
    termios saved{};
    const bool restore = ::tcgetattr(fd_, &saved) == 0;
    if (restore) {
      termios quiet = saved;
      quiet.c_lflag &= ~static_cast<tcflag_t>(ECHO);
      ::tcsetattr(fd_, TCSAFLUSH, &quiet);
    }
    auto line = read_line(fd_);
    if (restore) ::tcsetattr(fd_, TCSAFLUSH, &saved);
    say("\n");
    if (!line) throw UsageError("no passphrase was typed");
    return *line;
  }

 private:
  void say(const std::string& text) {
    const ssize_t ignored = ::write(fd_, text.data(), text.size());
    (void)ignored;
  }
  int fd_;
};

}  // namespace

std::string PassphraseInput::read(const std::string& prompt, bool is_new) {
  if (fd_) {
    if (::fcntl(*fd_, F_GETFD) < 0) {
      throw option_error("--passphrase-fd",
                         "--passphrase-fd " + std::to_string(*fd_) + " is not an open descriptor",
                         "open it in the shell, e.g. '--passphrase-fd 3 3<file'");
    }
    auto line = read_line(*fd_);
    if (!line) {
      throw option_error("--passphrase-fd",
                         "--passphrase-fd " + std::to_string(*fd_) +
                             " has no more lines: the command needs another passphrase (" +
                             prompt.substr(0, prompt.find(':')) + ")",
                         "give one passphrase per line, in the order the command asks for them");
    }
    return *line;
  }
  Terminal tty;
  if (!tty.open()) {
    throw UsageError("this command is signed and there is no terminal to ask the passphrase on",
                     "give --passphrase-fd N with the passphrase on that descriptor");
  }
  std::string first = tty.ask(prompt);
  if (!is_new) return first;
  std::string again = tty.ask("Again: ");
  const bool same = first == again;
  crypto::wipe(again);
  if (!same) {
    crypto::wipe(first);
    throw UsageError("the two passphrases typed differ; nothing was changed");
  }
  return first;
}

}  // namespace cw::cli
