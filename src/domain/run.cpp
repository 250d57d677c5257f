// SPDX-License-Identifier: Apache-2.0
// Text forms of run enums.
#include "domain/run.h"

#include "domain/enum_text.h"

namespace cw {
namespace {

constexpr std::pair<RunRowKind, std::string_view> kKinds[] = {
    {RunRowKind::Sample, "sample"}, {RunRowKind::Check, "check"}, {RunRowKind::Blank, "blank"}};

}  // namespace

std::string_view to_string(RunRowKind k) {
  return text_of(kKinds, k);
}
std::optional<RunRowKind> parse_run_row_kind(std::string_view text) {
  return value_of(kKinds, text);
}
std::string column_mapping_text(const ColumnMapping& mapping) {
  std::string out;
  for (const auto& [name, header] : mapping) out += (out.empty() ? "" : ",") + name + "=" + header;
  return out;
}

std::vector<RunRowKind> all_run_row_kinds() {
  std::vector<RunRowKind> out;
  for (const auto& [kind, text] : kKinds) out.push_back(kind);
  return out;
}

}  // namespace cw
