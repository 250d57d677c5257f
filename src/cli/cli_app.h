// SPDX-License-Identifier: Apache-2.0
// The command-line interface: parses arguments (CLI11, from the command table), runs the
// handler, and turns every error into one message and the contract's exit code. This is the
// only catch site for the tool's errors.
#pragma once

#include <ostream>
#include <string>
#include <vector>

namespace cw::cli {

/// Runs the tool with `args` (without the program name); returns the exit code.
int run_cli(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);

}  // namespace cw::cli
