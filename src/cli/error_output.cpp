// SPDX-License-Identifier: Apache-2.0
// Error messages and the JSON error object.
#include "cli/error_output.h"

#include "core/text.h"

namespace cw::cli {
namespace {

using Json = nlohmann::ordered_json;

void print_document(std::ostream& out, const Json& j) {
  out << j.dump(2, ' ', false, nlohmann::json::error_handler_t::replace) << '\n';
}

}  // namespace

Json error_object(const Error& e) {
  Json j;
  j["code"] = e.kind();
  j["message"] = std::string(e.what());
  j["hint"] = e.hint().empty() ? Json(nullptr) : Json(e.hint());
  j["option"] = e.option().empty() ? Json(nullptr) : Json(e.option());
  const auto& loc = e.location();
  j["file"] = loc && !loc->file.empty() ? Json(loc->file) : Json(nullptr);
  j["line"] = loc && loc->line ? Json(*loc->line) : Json(nullptr);
  j["column"] = loc && loc->column ? Json(*loc->column) : Json(nullptr);
  j["field"] = loc && !loc->field.empty() ? Json(loc->field) : Json(nullptr);
  j["exit_code"] = to_int(e.exit_code());
  return j;
}

void print_error_lines(const Error& e, std::ostream& err) {
  std::string where;
  if (const auto& loc = e.location()) {
    if (!loc->file.empty()) where += loc->file;
    if (loc->line) where += (where.empty() ? "line " : ":") + std::to_string(*loc->line);
    if (loc->column) where += ":" + std::to_string(*loc->column);
    if (!loc->field.empty()) {
      where += (where.empty() ? "" : " ") + std::string("(") + visible_breaks(loc->field) + ")";
    }
  }
  err << "curvewarden: error: " << (where.empty() ? "" : where + ": ") << e.what() << '\n';
  if (!e.hint().empty()) err << "curvewarden: hint: " << e.hint() << '\n';
}

int report_error(const Error& e, bool json, std::ostream& out, std::ostream& err) {
  out.flush();  // what the command printed comes before its error
  print_error_lines(e, err);
  if (json) print_document(out, Json{{"error", error_object(e)}});
  return to_int(e.exit_code());
}

int report_failure(const Error& e, bool json, std::optional<Json> document, std::ostream& out,
                   std::ostream& err) {
  out.flush();  // what the command printed comes before its error
  print_error_lines(e, err);
  if (json) {
    Json j = document ? std::move(*document) : Json::object();
    j["error"] = error_object(e);
    print_document(out, j);
  }
  return to_int(e.exit_code());
}

int report_internal_error(const std::string& what, bool json, std::ostream& out,
                          std::ostream& err) {
  err << "curvewarden: error: internal error: " << what << '\n'
      << "curvewarden: hint: this is a fault in curvewarden; nothing was committed to the store. "
         "Please report it with the command you ran.\n";
  if (json) {
    Json j;
    j["error"] = {{"code", "internal"}, {"message", what},  {"hint", nullptr},
                  {"option", nullptr},  {"file", nullptr},  {"line", nullptr},
                  {"column", nullptr},  {"field", nullptr}, {"exit_code", 1}};
    print_document(out, j);
  }
  return 1;
}

}  // namespace cw::cli
