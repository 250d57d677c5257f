// SPDX-License-Identifier: Apache-2.0
// A small RFC 4180 CSV reader for points and run files: header matched by name, quoted
// fields, CRLF or LF line ends, a UTF-8 byte-order mark, blank lines skipped. Every record
// keeps its line number so that errors can name it.
#pragma once

#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

namespace cw::import {

struct CsvRecord {
  long line = 0;                    ///< 1-based line where the record starts
  std::vector<std::string> fields;  ///< trimmed of surrounding spaces (outside quotes)
};

class CsvTable {
 public:
  /// Parses `text` read from `file`. Throws ValidationError (with file and line) for an empty
  /// file, an unterminated quote, a duplicate or unknown header, a missing required column,
  /// or a record with the wrong number of fields.
  static CsvTable parse(const std::string& file, const std::string& text,
                        const std::set<std::string>& required,
                        const std::set<std::string>& optional);

  const std::string& file() const { return file_; }
  const std::vector<CsvRecord>& records() const { return records_; }
  bool has_column(const std::string& name) const { return columns_.count(name) > 0; }
  /// 1-based column number of a header (for error messages).
  long column_number(const std::string& name) const { return columns_.at(name) + 1; }
  /// The field of `record` under header `name` ("" when the column is absent).
  const std::string& field(const CsvRecord& record, const std::string& name) const;

 private:
  std::string file_;
  std::map<std::string, std::size_t> columns_;
  std::vector<CsvRecord> records_;
  std::string empty_;
};

}  // namespace cw::import
