// SPDX-License-Identifier: Apache-2.0
// The progress line. It is written straight to the terminal: its text is ours (numbers and fixed
// words), and the carriage return that rewrites the line is what the output filter would refuse.
#include "cli/progress.h"

#include <unistd.h>

#include <string>

namespace cw::cli {
namespace {

void write_stderr(const std::string& text) {
  std::size_t done = 0;
  while (done < text.size()) {
    const ssize_t n = ::write(STDERR_FILENO, text.data() + done, text.size() - done);
    if (n <= 0) return;  // a progress line is not worth an error
    done += static_cast<std::size_t>(n);
  }
}

/// Carriage return, then erase to the end of the line (ANSI).
const char* const kClearLine = "\r\x1b[K";

}  // namespace

TerminalProgress::TerminalProgress(std::ostream& err)
    : err_(err), terminal_(::isatty(STDERR_FILENO) == 1) {}

TerminalProgress::~TerminalProgress() {
  if (shown_) write_stderr(kClearLine);
}

std::function<void(const app::RunProgress&)> TerminalProgress::callback() {
  if (!terminal_) return {};
  return [this](const app::RunProgress& p) { show(p); };
}

void TerminalProgress::show(const app::RunProgress& p) {
  err_.flush();
  std::string line = std::string(kClearLine) + "curvewarden: ";
  if (p.phase == app::RunProgress::Phase::Checking) {
    line += "checking the file: " + std::to_string(p.rows) + " rows";
  } else {
    line += "importing: " + std::to_string(p.rows) + " of " + std::to_string(p.total) + " rows";
    if (p.total > 0) line += " (" + std::to_string(100 * p.rows / p.total) + " %)";
  }
  write_stderr(line);
  shown_ = true;
}

}  // namespace cw::cli
