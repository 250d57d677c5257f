// SPDX-License-Identifier: Apache-2.0
// The one place that turns an error into text on stderr, the JSON error object and an exit code.
#pragma once

#include <optional>
#include <ostream>
#include <string>

#include "core/error.h"

namespace cw::cli {

/// Prints `e` ("curvewarden: error: ..." and an optional hint) and, with `json`, the error
/// object on `out`. Returns the exit code.
int report_error(const Error& e, bool json, std::ostream& out, std::ostream& err);
/// For failures that are not ours (a bug): exit 1.
int report_internal_error(const std::string& what, bool json, std::ostream& out, std::ostream& err);

}  // namespace cw::cli
