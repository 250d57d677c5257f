// SPDX-License-Identifier: Apache-2.0
// The one place that turns an error into text on stderr, the JSON error object and an exit code.
#pragma once

#include <nlohmann/json.hpp>
#include <optional>
#include <ostream>
#include <string>

#include "core/error.h"

namespace cw::cli {

/// The JSON error object of product.md §4.1 for `e`.
nlohmann::ordered_json error_object(const Error& e);

/// Prints `e` ("curvewarden: error: ..." and an optional hint) and, with `json`, the error
/// document on `out`. Returns the exit code.
int report_error(const Error& e, bool json, std::ostream& out, std::ostream& err);
/// Prints `e` for a command that ended with it after showing its outcome: the error line on
/// stderr and, with `json`, the command's document with an "error" member on `out`.
int report_failure(const Error& e, bool json, std::optional<nlohmann::ordered_json> document,
                   std::ostream& out, std::ostream& err);
/// For failures that are not ours (a bug): exit 1.
int report_internal_error(const std::string& what, bool json, std::ostream& out, std::ostream& err);

}  // namespace cw::cli
