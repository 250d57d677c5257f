// SPDX-License-Identifier: Apache-2.0
// Error messages and the JSON error object.
#include "cli/error_output.h"

#include <nlohmann/json.hpp>

namespace cw::cli {

int report_error(const Error& e, bool json, std::ostream& out, std::ostream& err) {
  std::string where;
  if (const auto& loc = e.location()) {
    if (!loc->file.empty()) where += loc->file;
    if (loc->line) where += (where.empty() ? "line " : ", line ") + std::to_string(*loc->line);
    if (loc->column) where += ", column " + std::to_string(*loc->column);
    if (!loc->field.empty())
      where += (where.empty() ? "" : ", ") + std::string("field '") + loc->field + "'";
  }
  std::string message = e.what();
  err << "curvewarden: error: " << (where.empty() ? "" : where + ": ") << message << '\n';
  if (!e.hint().empty()) err << "curvewarden: hint: " << e.hint() << '\n';
  if (json) {
    nlohmann::ordered_json j;
    j["error"]["code"] = e.kind();
    j["error"]["message"] = message;
    j["error"]["hint"] =
        e.hint().empty() ? nlohmann::ordered_json(nullptr) : nlohmann::ordered_json(e.hint());
    const auto& loc = e.location();
    j["error"]["file"] = loc && !loc->file.empty() ? nlohmann::ordered_json(loc->file) : nullptr;
    j["error"]["line"] = loc && loc->line ? nlohmann::ordered_json(*loc->line) : nullptr;
    j["error"]["column"] = loc && loc->column ? nlohmann::ordered_json(*loc->column) : nullptr;
    j["error"]["field"] = loc && !loc->field.empty() ? nlohmann::ordered_json(loc->field) : nullptr;
    j["error"]["exit_code"] = to_int(e.exit_code());
    out << j.dump(2, ' ', false, nlohmann::json::error_handler_t::replace) << '\n';
  }
  return to_int(e.exit_code());
}

int report_internal_error(const std::string& what, bool json, std::ostream& out,
                          std::ostream& err) {
  err << "curvewarden: error: internal error: " << what << '\n'
      << "curvewarden: hint: this is a fault in curvewarden; nothing was committed to the store. "
         "Please report it with the command you ran.\n";
  if (json) {
    nlohmann::ordered_json j;
    j["error"] = {{"code", "internal"},
                  {"message", what},
                  {"file", nullptr},
                  {"line", nullptr},
                  {"exit_code", 1}};
    out << j.dump(2, ' ', false, nlohmann::json::error_handler_t::replace) << '\n';
  }
  return 1;
}

}  // namespace cw::cli
