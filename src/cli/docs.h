// SPDX-License-Identifier: Apache-2.0
// The manual page and the bash completion, generated from the command table so that they cannot
// drift from the commands (built by the docgen tool at build time and installed with the binary).
#pragma once

#include <string>

namespace cw::cli {

/// The manual page, roff (man(7)) source: name, synopsis, every command with its options, exit
/// codes, environment, files and the standing caution.
std::string man_page();

/// A bash completion script: commands at each level and each command's options.
std::string bash_completion();

}  // namespace cw::cli
