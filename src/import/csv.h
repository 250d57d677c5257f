// SPDX-License-Identifier: Apache-2.0
// A small RFC 4180 CSV reader for points and run files: header matched by name (or through a
// mapping of an instrument export's own headers), quoted fields, CRLF or LF line ends, a UTF-8
// byte-order mark, blank lines skipped. Every record keeps its line number so that errors can
// name it. Text can be split whole (points files) or streamed chunk by chunk (run files).
#pragma once

#include <map>
#include <optional>
#include <set>
#include <string>
#include <string_view>
#include <vector>

#include "domain/run.h"

namespace cw::import {

struct CsvRecord {
  long line = 0;                    ///< 1-based line where the record starts
  std::vector<std::string> fields;  ///< trimmed of surrounding spaces (outside quotes)
};

/// Splits CSV text into records as it arrives. Quotes, line ends and the byte-order mark may be
/// split across chunks. Fields are checked to be UTF-8 text.
class CsvSplitter {
 public:
  explicit CsvSplitter(std::string file) : file_(std::move(file)) {}

  /// Splits the next chunk; complete, non-blank records are appended to `out`. Throws
  /// ValidationError (file and line) for text that is not UTF-8.
  void feed(std::string_view chunk, std::vector<CsvRecord>& out);
  /// The end of the text: the last record (without a line end) goes to `out`. Throws
  /// ValidationError for a quoted field that is never closed.
  void finish(std::vector<CsvRecord>& out);

 private:
  void end_field();
  void end_record(std::vector<CsvRecord>& out);
  void take(char c, std::vector<CsvRecord>& out);

  std::string file_;
  std::string start_;  ///< the first bytes, until the byte-order mark is decided
  bool started_ = false;
  long line_ = 1;
  CsvRecord record_{1, {}};
  std::string field_;
  bool quoted_ = false;         ///< inside a quoted field
  bool was_quoted_ = false;     ///< the current field was quoted
  bool quote_pending_ = false;  ///< a quote inside a quoted field: closing, or the first of ""
  bool after_cr_ = false;       ///< the last byte ended a line with CR (a following LF joins it)
};

/// Header names of an instrument export mapped to the file's logical columns
/// (`--columns position=Seq,...` or an instrument's saved columns).
struct HeaderMapping {
  ColumnMapping entries;  ///< logical name -> header text
  std::string source;     ///< for messages: "--columns", "the saved columns of instrument IC-02"
  bool operator==(const HeaderMapping&) const = default;
};

/// The header of a CSV file: which field holds each logical column.
class CsvHeader {
 public:
  /// Reads `header` for the logical columns `required` and `optional`. A header field is a
  /// column's name or, with `mapping`, the header mapped to it (case-insensitive); with a mapping
  /// other headers are ignored (exports carry columns the tool does not use), without one they
  /// are refused. Throws ValidationError (file, line, column) for an empty or duplicate header,
  /// an unknown one (without a mapping), a required column that is missing, and a mapped header
  /// that is missing (its column absent under either name).
  static CsvHeader read(const std::string& file, const CsvRecord& header,
                        const std::set<std::string>& required,
                        const std::set<std::string>& optional,
                        const HeaderMapping* mapping = nullptr);

  bool has_column(const std::string& name) const { return columns_.count(name) > 0; }
  /// 1-based column number of a logical column (for error messages).
  long column_number(const std::string& name) const { return columns_.at(name) + 1; }
  /// The header text the file uses for a logical column.
  const std::string& header_of(const std::string& name) const { return headers_.at(name); }
  /// The field of `record` under logical column `name` ("" when the column is absent).
  const std::string& field(const CsvRecord& record, const std::string& name) const;
  /// How messages name logical column `name`: 'response', or 'Area' (response) when a mapping
  /// reads it from a header of another name, so the user finds the column in the file.
  std::string label(const std::string& name) const;
  /// The name errors give as their field: the file's header of the column, else `name`.
  const std::string& field_name(const std::string& name) const;
  std::size_t width() const { return width_; }
  /// Header fields that were ignored (only with a mapping), in file order.
  const std::vector<std::string>& ignored() const { return ignored_; }
  long line() const { return line_; }

 private:
  std::map<std::string, std::size_t> columns_;
  std::map<std::string, std::string> headers_;
  std::vector<std::string> ignored_;
  std::size_t width_ = 0;
  long line_ = 1;
  std::string empty_;
};

/// A whole CSV text with its header read (points files).
class CsvTable {
 public:
  /// Parses `text` read from `file`. Throws ValidationError (with file and line) for an empty
  /// file, an unterminated quote, a header problem (CsvHeader::read), a record with the wrong
  /// number of fields, or a header without data lines.
  static CsvTable parse(const std::string& file, const std::string& text,
                        const std::set<std::string>& required,
                        const std::set<std::string>& optional,
                        const HeaderMapping* mapping = nullptr);

  const std::string& file() const { return file_; }
  const std::vector<CsvRecord>& records() const { return records_; }
  const CsvHeader& header() const { return header_; }
  bool has_column(const std::string& name) const { return header_.has_column(name); }
  long column_number(const std::string& name) const { return header_.column_number(name); }
  const std::string& field(const CsvRecord& record, const std::string& name) const {
    return header_.field(record, name);
  }
  std::string label(const std::string& name) const { return header_.label(name); }
  const std::string& field_name(const std::string& name) const { return header_.field_name(name); }

 private:
  std::string file_;
  CsvHeader header_;
  std::vector<CsvRecord> records_;
};

/// Throws ValidationError when `record` does not have one field per header column.
void require_width(const std::string& file, const CsvHeader& header, const CsvRecord& record);

}  // namespace cw::import
