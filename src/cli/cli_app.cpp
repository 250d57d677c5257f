// SPDX-License-Identifier: Apache-2.0
// The parser, built from the command table with CLI11 (the only file that sees CLI11), and the
// runner: parse, run the chosen handler, print its document or its failure, and turn every error
// into one message and the contract's exit code. This is the only catch site for the tool's
// errors.
#include "cli/cli_app.h"

#include <CLI/CLI.hpp>
#include <algorithm>
#include <map>

#include "cli/command_table.h"
#include "cli/error_output.h"
#include "cli/invocation.h"
#include "core/error.h"
#include "report/csv.h"

namespace cw::cli {
namespace {

using Values = std::map<std::string, std::vector<std::string>>;

std::vector<std::string> words(std::string_view path) {
  std::vector<std::string> out;
  std::size_t start = 0;
  while (start <= path.size()) {
    const auto end = path.find(' ', start);
    out.emplace_back(path.substr(start, end == std::string_view::npos ? end : end - start));
    if (end == std::string_view::npos) break;
    start = end + 1;
  }
  return out;
}

/// Declares one option of the table on `app`, collecting its values into `values[name]`.
void declare(CLI::App& app, const OptionSpec& o, Values& values,
             std::map<std::string, int>& flags) {
  const std::string name(o.name);
  const std::string help(o.help);
  CLI::Option* option = nullptr;
  switch (o.kind) {
    case OptionKind::Flag:
      option = app.add_flag(name, flags[name], help);
      break;
    case OptionKind::Value:
      option = app.add_option(name, values[name], help)
                   ->expected(1)
                   ->multi_option_policy(CLI::MultiOptionPolicy::Throw);
      break;
    case OptionKind::Repeated:
      option = app.add_option(name, values[name], help)->allow_extra_args(false);
      break;
    case OptionKind::Positional:
      option = app.add_option(name, values[name], help)->expected(1);
      break;
  }
  if (!o.value_name.empty()) option->type_name(std::string(o.value_name));
  if (o.required) option->required();
}

std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diagonal = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t above = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diagonal + (a[i - 1] == b[j - 1] ? 0 : 1)});
      diagonal = above;
    }
  }
  return row[b.size()];
}

/// The commands one level below `prefix` ("" for the top).
std::vector<std::string> children(const std::string& prefix) {
  std::vector<std::string> out;
  for (const auto& c : command_table()) {
    const auto w = words(c.path);
    const auto p = prefix.empty() ? std::vector<std::string>{} : words(prefix);
    if (w.size() != p.size() + 1 || !std::equal(p.begin(), p.end(), w.begin())) continue;
    out.push_back(w.back());
  }
  return out;
}

/// When parsing failed because a word is not a command at its level ("curvewarden frobnicate",
/// "curvewarden curve lsit"), an error that names it and suggests the nearest command.
std::optional<UsageError> unknown_command(const std::vector<std::string>& args) {
  std::string path;
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& word = args[i];
    if (word.rfind("-", 0) == 0) {
      for (const auto& g : global_options()) {
        if (g.kind == OptionKind::Value && g.name == word) ++i;
      }
      continue;
    }
    const auto here = children(path);
    if (here.empty()) return std::nullopt;  // a positional argument of a leaf command
    if (std::find(here.begin(), here.end(), word) == here.end()) {
      std::string names, nearest;
      std::size_t best = 3;  // suggest only near misses
      for (const auto& n : here) {
        names += (names.empty() ? "" : ", ") + n;
        if (const std::size_t d = edit_distance(word, n); d < best) {
          best = d;
          nearest = n;
        }
      }
      std::string message = "unknown command '" + word + "' for 'curvewarden" +
                            (path.empty() ? "" : " " + path) + "'";
      if (!nearest.empty()) message += ", did you mean '" + nearest + "'?";
      return UsageError(message, "commands here: " + names);
    }
    path += (path.empty() ? "" : " ") + word;
  }
  const auto here = children(path);
  if (here.empty()) return std::nullopt;
  std::string names;
  for (const auto& n : here) names += (names.empty() ? "" : ", ") + n;
  return UsageError("'curvewarden" + (path.empty() ? "" : " " + path) + "' needs a command",
                    "one of: " + names);
}

