// SPDX-License-Identifier: Apache-2.0
// The command table is the one description of the command line: every command is reachable,
// has a summary, every option has help text, the README lists every command, and
// `curvewarden help COMMAND` prints the same help as `COMMAND --help`.
#include <catch2/catch.hpp>
#include <cstdio>
#include <fstream>
#include <set>
#include <sstream>
#include <string>

#include "cli/cli_app.h"
#include "cli/command_table.h"
#include "cli/docs.h"
#include "report/csv.h"

namespace {

std::string readme() {
  std::ifstream in(CW_README);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

struct Output {
  int code;
  std::string out, err;
};

Output run(const std::vector<std::string>& args) {
  std::ostringstream out, err;
  const int code = cw::cli::run_cli(args, out, err);
  return {code, out.str(), err.str()};
}

std::vector<std::string> words(std::string_view path) {
  std::vector<std::string> out;
  std::istringstream in{std::string(path)};
  for (std::string w; in >> w;) out.push_back(w);
  return out;
}

}  // namespace

TEST_CASE("command table: every command has a summary and every option help text", "[cli]") {
  std::set<std::string_view> paths;
  for (const auto& c : cw::cli::command_table()) {
    INFO("command: " << c.path);
    CHECK(paths.insert(c.path).second);
    CHECK(c.summary.size() >= 10);
    for (const auto& o : c.options) {
      INFO("option: " << o.name);
      CHECK(o.help.size() >= 5);
      if (o.kind == cw::cli::OptionKind::Value || o.kind == cw::cli::OptionKind::Repeated) {
        CHECK_FALSE(o.value_name.empty());
        CHECK(o.name.substr(0, 2) == "--");
      }
      if (o.kind == cw::cli::OptionKind::Flag) CHECK(o.name.substr(0, 2) == "--");
    }
  }
  for (const auto& g : cw::cli::global_options()) {
    INFO("global option: " << g.name);
    CHECK(g.help.size() >= 5);
  }
}

TEST_CASE("command table: groups lead to commands and every command has a handler", "[cli]") {
  for (const auto& c : cw::cli::command_table()) {
    INFO("command: " << c.path);
    const auto w = words(c.path);
    if (w.size() > 1) {
      const auto* parent = cw::cli::find_command(w.front());
      REQUIRE(parent != nullptr);
      CHECK(parent->handler == nullptr);  // a group
    }
    bool has_children = false;
    for (const auto& other : cw::cli::command_table()) {
      has_children =
          has_children || (other.path.size() > c.path.size() &&
                           other.path.substr(0, c.path.size() + 1) == std::string(c.path) + " ");
    }
    // A command runs a handler, a group has commands; `help` is handled by the runner.
    if (c.path != "help") CHECK((c.handler != nullptr) != has_children);
  }
}

TEST_CASE("command table: the README lists every command", "[cli]") {
  const std::string text = readme();
  REQUIRE_FALSE(text.empty());
  for (const auto& c : cw::cli::command_table()) {
    if (c.handler == nullptr && c.path != "help") continue;  // groups
    INFO("command: " << c.path);
    CHECK_THAT(text, Catch::Contains("`" + std::string(c.path)));
  }
}

TEST_CASE("command table: help COMMAND is COMMAND --help", "[cli]") {
  for (const auto& c : cw::cli::command_table()) {
    if (c.path == "help") continue;
    INFO("command: " << c.path);
    auto args = words(c.path);
    std::vector<std::string> help_args = {"help"};
    help_args.insert(help_args.end(), args.begin(), args.end());
    args.push_back("--help");
    const Output via_help = run(help_args);
    const Output direct = run(args);
    CHECK(via_help.code == 0);
    CHECK(via_help.out == direct.out);
    CHECK_THAT(via_help.out, Catch::Contains(std::string(c.summary)));
    for (const auto& o : c.options) CHECK_THAT(via_help.out, Catch::Contains(std::string(o.name)));
  }
  const Output top = run({"help"});
  CHECK(top.code == 0);
  CHECK_THAT(top.out, Catch::Contains("supports your quality system"));
}

TEST_CASE("command table: the manual page and the completion cover every command", "[cli]") {
  const std::string man = cw::cli::man_page();
  const std::string completion = cw::cli::bash_completion();
  CHECK_THAT(man, Catch::StartsWith(".TH CURVEWARDEN 1"));
  CHECK_THAT(man, Catch::Contains("supports your quality system"));
  for (const auto& c : cw::cli::command_table()) {
    INFO("command: " << c.path);
    const auto w = words(c.path);
    // Every command is a word its parent completes to.
    CHECK_THAT(completion, Catch::Contains(w.back()));
    if (c.handler == nullptr && c.path != "help") continue;
    // roff writes a hyphen as \- (man(7)).
    std::string escaped;
    for (char ch : std::string(c.path))
      escaped += ch == '-' ? std::string("\\-") : std::string(1, ch);
    CHECK_THAT(man, Catch::Contains(".SS " + escaped));
    for (const auto& o : c.options) {
      if (o.kind == cw::cli::OptionKind::Positional) continue;
      CHECK_THAT(completion, Catch::Contains(std::string(o.name)));
    }
  }
}

TEST_CASE("command table: the bash completion completes commands and options", "[cli]") {
  const std::string script = cw::cli::bash_completion();
  const std::string path = std::string(CW_BUILD_DIR) + "/completion-under-test.bash";
  {
    std::ofstream out(path);
    out << script;
  }
  const auto complete = [&](const std::string& words, int cword) {
    const std::string command = "bash -c 'source " + path + "; COMP_WORDS=(" + words +
                                "); COMP_CWORD=" + std::to_string(cword) +
                                "; _curvewarden; echo \"${COMPREPLY[*]}\"' 2>&1";
    std::string out;
    FILE* p = popen(command.c_str(), "r");
    REQUIRE(p != nullptr);
    char buffer[1024];
    while (fgets(buffer, sizeof buffer, p) != nullptr) out += buffer;
    pclose(p);
    return out;
  };
  CHECK(complete("curvewarden cu", 1) == "curve\n");
  CHECK(complete("curvewarden curve r", 2) == "review retire\n");
  CHECK_THAT(complete("curvewarden curve log --po", 3), Catch::Contains("--points"));
  CHECK_THAT(complete("curvewarden --json check log --", 4), Catch::Contains("--nominal"));
}

TEST_CASE("cli: exactly the listings with CSV columns offer --csv, and the README lists them",
          "[cli]") {
  std::set<std::string> with_flag;
  for (const auto& c : cw::cli::command_table()) {
    for (const auto& o : c.options) {
      if (o.name == "--csv") with_flag.insert(std::string(c.path));
    }
  }
  std::set<std::string> with_columns;
  const std::string text = readme();
  for (const auto& l : cw::report::csv_listings()) {
    with_columns.insert(std::string(l.command));
    std::string row = "| `" + std::string(l.command) + "` | `" + std::string(l.rows) + "` | ";
    for (std::size_t i = 0; i < l.columns.size(); ++i) {
      row += (i ? ", `" : "`") + std::string(l.columns[i]) + "`";
    }
    row += " |";
    INFO(row);
    CHECK_THAT(text, Catch::Contains(row));
  }
  CHECK(with_flag == with_columns);
}
