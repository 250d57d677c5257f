// SPDX-License-Identifier: Apache-2.0
// Run-file reading.
#include "import/run_file.h"

#include "core/clean_text.h"
#include "core/error.h"
#include "core/number.h"
#include "core/text.h"

namespace cw::import {
namespace {

std::string analyte_list(const MethodDefinition& method) {
  std::string list;
  for (const auto& a : method.analytes) list += (list.empty() ? "" : ", ") + a;
  return list;
}

}  // namespace

const std::set<std::string>& run_file_required_columns() {
  static const std::set<std::string> names = {"position", "kind", "sample", "analyte", "response"};
  return names;
}

const std::set<std::string>& run_file_optional_columns() {
  static const std::set<std::string> names = {"is_response", "dilution", "nominal"};
  return names;
}

RunFileReader::RunFileReader(const std::string& path, const MethodDefinition& method,
                             const HeaderMapping* mapping, std::string_view option)
    : file_(path, kMaxRunFileBytes, option),
      name_(recorded_name(path)),
      method_(method),
      splitter_(name_) {
  while (next_ready_ >= ready_.size() && fill()) {
  }
  if (next_ready_ >= ready_.size()) {
    throw ValidationError(SourceLocation{name_, 1, std::nullopt, {}}, "'" + name_ + "' is empty",
                          "the first line must be a header naming the columns");
  }
  header_ = CsvHeader::read(name_, ready_[next_ready_++], run_file_required_columns(),
                            run_file_optional_columns(), mapping);
  if (method_.internal_standard && !header_.has_column("is_response")) {
    throw ValidationError(SourceLocation{name_, header_.line(), std::nullopt, "is_response"},
                          "method " + quote(method_.code) + " uses the internal standard " +
                              quote(*method_.internal_standard) + ", but the file has no " +
                              header_.label("is_response") + " column",
                          "add the internal-standard response of every row");
  }
}

bool RunFileReader::fill() {
  if (eof_) return false;
  ready_.clear();
  next_ready_ = 0;
  std::string chunk;
  if (file_.read_some(chunk)) {
    digest_.update(chunk);
    splitter_.feed(chunk, ready_);
  } else {
    splitter_.finish(ready_);
    eof_ = true;
    sha256_ = digest_.hex();
  }
  return true;
}

std::optional<RunRow> RunFileReader::next() {
  while (next_ready_ >= ready_.size()) {
    if (!fill()) {
      if (rows_ == 0) {
        throw ValidationError(SourceLocation{file(), header_.line() + 1, std::nullopt, {}},
                              "'" + file() + "' has a header but no rows",
                              "add one line per injection after the header");
      }
      return std::nullopt;
    }
  }
  const CsvRecord& record = ready_[next_ready_++];
  RunRow row = parse(record);
  ++rows_;
  return row;
}

ValidationError RunFileReader::error_at(long line, const std::string& name,
                                        const std::string& message, std::string hint) const {
  const std::optional<long> column =
      header_.has_column(name) ? std::optional<long>(header_.column_number(name)) : std::nullopt;
  return ValidationError(SourceLocation{file(), line, column, header_.field_name(name)}, message,
                         std::move(hint));
}

RunRow RunFileReader::parse(const CsvRecord& record) {
  require_width(file(), header_, record);
  const auto text = [&](const std::string& name) -> const std::string& {
    return header_.field(record, name);
  };
  const auto fail = [&](const std::string& name, const std::string& message,
                        std::string hint = {}) -> ValidationError {
    return error_at(record.line, name, message, std::move(hint));
  };
  const auto number = [&](const std::string& name) -> std::optional<double> {
    if (!header_.has_column(name) || text(name).empty()) return std::nullopt;
    try {
      return decimal_or_throw(text(name), header_.label(name));
    } catch (const ValidationError& e) {
      throw fail(name, e.what(), e.hint());
    }
  };

  RunRow row;
  row.line = record.line;
  try {
    row.position = whole_or_throw(text("position"), header_.label("position"), 1, 1000000000);
  } catch (const ValidationError& e) {
    throw fail("position", e.what(), "number the injections 1, 2, 3, ... in sequence order");
  }
  if (last_position_ && row.position <= *last_position_) {
    throw fail("position",
               header_.label("position") + " " + std::to_string(row.position) +
                   " does not come after position " + std::to_string(*last_position_) + " (line " +
                   std::to_string(last_position_line_) + ")",
               "rows must be in injection order, each position once");
  }
  last_position_ = row.position;
  last_position_line_ = record.line;

  const auto kind = parse_run_row_kind(to_lower(text("kind")));
  if (!kind) {
    throw fail("kind",
               text("kind").empty()
                   ? header_.label("kind") + " is empty"
                   : header_.label("kind") + " " + quote(text("kind")) + " is not a kind of row",
               "use sample, check or blank");
  }
  row.kind = *kind;

  row.analyte = text("analyte");
  if (row.analyte.empty()) throw fail("analyte", header_.label("analyte") + " is empty");
  if (!method_.has_analyte(row.analyte)) {
    try {
      check_analyte_name(row.analyte, header_.label("analyte"));
    } catch (const ValidationError& e) {
      throw fail("analyte", e.what(), e.hint());
    }
    throw fail("analyte",
               "unknown analyte " + quote(row.analyte) + " for method " + quote(method_.code),
               "the method's analytes are: " + analyte_list(method_));
  }

  if (!text("sample").empty()) {
    try {
      row.sample = clean_text(text("sample"), header_.label("sample"), kMaxNameChars);
    } catch (const ValidationError& e) {
      throw fail("sample", e.what(), e.hint());
    }
  } else if (row.kind == RunRowKind::Sample) {
    throw fail("sample", header_.label("sample") + " is empty",
               "every sample row needs its sample id");
  }

  const auto response = number("response");
  if (!response)
    throw fail("response", header_.label("response") + " is empty", "give the measured response");
  row.response = *response;
  row.is_response = number("is_response");
  try {
    method_.fitted_response(row.response, row.is_response, header_.label("response"),
                            header_.label("is_response"));
  } catch (const ValidationError& e) {
    throw fail(std::string(e.what()).find(header_.label("is_response")) != std::string::npos
                   ? "is_response"
                   : "response",
               e.what(), e.hint());
  }

  const auto dilution = number("dilution");
  const auto nominal = number("nominal");
  switch (row.kind) {
    case RunRowKind::Sample:
      if (dilution) {
        if (!(*dilution > 0)) {
          throw fail("dilution",
                     header_.label("dilution") + " must be above 0, got " + text("dilution"),
                     "the dilution factor multiplies the concentration: 1 for an undiluted "
                     "sample");
        }
        row.dilution = *dilution;
      }
      if (nominal) {
        throw fail("nominal", header_.label("nominal") + " is given on a sample row",
                   "a nominal concentration belongs to check standards; leave it empty here");
      }
      break;
    case RunRowKind::Check:
      if (!nominal) {
        throw fail("nominal",
                   header_.label("nominal") +
                       " is empty: a check standard needs its nominal concentration",
                   "give the check standard's nominal concentration in " + method_.unit);
      }
      if (!(*nominal > 0)) {
        throw fail("nominal", header_.label("nominal") + " must be above 0, got " + text("nominal"),
                   "give the check standard's nominal concentration in " + method_.unit);
      }
      row.nominal = nominal;
      break;
    case RunRowKind::Blank:
      if (nominal && *nominal != 0) {
        throw fail("nominal", "a blank has nominal 0, got " + text("nominal"),
                   "leave " + header_.label("nominal") + " empty or give 0");
      }
      break;
  }
  if (row.kind != RunRowKind::Sample && dilution) {
    throw fail(
        "dilution",
        header_.label("dilution") + " is given on a " + std::string(to_string(row.kind)) + " row",
        "a dilution factor applies to samples only; leave it empty here");
  }
  return row;
}

}  // namespace cw::import
