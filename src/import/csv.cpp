// SPDX-License-Identifier: Apache-2.0
// CSV reading.
#include "import/csv.h"

#include "core/error.h"
#include "core/text.h"

namespace cw::import {
namespace {

std::vector<CsvRecord> split_records(const std::string& file, const std::string& text) {
  std::vector<CsvRecord> out;
  size_t i = 0;
  if (text.compare(0, 3, "\xEF\xBB\xBF") == 0) i = 3;  // UTF-8 byte-order mark
  long line = 1;
  while (i < text.size()) {
    CsvRecord record;
    record.line = line;
    std::string field;
    bool quoted = false, was_quoted = false, end_of_record = false;
    while (i < text.size() && !end_of_record) {
      const char c = text[i];
      if (quoted) {
        if (c == '"') {
          if (i + 1 < text.size() && text[i + 1] == '"') {
            field += '"';
            i += 2;
          } else {
            quoted = false;
            ++i;
          }
        } else {
          if (c == '\n') ++line;
          field += c;
          ++i;
        }
        continue;
      }
      if (c == '"' && trim(field).empty()) {
        quoted = true;
        was_quoted = true;
        field.clear();
        ++i;
      } else if (c == ',') {
        record.fields.push_back(was_quoted ? field : trim(field));
        field.clear();
        was_quoted = false;
        ++i;
      } else if (c == '\r' || c == '\n') {
        if (c == '\r' && i + 1 < text.size() && text[i + 1] == '\n') ++i;
        ++i;
        ++line;
        end_of_record = true;
      } else {
        field += c;
        ++i;
      }
    }
    if (quoted) {
      throw ValidationError(
          SourceLocation{file, record.line, std::nullopt, {}},
          "a quoted field starting on this line is never closed",
          "close the field with a double quote (\"\"), or double any quote inside it");
    }
    record.fields.push_back(was_quoted ? field : trim(field));
    const bool blank = record.fields.size() == 1 && record.fields[0].empty();
    if (!blank) out.push_back(std::move(record));
  }
  return out;
}

}  // namespace

CsvTable CsvTable::parse(const std::string& file, const std::string& text,
                         const std::set<std::string>& required,
                         const std::set<std::string>& optional) {
  CsvTable t;
  t.file_ = file;
  std::vector<CsvRecord> records = split_records(file, text);
  if (records.empty()) {
    throw ValidationError(SourceLocation{file, 1, std::nullopt, {}}, "'" + file + "' is empty",
                          "the first line must be a header naming the columns");
  }
  const CsvRecord& header = records.front();
  std::string allowed;
  for (const auto& r : required) allowed += (allowed.empty() ? "" : ", ") + r;
  for (const auto& o : optional) allowed += ", " + o;
  for (size_t i = 0; i < header.fields.size(); ++i) {
    const std::string name = to_lower(header.fields[i]);
    SourceLocation where{file, header.line, static_cast<long>(i + 1), name};
    if (name.empty())
      throw ValidationError(where, "column " + std::to_string(i + 1) + " has no header",
                            "columns: " + allowed);
    if (!required.count(name) && !optional.count(name)) {
      throw ValidationError(where, "unknown column " + quote(header.fields[i]),
                            "columns: " + allowed);
    }
    if (!t.columns_.emplace(name, i).second) {
      throw ValidationError(where, "column " + quote(name) + " appears twice in the header");
    }
  }
  for (const auto& r : required) {
    if (!t.columns_.count(r)) {
      throw ValidationError(
          SourceLocation{file, header.line, std::nullopt, r}, "missing column " + quote(r),
          "the header must name the columns " + allowed + " (optional ones may be left out)");
    }
  }
  for (size_t k = 1; k < records.size(); ++k) {
    if (records[k].fields.size() != header.fields.size()) {
      throw ValidationError(
          SourceLocation{file, records[k].line, std::nullopt, {}},
          "has " + std::to_string(records[k].fields.size()) + " fields, the header has " +
              std::to_string(header.fields.size()),
          "every line needs one value per header column (empty values are allowed: ,,)");
    }
    t.records_.push_back(std::move(records[k]));
  }
  if (t.records_.empty()) {
    throw ValidationError(SourceLocation{file, header.line + 1, std::nullopt, {}},
                          "'" + file + "' has a header but no data lines",
                          "add one line per calibrator after the header");
  }
  return t;
}

const std::string& CsvTable::field(const CsvRecord& record, const std::string& name) const {
  auto it = columns_.find(name);
  if (it == columns_.end()) return empty_;
  return record.fields[it->second];
}

}  // namespace cw::import
