// SPDX-License-Identifier: Apache-2.0
// Manual page and bash completion from the command table.
#include "cli/docs.h"

#include <cctype>
#include <map>
#include <set>
#include <sstream>
#include <vector>

#include "cli/command_table.h"

namespace cw::cli {
namespace {

/// Escapes text for roff: backslashes, and a leading dot or quote that would start a request.
std::string roff(std::string_view text) {
  std::string out;
  for (char c : text) {
    if (c == '\\') {
      out += "\\e";
    } else if (c == '-') {
      out += "\\-";
    } else {
      out += c;
    }
  }
  if (!out.empty() && (out.front() == '.' || out.front() == '\'')) out = "\\&" + out;
  return out;
}

std::string usage(const CommandSpec& c) {
  std::string u = "curvewarden " + std::string(c.path);
  for (const auto& o : c.options) {
    std::string part;
    switch (o.kind) {
      case OptionKind::Positional:
        for (char ch : o.name)
          part += static_cast<char>(std::toupper(static_cast<unsigned char>(ch)));
        break;
      case OptionKind::Flag:
        part = std::string(o.name);
        break;
      case OptionKind::Value:
      case OptionKind::Repeated:
        part = std::string(o.name) + " " + std::string(o.value_name);
        if (o.kind == OptionKind::Repeated) part += " ...";
        break;
    }
    u += " " + (o.required ? part : "[" + part + "]");
  }
  return u;
}

}  // namespace

std::string man_page() {
  std::ostringstream m;
  m << ".TH CURVEWARDEN 1 \"\" \"curvewarden 0.1.0\" \"User Commands\"\n"
    << ".SH NAME\ncurvewarden \\- keeps calibration curves, their validity and their provenance\n"
    << ".SH SYNOPSIS\n.B curvewarden\n[\\fIGLOBAL OPTIONS\\fR] \\fICOMMAND\\fR [\\fIOPTIONS\\fR]\n"
    << ".SH DESCRIPTION\n"
    << "Curvewarden ties every calibration curve to its method version, instrument and "
       "reference\\-material lots, fits and judges it against the method's criteria, decides at "
       "any moment whether it is still valid, refuses to quantify against an invalid one, and "
       "keeps an append\\-only, hash\\-chained audit trail.\n"
    << ".SH GLOBAL OPTIONS\n";
  for (const auto& g : global_options()) {
    m << ".TP\n.B " << roff(g.name);
    if (!g.value_name.empty()) m << " \\fI" << roff(g.value_name) << "\\fR";
    m << "\n" << roff(g.help) << "\n";
  }
  m << ".SH COMMANDS\n";
  for (const auto& c : command_table()) {
    if (c.handler == nullptr && c.path != "help") continue;
    m << ".SS " << roff(c.path) << "\n"
      << roff(c.summary) << ".\n.PP\n.B " << roff(usage(c)) << "\n";
    for (const auto& o : c.options) {
      m << ".TP\n.B " << roff(o.name);
      if (!o.value_name.empty()) m << " \\fI" << roff(o.value_name) << "\\fR";
      m << "\n" << roff(o.help) << (o.required ? " (required)" : "") << "\n";
    }
  }
  m << ".SH EXIT STATUS\n"
    << ".TP\n0\ndone\n.TP\n1\ninternal error (a fault in curvewarden; nothing was committed)\n"
    << ".TP\n2\nbad usage or bad input; nothing was written\n"
    << ".TP\n3\nrefused or rejected by a rule; the refusal itself is recorded\n"
    << ".TP\n4\nstore unavailable, not a Curvewarden store, newer than this program, locked past "
       "the busy timeout, or damaged\n"
    << ".TP\n5\naudit chain broken\n"
    << ".SH ENVIRONMENT\n"
    << ".TP\n.B CURVEWARDEN_DB\nthe store when \\-\\-db is not given\n"
    << ".TP\n.B CURVEWARDEN_USER\nthe person acting when \\-\\-as is not given\n"
    << ".TP\n.B CURVEWARDEN_REPLY_TIMEOUT\nseconds a PostgreSQL server may take to answer one "
       "request before the command gives up with exit 4 (default 30)\n"
    << ".TP\n.B CURVEWARDEN_NOW\nreplaces \"now\" (tests and demonstrations only; every audit "
       "entry records that it was set)\n"
    << ".SH FILES\n.TP\n.I ./curvewarden.db\nthe default store (SQLite, WAL mode)\n"
    << ".SH NOTES\n"
    << roff(kCautionText) << "\n";
  return m.str();
}

std::string bash_completion() {
  // Children of every group and the options of every command, as bash associative arrays.
  std::map<std::string, std::vector<std::string>> children;
  std::map<std::string, std::vector<std::string>> options;
  for (const auto& c : command_table()) {
    const std::string path(c.path);
    const auto space = path.rfind(' ');
    const std::string parent = space == std::string::npos ? "" : path.substr(0, space);
    children[parent].push_back(space == std::string::npos ? path : path.substr(space + 1));
    for (const auto& o : c.options) {
      if (o.kind != OptionKind::Positional) options[path].emplace_back(o.name);
    }
  }
  std::string globals;
  for (const auto& g : global_options())
    globals += (globals.empty() ? "" : " ") + std::string(g.name);
  std::ostringstream b;
  b << "# bash completion for curvewarden, generated from its command table.\n"
    << "_curvewarden() {\n"
    << "  local cur=\"${COMP_WORDS[COMP_CWORD]}\"\n"
    << "  # Keys are \"@\" followed by a command's path (\"@\" alone: the top level).\n"
    << "  local -A children=(\n";
  for (const auto& [parent, list] : children) {
    std::string words;
    for (const auto& w : list) words += (words.empty() ? "" : " ") + w;
    b << "    [\"@" << parent << "\"]=\"" << words << "\"\n";
  }
  b << "  )\n  local -A options=(\n";
  for (const auto& [path, list] : options) {
    std::string words;
    for (const auto& w : list) words += (words.empty() ? "" : " ") + w;
    b << "    [\"@" << path << "\"]=\"" << words << "\"\n";
  }
  b << "  )\n"
    << "  local path=\"\" word i\n"
    << "  for ((i = 1; i < COMP_CWORD; i++)); do\n"
    << "    word=\"${COMP_WORDS[i]}\"\n"
    << "    case \"$word\" in -*) continue ;; esac\n"
    << "    local next=\"${path:+$path }$word\"\n"
    << "    if [[ \" ${children[@$path]} \" == *\" $word \"* ]]; then path=\"$next\"; fi\n"
    << "  done\n"
    << "  if [[ \"$cur\" == -* ]]; then\n"
    << "    COMPREPLY=($(compgen -W \"${options[@$path]} " << globals << " --help\" -- \"$cur\"))\n"
    << "  elif [[ -n \"${children[@$path]}\" ]]; then\n"
    << "    COMPREPLY=($(compgen -W \"${children[@$path]}\" -- \"$cur\"))\n"
    << "  else\n"
    << "    COMPREPLY=($(compgen -f -- \"$cur\"))\n"
    << "  fi\n"
    << "}\n"
    << "complete -F _curvewarden curvewarden\n";
  return b.str();
}

}  // namespace cw::cli
