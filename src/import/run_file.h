// SPDX-License-Identifier: Apache-2.0
// Reading a run file (CSV, product.md §5.4): one instrument sequence in injection order,
// `position,kind,sample,analyte,response[,is_response][,dilution][,nominal]`, columns matched by
// header name (or through a mapping of the instrument's own headers). The file is streamed: one
// row at a time, whatever its length, each checked against the method before it is handed out,
// with errors that name the file, line and column.
#pragma once

#include <cstddef>
#include <deque>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "audit/sha256.h"
#include "domain/method.h"
#include "domain/run.h"
#include "import/csv.h"
#include "import/input_file.h"

namespace cw::import {

/// Size cap of a run file (documented in the README): far beyond a day's sequence.
inline constexpr std::size_t kMaxRunFileBytes = 256u << 20;  ///< 256 MiB

/// The logical columns of a run file.
const std::set<std::string>& run_file_required_columns();
const std::set<std::string>& run_file_optional_columns();

struct RunRow {
  long line = 0;
  long position = 0;
  RunRowKind kind = RunRowKind::Sample;
  std::string sample;  ///< the sample id; for a check or blank an optional label ("" if none)
  std::string analyte;
  double response = 0;
  std::optional<double> is_response;
  double dilution = 1;            ///< samples only
  std::optional<double> nominal;  ///< checks (required, above 0) and blanks (absent or 0)
};

/// Streams the rows of a run file. Every row is checked before next() returns it: positions
/// whole numbers from 1 that increase from row to row (injection order, each position once); kind
/// sample, check or blank; the analyte one of the method's; a sample id for samples; plain finite
/// numbers; an internal-standard response exactly when the method uses one (above 0); a dilution
/// above 0 on samples only; a nominal above 0 on checks, 0 or nothing on blanks, nothing on
/// samples.
class RunFileReader {
 public:
  /// Opens `path` (a regular file, at most kMaxRunFileBytes) and reads its header. `option` names
  /// where the path came from, for messages. Throws ValidationError (file, line, column).
  RunFileReader(const std::string& path, const MethodDefinition& method,
                const HeaderMapping* mapping = nullptr, std::string_view option = "run file");

  /// The next row in file order, or nullopt at the end of the file (which must hold at least one
  /// row). Throws ValidationError naming the file, line and column.
  std::optional<RunRow> next();

  /// The file as messages and the run name it: its path, or "(standard input)" for "-".
  const std::string& file() const { return name_; }
  /// SHA-256 of the file's bytes (after next() has returned nullopt).
  const std::string& sha256() const { return sha256_; }
  /// Rows read so far.
  long rows() const { return rows_; }
  const CsvHeader& header() const { return header_; }
  /// A ValidationError at `line` in column `name` (its number when the file has it).
  ValidationError error_at(long line, const std::string& name, const std::string& message,
                           std::string hint = {}) const;

 private:
  bool fill();
  RunRow parse(const CsvRecord& record);

  InputFile file_;
  std::string name_;
  MethodDefinition method_;  ///< a copy: the reader may outlive the caller's
  CsvSplitter splitter_;
  audit::Sha256 digest_;
  std::vector<CsvRecord> ready_;
  std::size_t next_ready_ = 0;
  bool eof_ = false;
  CsvHeader header_;
  long rows_ = 0;
  std::optional<long> last_position_;
  long last_position_line_ = 0;
  std::string sha256_;
};

}  // namespace cw::import
