// SPDX-License-Identifier: Apache-2.0
// JSON text written piece by piece exactly as nlohmann's compact dump() writes it (ensure_ascii
// off): the canonical forms of the audit chain built without building JSON objects first.
#pragma once

#include <string>
#include <string_view>

namespace cw::audit {

/// Appends `text` as a JSON string: quotes, backslashes and control characters escaped. Text
/// beyond ASCII goes through nlohmann itself (which also refuses invalid UTF-8).
void append_json_string(std::string& out, std::string_view text);

/// Appends `value` as a JSON number: the shortest text that reads back as the same double, as
/// nlohmann writes it ("2.0", "0.0025", "1e-07"); null when it is not finite.
void append_json_number(std::string& out, double value);

}  // namespace cw::audit
