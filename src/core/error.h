// SPDX-License-Identifier: Apache-2.0
// The project's typed exceptions. Each carries the exit code of the product contract; main()
// is the one place that turns them into a message and an exit status.
#pragma once

#include <optional>
#include <stdexcept>
#include <string>

#include "core/exit_code.h"
#include "core/text.h"

namespace cw {

/// Where in an input file something went wrong (all parts optional).
struct SourceLocation {
  std::string file;            ///< file name as the user gave it
  std::optional<long> line;    ///< 1-based line number
  std::optional<long> column;  ///< 1-based column number (CSV: field number)
  std::string field;           ///< column header or TOML key
};

/// Base of every error the tool reports to the user.
class Error : public std::runtime_error {
 public:
  /// The message and hint are kept as readable_message() shows them (core/text.h).
  Error(ExitCode code, std::string kind, const std::string& message, std::string hint = {})
      : std::runtime_error(readable_message(message)),
        code_(code),
        kind_(std::move(kind)),
        hint_(readable_message(hint)) {}

  ExitCode exit_code() const { return code_; }
  /// Stable machine token for the JSON error object ("bad-usage", "bad-input", ...).
  const std::string& kind() const { return kind_; }
  /// Optional advice printed as "curvewarden: hint: ...".
  const std::string& hint() const { return hint_; }
  const std::optional<SourceLocation>& location() const { return location_; }
  void set_location(SourceLocation where) {
    where.file = readable_message(where.file, 1000);
    where.field = readable_message(where.field, 200);
    location_ = std::move(where);
  }
  /// The command-line option (or environment variable) the error is about, e.g. "--response".
  const std::string& option() const { return option_; }
  void set_option(std::string option) { option_ = std::move(option); }

 private:
  ExitCode code_;
  std::string kind_;
  std::string hint_;
  std::optional<SourceLocation> location_;
  std::string option_;
};

/// Bad command-line usage (unknown option, missing argument, conflicting flags). Exit 2.
class UsageError : public Error {
 public:
  explicit UsageError(const std::string& message, std::string hint = {})
      : Error(ExitCode::BadInput, "bad-usage", message, std::move(hint)) {}
};

/// A store location that cannot be used as written (a malformed PostgreSQL URI). Exit 2. The
/// command line decides which option or variable gave it (`--db`, `CURVEWARDEN_DB`, `--from`,
/// `--to`) by comparing `location()`, which may hold a password and is never shown.
class LocationError : public UsageError {
 public:
  LocationError(std::string location, const std::string& message, std::string hint = {})
      : UsageError(message, std::move(hint)), location_(std::move(location)) {}
  const std::string& location() const { return location_; }

 private:
  std::string location_;
};

/// Input data that breaks a rule of its format or of the domain. Exit 2, nothing written.
class ValidationError : public Error {
 public:
  explicit ValidationError(const std::string& message, std::string hint = {})
      : Error(ExitCode::BadInput, "bad-input", message, std::move(hint)) {}
  ValidationError(SourceLocation where, const std::string& message, std::string hint = {})
      : Error(ExitCode::BadInput, "bad-input", message, std::move(hint)) {
    set_location(std::move(where));
  }
};

/// A ValidationError about the value given with `option`; when it is a command-line option
/// ("--nominal") it is named in the JSON error object.
inline ValidationError option_error(const std::string& option, const std::string& message,
                                    std::string hint = {}) {
  ValidationError e(message, std::move(hint));
  if (option.rfind("--", 0) == 0) e.set_option(option);
  return e;
}

/// A named thing (instrument, method, lot, curve, ...) does not exist. Exit 2.
class NotFoundError : public Error {
 public:
  explicit NotFoundError(const std::string& message, std::string hint = {})
      : Error(ExitCode::BadInput, "not-found", message, std::move(hint)) {}
};

/// A rule refused the action; the refusal has been recorded. Exit 3.
class RefusedError : public Error {
 public:
  explicit RefusedError(const std::string& message, std::string hint = {})
      : Error(ExitCode::Refused, "refused", message, std::move(hint)) {}
};

/// The store cannot be used: missing, not ours, too new, locked, damaged or corrupt. Exit 4.
/// Backend-neutral: a backend's own error codes stay in the message.
class StoreError : public Error {
 public:
  explicit StoreError(const std::string& message, std::string hint = {})
      : Error(ExitCode::Store, "store", message, std::move(hint)) {}
};

/// A part of the installation a command needs is missing or from another build (the modules of
/// core/module_loader.h). Exit 4, like a store that cannot be used.
class InstallationError : public Error {
 public:
  explicit InstallationError(const std::string& message, std::string hint = {})
      : Error(ExitCode::Store, "installation", message, std::move(hint)) {}
};

/// The audit chain or a fact row does not match its recorded hash. Exit 5.
class AuditBrokenError : public Error {
 public:
  explicit AuditBrokenError(const std::string& message, std::string hint = {})
      : Error(ExitCode::AuditBroken, "audit-broken", message, std::move(hint)) {}
};

}  // namespace cw
