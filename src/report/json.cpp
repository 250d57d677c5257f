// SPDX-License-Identifier: Apache-2.0
// JSON output helpers.
#include "report/json.h"

#include <sstream>

namespace cw::report {

void write_json(std::ostream& out, const Json& j, int indent) {
  const std::string pad(static_cast<std::size_t>(indent), ' ');
  std::istringstream lines(j.dump(2, ' ', false, nlohmann::json::error_handler_t::replace));
  std::string line;
  bool first = true;
  while (std::getline(lines, line)) {
    if (!first) out << '\n';
    out << pad << line;
    first = false;
  }
}

}  // namespace cw::report
