// SPDX-License-Identifier: Apache-2.0
// Text forms of check and result enums.
#include "domain/check.h"

namespace cw {

std::string_view to_string(CheckKind k) {
  return k == CheckKind::Check ? "check" : "blank";
}

std::optional<CheckKind> parse_check_kind(std::string_view text) {
  if (text == "check") return CheckKind::Check;
  if (text == "blank") return CheckKind::Blank;
  return std::nullopt;
}

std::string_view to_string(ResultStatus s) {
  return s == ResultStatus::Reported ? "reported" : "refused";
}

}  // namespace cw
