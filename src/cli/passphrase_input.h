// SPDX-License-Identifier: Apache-2.0
// Where a signing command reads passphrases: a line at a time from the file descriptor of
// --passphrase-fd N (scripts), else from the controlling terminal with echo off. Nothing else
// (no environment variable, no option value): a passphrase never appears in a process list or a
// shell history.
#pragma once

#include <optional>
#include <string>

namespace cw::cli {

class PassphraseInput {
 public:
  /// `fd`: --passphrase-fd, or nullopt for the terminal.
  explicit PassphraseInput(std::optional<int> fd) : fd_(fd) {}
  /// One passphrase (its line ending removed). On a terminal the prompt is shown there and a new
  /// passphrase is asked twice. UsageError naming --passphrase-fd when the descriptor is not
  /// open or has no more lines, or when there is neither a descriptor nor a terminal.
  std::string read(const std::string& prompt, bool is_new);

 private:
  std::optional<int> fd_;
};

}  // namespace cw::cli