/// `help` alone is --help; `help curve log` is `curve log --help`.
std::vector<std::string> expand_help(std::vector<std::string> args) {
  auto first = std::find_if(args.begin(), args.end(),
                            [](const std::string& a) { return a.rfind("-", 0) != 0; });
  if (first == args.end() || *first != "help") return args;
  const auto named = args.erase(first);
  std::string path;
  for (auto w = named; w != args.end() && w->rfind("-", 0) != 0; ++w) {
    path += (path.empty() ? "" : " ") + *w;
  }
  if (!path.empty()) {
    const auto& table = command_table();
    const bool known = std::any_of(table.begin(), table.end(),
                                   [&](const CommandSpec& spec) { return spec.path == path; });
    if (!known) {
      throw UsageError("'curvewarden help " + path + "': there is no such command",
                       "'curvewarden --help' lists the commands");
    }
  }
  args.push_back("--help");
  return args;
}

}  // namespace

int run_cli(const std::vector<std::string>& raw_args, std::ostream& out, std::ostream& err) {
  const bool json_requested =
      std::find(raw_args.begin(), raw_args.end(), "--json") != raw_args.end();
  try {
    const std::vector<std::string> args = expand_help(raw_args);
    CLI::App app{"curvewarden: keeps calibration curves, their validity and their provenance",
                 "curvewarden"};
    app.footer(std::string("\n") + kCautionText);
    app.require_subcommand(1);
    app.set_version_flag("--version", "curvewarden 0.1.0");

    std::map<std::string, Values> values;  // per command path
    std::map<std::string, std::map<std::string, int>> flags;
    Values global_values;
    std::map<std::string, int> global_flags;
    for (const auto& g : global_options()) declare(app, g, global_values, global_flags);

    std::map<std::string, CLI::App*> apps{{"", &app}};
    const CommandSpec* chosen = nullptr;
    for (const auto& spec : command_table()) {
      if (spec.path == "help") continue;  // expanded above
      const auto w = words(spec.path);
      std::string parent;
      for (std::size_t i = 0; i + 1 < w.size(); ++i) parent += (i ? " " : "") + w[i];
      CLI::App* sub = apps.at(parent)->add_subcommand(w.back(), std::string(spec.summary));
      sub->fallthrough();  // global options after the command's name
      apps[std::string(spec.path)] = sub;
      if (spec.handler == nullptr) {
        sub->require_subcommand(1);
        continue;
      }
      const std::string key(spec.path);
      for (const auto& o : spec.options) declare(*sub, o, values[key], flags[key]);
      sub->callback([&chosen, &spec] { chosen = &spec; });
    }

    std::vector<std::string> reversed(args.rbegin(), args.rend());
    try {
      app.parse(reversed);
    } catch (const CLI::Success& e) {  // --help, --version
      return app.exit(e, out, err);
    } catch (const CLI::ParseError& e) {
      if (auto unknown = unknown_command(args)) throw *unknown;
      throw UsageError(e.what(), "run 'curvewarden --help' (or 'curvewarden help COMMAND')");
    }
    if (chosen == nullptr) throw UsageError("no command given", "run 'curvewarden --help'");

    Invocation in(*chosen, out, err);
    for (auto& [name, v] : global_values) in.set_values(name, v);
    for (auto& [name, n] : global_flags) in.set_values(name, std::vector<std::string>(n, "1"));
    const std::string key(chosen->path);
    for (auto& [name, v] : values[key]) in.set_values(name, v);
    for (auto& [name, n] : flags[key]) in.set_values(name, std::vector<std::string>(n, "1"));
    in.set_json(global_flags["--json"] > 0);
    if (in.has("--csv")) {
      if (in.json()) throw UsageError("give --csv or --json, not both");
      in.set_csv(true);
    }

    const int code = chosen->handler(in);
    for (const auto& w : in.warnings()) err << "curvewarden: warning: " << w << '\n';
    if (in.failure()) {
      return report_failure(*in.failure(), in.json() && !in.csv() && !in.is_document_printed(),
                            in.document(), out, err);
    }
    if (in.csv() && in.document()) {
      const report::CsvListing* listing = report::csv_listing(chosen->path);
      if (listing == nullptr) throw std::logic_error("no CSV columns for " + key);
      report::write_csv(out, *in.document(), *listing);
    } else if (in.json() && in.document() && !in.is_document_printed()) {
      out << in.document()->dump(2, ' ', false, nlohmann::json::error_handler_t::replace) << '\n';
    }
    return code;
  } catch (const Error& e) {
    return report_error(e, json_requested, out, err);
  } catch (const std::exception& e) {
    return report_internal_error(e.what(), json_requested, out, err);
  }
}

}  // namespace cw::cli
