// SPDX-License-Identifier: Apache-2.0
// One run of one command: the raw option values the parser collected, read through the strict
// parsers of core/ (so a command-line value obeys the same rules as a value in a file, and every
// error names its option), the global options resolved into plain values, and the output.
#pragma once

#include <cstdint>
#include <map>
#include <memory>
#include <nlohmann/json.hpp>
#include <optional>
#include <ostream>
#include <set>
#include <string>
#include <string_view>
#include <vector>

#include "app/session.h"
#include "cli/command_table.h"
#include "core/error.h"
#include "core/time.h"
#include "domain/ids.h"
#include "domain/run.h"

namespace cw::cli {

using Json = nlohmann::ordered_json;

class Invocation {
 public:
  Invocation(const CommandSpec& command, std::ostream& out, std::ostream& err)
      : command_(command), out_(out), err_(err) {}

  // ---- filled by the parser
  void set_values(std::string name, std::vector<std::string> values);
  void set_json(bool json) { json_ = json; }
  /// --csv: the handler builds its JSON document (json() is true) and the runner prints the
  /// listing's rows as CSV instead.
  void set_csv(bool csv) {
    csv_ = csv;
    json_ = json_ || csv;
  }

  const CommandSpec& command() const { return command_; }
  /// Structured output: --json, or --csv (printed from the same document).
  bool json() const { return json_; }
  bool csv() const { return csv_; }

  // ---- raw access
  bool has(std::string_view option) const;
  bool flag(std::string_view option) const { return has(option); }

  // ---- strict, typed access; errors name the option (exit 2)
  /// Free text: clean_text() with the cap for names or for reasons.
  std::string text(std::string_view option, std::size_t max_chars) const;
  std::optional<std::string> optional_text(std::string_view option, std::size_t max_chars) const;
  /// An instrument, method or lot code (check_code).
  std::string code(std::string_view option, std::string_view what) const;
  std::optional<std::string> optional_code(std::string_view option, std::string_view what) const;
  /// Comma-separated or repeated codes, without duplicates.
  std::vector<std::string> codes(std::string_view option, std::string_view what) const;
  /// An analyte name (check_analyte_name).
  std::optional<std::string> optional_analyte(std::string_view option) const;
  double number(std::string_view option) const;
  std::optional<double> optional_number(std::string_view option) const;
  std::vector<double> numbers(std::string_view option) const;
  std::int64_t whole(std::string_view option, std::int64_t low, std::int64_t high) const;
  std::optional<std::int64_t> optional_whole(std::string_view option, std::int64_t low,
                                             std::int64_t high) const;
  CurveId curve_id(std::string_view option) const;
  std::optional<CurveId> optional_curve_id(std::string_view option) const;
  ResultId result_id(std::string_view option) const;
  RunId run_id(std::string_view option) const;
  std::optional<RunId> optional_run_id(std::string_view option) const;
  /// A column mapping NAME=HEADER,... whose names are among `names`.
  std::optional<ColumnMapping> optional_columns(std::string_view option,
                                                const std::set<std::string>& names) const;
  std::optional<Instant> optional_instant(std::string_view option) const;
  CalendarDate date(std::string_view option) const;
  std::optional<CalendarDate> optional_date(std::string_view option) const;
  std::optional<Duration> optional_duration(std::string_view option) const;
  std::optional<LabZone> optional_zone(std::string_view option) const;
  /// The raw values of a repeated option.
  const std::vector<std::string>& values(std::string_view option) const;
  /// A path of an input file (non-empty, no NUL); the file itself is checked when opened.
  std::string path(std::string_view option) const;
  /// What a file written with optional_output_path may replace.
  enum class Replaces {
    Nothing,  ///< a record kept as evidence (a checkpoint): never an existing file
    SameKind  ///< an earlier file of the kind its extension names (.pdf, .png, .svg), or empty
  };
  /// A path to write a file to (a plot, a report, a checkpoint): the same text rules as path();
  /// refused when something that is not a regular file is already there (writing to a named pipe
  /// or a device would block or vanish), when it is one of the store's own files (the SQLite
  /// file, its journals, the lab key), and when it holds a file `replaces` does not allow.
  /// nullopt when the option was not given.
  std::optional<std::string> optional_output_path(std::string_view option,
                                                  Replaces replaces = Replaces::SameKind) const;
  /// Exactly one of two flags; UsageError naming both otherwise.
  bool either(std::string_view first, std::string_view second) const;

  // ---- the session, from --db, --as and --at (or their environment variables)
  /// The session; a malformed store location is refused naming --db or CURVEWARDEN_DB.
  app::Session open_session(bool create = false) const;
  /// `e` with its message and JSON `option` naming `option`, which gave the location.
  static LocationError named_location_error(const LocationError& e, const std::string& option);
  /// The store location as resolved (--db, $CURVEWARDEN_DB, ./curvewarden.db).
  std::string location() const;
  /// The lab key file: --key, else $CURVEWARDEN_KEY, else the store's path with ".key" added.
  std::string key_path() const;
  /// The lab key file as key_path(), or nullopt for a server store given no key (it has no
  /// folder to keep one next to).
  std::optional<std::string> lab_key_if_any() const;
  /// Who acts: the canonical user code from --as, else $CURVEWARDEN_USER, else the login name,
  /// and which of them it came from (for messages).
  struct Identity {
    std::string code;
    std::string source;
  };
  Identity identity() const;
  /// The operating-system login of the process (recorded in every audit entry): the passwd name
  /// of the effective uid, else "uid N".
  static std::string os_login();

  // ---- output: text goes to out() as it is written; JSON is collected and printed once by
  //      the runner, with an "error" member added when the command ends in a failure
  std::ostream& out() { return out_; }
  std::ostream& err() { return err_; }
  void emit(Json document) { document_ = std::move(document); }
  const std::optional<Json>& document() const { return document_; }
  /// The command wrote its JSON document itself, row by row (long listings), with any error
  /// member already in it: the runner prints nothing more on stdout.
  void document_printed() { document_printed_ = true; }
  bool is_document_printed() const { return document_printed_; }
  /// Ends the command as refused (exit 3) after its outcome was shown: the runner prints
  /// `message` as the error line (and in the JSON document). Returns the exit code.
  int refused(std::string message);
  /// Ends the command with `e` after its outcome was shown (e.g. audit verify's report): the
  /// runner prints the error and adds it to the JSON document. Returns the exit code.
  int fail(const Error& e);
  const std::optional<Error>& failure() const { return failure_; }
  void warn(const std::string& message) { warnings_.push_back(message); }
  const std::vector<std::string>& warnings() const { return warnings_; }

 private:
  const std::string* single(std::string_view option) const;
  [[noreturn]] void fail(std::string_view option, const ValidationError& e) const;

  const CommandSpec& command_;
  std::ostream& out_;
  std::ostream& err_;
  std::map<std::string, std::vector<std::string>, std::less<>> values_;
  bool json_ = false;
  bool csv_ = false;
  std::optional<Json> document_;
  bool document_printed_ = false;
  std::optional<Error> failure_;
  std::vector<std::string> warnings_;
};

}  // namespace cw::cli
