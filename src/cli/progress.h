// SPDX-License-Identifier: Apache-2.0
// The progress line of long imports: on stderr, and only when stderr is a terminal (product.md
// §4); scripts and logs get nothing.
#pragma once

#include <functional>
#include <ostream>

#include "app/runs.h"

namespace cw::cli {

/// Rewrites one line on the terminal as an import goes, and clears it when it is destroyed (so
/// that a report or an error starts on a clean line).
class TerminalProgress {
 public:
  explicit TerminalProgress(std::ostream& err);
  ~TerminalProgress();
  TerminalProgress(const TerminalProgress&) = delete;
  TerminalProgress& operator=(const TerminalProgress&) = delete;

  /// The callback for the use case: empty when stderr is not a terminal.
  std::function<void(const app::RunProgress&)> callback();

 private:
  void show(const app::RunProgress& p);

  std::ostream& err_;
  bool terminal_ = false;
  bool shown_ = false;
};

}  // namespace cw::cli
