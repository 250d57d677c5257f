// SPDX-License-Identifier: Apache-2.0
// Column mappings.
#include "import/column_map.h"

#include "core/clean_text.h"
#include "core/error.h"
#include "core/text.h"
#include "import/points_file.h"
#include "import/run_file.h"

namespace cw::import {
namespace {

std::string list_of(const std::set<std::string>& names) {
  std::string out;
  for (const auto& n : names) out += (out.empty() ? "" : ", ") + n;
  return out;
}

}  // namespace

ColumnMapping parse_column_mapping(std::string_view text, const std::set<std::string>& names,
                                   std::string_view what) {
  const std::string label(what);
  const std::string form = "give NAME=HEADER pairs separated by commas, e.g. " + label +
                           " 'position=Seq,sample=Sample Name,response=Area'";
  if (trim(text).empty()) throw ValidationError(label + " is empty", form);
  ColumnMapping out;
  std::set<std::string> headers;
  for (const auto& part : split(text, ',')) {
    const auto eq = part.find('=');
    if (trim(part).empty()) throw ValidationError(label + " has an empty entry", form);
    if (eq == std::string::npos) {
      throw ValidationError(label + " entry " + quote(trim(part)) + " has no '='", form);
    }
    const std::string name = to_lower(trim(part.substr(0, eq)));
    if (!names.count(name)) {
      throw ValidationError(label + " names the unknown column " + quote(trim(part.substr(0, eq))),
                            "columns that can be mapped here: " + list_of(names));
    }
    const std::string header =
        clean_text(part.substr(eq + 1), label + " header of '" + name + "'", kMaxLabelChars);
    for (const auto& [n, h] : out) {
      if (n == name) throw ValidationError(label + " maps the column " + quote(name) + " twice");
    }
    if (!headers.insert(to_lower(header)).second) {
      throw ValidationError(label + " maps the header " + quote(header) + " to two columns");
    }
    out.emplace_back(name, header);
  }
  return out;
}

std::set<std::string> all_mappable_columns() {
  std::set<std::string> all;
  for (const auto* set : {&run_file_required_columns(), &run_file_optional_columns(),
                          &points_file_required_columns(), &points_file_optional_columns()}) {
    all.insert(set->begin(), set->end());
  }
  return all;
}

}  // namespace cw::import
