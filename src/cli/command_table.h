// SPDX-License-Identifier: Apache-2.0
// The command line as data: every command with its path, summary, options and handler. The
// parser (cli_app.cpp), --help, `curvewarden help COMMAND`, and the documentation tests are all
// built from this one table.
#pragma once

#include <string_view>
#include <vector>

namespace cw::cli {

class Invocation;

enum class OptionKind {
  Flag,        ///< --approve
  Value,       ///< --method CODE (at most once)
  Repeated,    ///< --value A=1 --value B=2
  Positional,  ///< curve show ID
};

struct OptionSpec {
  std::string_view name;        ///< "--method", or the positional's name ("id")
  std::string_view value_name;  ///< "CODE" (empty for flags)
  std::string_view help;
  OptionKind kind = OptionKind::Value;
  bool required = false;
};

/// A handler runs one command; it returns the exit code (errors are thrown).
using Handler = int (*)(Invocation&);

struct CommandSpec {
  std::string_view path;     ///< "curve log"; a group ("curve") has no handler
  std::string_view summary;  ///< one line for --help
  std::vector<OptionSpec> options;
  bool records_event = false;  ///< writes a dated fact: --at may not lie in the future
  Handler handler = nullptr;
};

/// Every command and group, groups before their commands.
const std::vector<CommandSpec>& command_table();
/// The options every command accepts (--db, --as, --at, --json).
const std::vector<OptionSpec>& global_options();
/// The command with exactly this path, or nullptr.
const CommandSpec* find_command(std::string_view path);

/// The standing notice shown in --help, README and reports (product.md §8).
extern const char* const kCautionText;

}  // namespace cw::cli
