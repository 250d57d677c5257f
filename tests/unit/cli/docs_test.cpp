// SPDX-License-Identifier: Apache-2.0
// The command table documents itself: every command and option has help text, and the README's
// command list names every command and every option (its "Commands" section is the reference a
// lab reads; a command or option missing there is missing for them).
#include <catch2/catch.hpp>

#include <fstream>
#include <sstream>
#include <string>

#include "cli/command_table.h"

#ifndef CW_README
#error "CW_README must name README.md (see tests/unit/cli/CMakeLists.txt)"
#endif

namespace {

std::string readme_commands() {
  std::ifstream in(CW_README);
  std::ostringstream text;
  text << in.rdbuf();
  const std::string all = text.str();
  const auto start = all.find("## Commands");
  const auto end = all.find("\n## ", start + 1);
  REQUIRE(start != std::string::npos);
  return all.substr(start, end - start);
}

}  // namespace

TEST_CASE("cli docs: every command and option has help text", "[cli]") {
  for (const auto& command : cw::cli::command_table()) {
    INFO(command.path);
    CHECK_FALSE(command.summary.empty());
    for (const auto& option : command.options) {
      INFO(option.name);
      CHECK_FALSE(option.help.empty());
    }
  }
  for (const auto& option : cw::cli::global_options()) CHECK_FALSE(option.help.empty());
}

TEST_CASE("cli docs: the README's command list names every command and option", "[cli]") {
  const std::string readme = readme_commands();
  for (const auto& command : cw::cli::command_table()) {
    if (command.handler == nullptr) continue;  // a group
    INFO(command.path);
    // A command appears as `path ...` (or within a row listing several: `... · path ...`).
    CHECK(readme.find(std::string(command.path)) != std::string::npos);
    for (const auto& option : command.options) {
      if (option.kind == cw::cli::OptionKind::Positional) continue;
      INFO(option.name);
      CHECK(readme.find(std::string(option.name)) != std::string::npos);
    }
  }
  for (const auto& option : cw::cli::global_options()) {
    CHECK(readme.find(std::string(option.name)) != std::string::npos);
  }
}
