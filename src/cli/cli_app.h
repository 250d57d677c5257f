// SPDX-License-Identifier: Apache-2.0
// The command-line interface: parses arguments (CLI11), runs the handler, and turns every
// error into one message and the contract's exit code. This is the only catch site for
// the tool's errors.
#pragma once

#include <ostream>
#include <string>
#include <vector>

namespace cw::cli {

/// Runs the tool with `args` (without the program name); returns the exit code.
int run_cli(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);

/// The standing notice shown in --help, README and reports (product.md §8).
extern const char* const kCautionText;

}  // namespace cw::cli
