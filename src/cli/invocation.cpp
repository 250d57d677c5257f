// SPDX-License-Identifier: Apache-2.0
// Strict reading of option values and resolution of the global options.
#include "cli/invocation.h"

#include <fcntl.h>
#include <pwd.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cstdlib>
#include <utility>
#include <vector>

#include "cli/passphrase_input.h"
#include "core/clean_text.h"
#include "core/clock.h"
#include "core/number.h"
#include "core/text.h"
#include "domain/user.h"
#include "import/column_map.h"
#include "store/store.h"
#include "store/store_file.h"

namespace cw::cli {
namespace {

/// How far ahead of now an event may be dated (clock skew between workstations, a slow typist);
/// further ahead is almost always a typo in the year.
constexpr std::chrono::minutes kFutureTolerance{5};
/// Store locations longer than this are refused (PATH_MAX on Linux).
constexpr std::size_t kMaxLocationBytes = 4096;

const std::vector<std::string> kNoValues;

/// How a value is named in messages: the option ("--method"), or what a positional argument is
/// ("lot code").
std::string label(std::string_view option, std::string_view what) {
  return option.rfind("--", 0) == 0 ? std::string(option) : std::string(what);
}

/// A malformed store location, named by the option or variable that gave it.
LocationError location_error(const LocationError& e, const std::string& option) {
  LocationError named(e.location(), option + ": " + e.what(), e.hint());
  named.set_option(option);
  return named;
}

template <class Fn>
auto naming(std::string_view option, Fn&& fn) -> decltype(fn()) {
  try {
    return fn();
  } catch (Error& e) {
    if (e.option().empty()) e.set_option(std::string(option));
    throw;
  }
}

}  // namespace

void Invocation::set_values(std::string name, std::vector<std::string> values) {
  values_[std::move(name)] = std::move(values);
}

bool Invocation::has(std::string_view option) const {
  auto it = values_.find(option);
  return it != values_.end() && !it->second.empty();
}

const std::vector<std::string>& Invocation::values(std::string_view option) const {
  auto it = values_.find(option);
  return it == values_.end() ? kNoValues : it->second;
}

const std::string* Invocation::single(std::string_view option) const {
  const auto& v = values(option);
  if (v.empty()) return nullptr;
  return &v.back();
}

std::string Invocation::text(std::string_view option, std::size_t max_chars) const {
  auto v = optional_text(option, max_chars);
  if (!v) throw UsageError(std::string(option) + " is required");
  return *v;
}

std::optional<std::string> Invocation::optional_text(std::string_view option,
                                                     std::size_t max_chars) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] { return clean_text(*raw, option, max_chars); });
}

std::string Invocation::code(std::string_view option, std::string_view what) const {
  auto v = optional_code(option, what);
  if (!v) throw UsageError(std::string(option) + " is required");
  return *v;
}

std::optional<std::string> Invocation::optional_code(std::string_view option,
                                                     std::string_view what) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] {
    const std::string code = trim(*raw);
    check_code(code, label(option, what));
    return code;
  });
}

std::vector<std::string> Invocation::codes(std::string_view option, std::string_view what) const {
  std::vector<std::string> out;
  for (const auto& raw : values(option)) {
    for (const auto& part : split(raw, ',')) {
      naming(option, [&] {
        const std::string code = trim(part);
        if (code.empty()) {
          throw UsageError(std::string(option) + " has an empty code",
                           "give codes separated by commas, e.g. " + std::string(option) + " A,B");
        }
        check_code(code, label(option, what));
        if (std::find(out.begin(), out.end(), code) == out.end()) out.push_back(code);
      });
    }
  }
  return out;
}

std::optional<std::string> Invocation::optional_analyte(std::string_view option) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] {
    check_analyte_name(*raw, option);
    return *raw;
  });
}

double Invocation::number(std::string_view option) const {
  auto v = optional_number(option);
  if (!v) throw UsageError(std::string(option) + " is required");
  return *v;
}

std::optional<double> Invocation::optional_number(std::string_view option) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] { return decimal_or_throw(*raw, option); });
}

std::vector<double> Invocation::numbers(std::string_view option) const {
  std::vector<double> out;
  for (const auto& raw : values(option)) {
    out.push_back(naming(option, [&] { return decimal_or_throw(raw, option); }));
  }
  return out;
}

std::int64_t Invocation::whole(std::string_view option, std::int64_t low, std::int64_t high) const {
  auto v = optional_whole(option, low, high);
  if (!v) throw UsageError(std::string(option) + " is required");
  return *v;
}

std::optional<std::int64_t> Invocation::optional_whole(std::string_view option, std::int64_t low,
                                                       std::int64_t high) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] { return whole_or_throw(*raw, option, low, high); });
}

CurveId Invocation::curve_id(std::string_view option) const {
  return CurveId{whole(option, 1, INT64_MAX)};
}

std::optional<CurveId> Invocation::optional_curve_id(std::string_view option) const {
  if (auto v = optional_whole(option, 1, INT64_MAX)) return CurveId{*v};
  return std::nullopt;
}

ResultId Invocation::result_id(std::string_view option) const {
  return ResultId{whole(option, 1, INT64_MAX)};
}

RunId Invocation::run_id(std::string_view option) const {
  return RunId{whole(option, 1, INT64_MAX)};
}

std::optional<RunId> Invocation::optional_run_id(std::string_view option) const {
  if (auto v = optional_whole(option, 1, INT64_MAX)) return RunId{*v};
  return std::nullopt;
}

std::optional<ColumnMapping> Invocation::optional_columns(
    std::string_view option, const std::set<std::string>& names) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] { return import::parse_column_mapping(*raw, names, option); });
}

std::optional<Instant> Invocation::optional_instant(std::string_view option) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] { return parse_instant(*raw, option); });
}

CalendarDate Invocation::date(std::string_view option) const {
  auto v = optional_date(option);
  if (!v) throw UsageError(std::string(option) + " is required");
  return *v;
}

std::optional<CalendarDate> Invocation::optional_date(std::string_view option) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] { return parse_date(*raw, option); });
}

std::optional<Duration> Invocation::optional_duration(std::string_view option) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] { return parse_duration(*raw, option); });
}

std::optional<LabZone> Invocation::optional_zone(std::string_view option) const {
  const std::string* raw = single(option);
  if (!raw) return std::nullopt;
  return naming(option, [&] {
    clean_text(*raw, option, kMaxLabelChars);
    return LabZone::named(*raw);
  });
}

std::string Invocation::path(std::string_view option) const {
  const std::string* raw = single(option);
  if (!raw) throw UsageError(std::string(option) + " is required");
  return naming(option, [&] {
    if (raw->empty())
      throw UsageError(std::string(option) + " is empty", "give the path of a file");
    if (raw->size() > kMaxLocationBytes) {
      throw UsageError(std::string(option) + " is longer than " +
                       std::to_string(kMaxLocationBytes) + " bytes");
    }
    // The path is kept with what is read from it (calibrations record their points file), so it
    // obeys the rules of stored text: UTF-8, no control characters, nothing to trim.
    const std::string clean = clean_text(*raw, option, kMaxLocationBytes);
    if (clean != *raw) {
      throw ValidationError(std::string(option) + " '" + *raw + "' begins or ends with spaces",
                            "give the path without surrounding spaces");
    }
    return *raw;
  });
}

namespace {

/// The bytes a file of the kind `path`'s extension names begins with ("" when any file may be
/// replaced: there is no such kind), and the kind's name.
std::pair<std::vector<std::string>, std::string> signatures_of(const std::string& path) {
  const auto dot = path.find_last_of('.');
  const auto slash = path.find_last_of('/');
  std::string ext;
  if (dot != std::string::npos && (slash == std::string::npos || dot > slash)) {
    ext = to_lower(path.substr(dot + 1));
  }
  if (ext == "pdf") return {{"%PDF-"}, "PDF"};
  if (ext == "png") return {{"\x89PNG\r\n\x1a\n"}, "PNG image"};
  if (ext == "svg") return {{"<?xml", "<svg"}, "SVG image"};
  return {{}, ""};
}

/// The first `n` bytes of the regular file `path` (fewer when it is shorter).
std::string first_bytes(const std::string& path, std::size_t n) {
  std::string out(n, '\0');
  const int fd = ::open(path.c_str(), O_RDONLY | O_NONBLOCK | O_NOCTTY | O_CLOEXEC);
  if (fd < 0) return {};
  const ssize_t got = ::read(fd, out.data(), n);
  ::close(fd);
  out.resize(got > 0 ? static_cast<std::size_t>(got) : 0);
  return out;
}

bool same_file(const struct stat& a, const std::string& other) {
  struct stat b {};
  return ::stat(other.c_str(), &b) == 0 && a.st_dev == b.st_dev && a.st_ino == b.st_ino;
}

}  // namespace

std::optional<std::string> Invocation::optional_output_path(std::string_view option,
                                                            Replaces replaces) const {
  if (!has(option)) return std::nullopt;
  const std::string p = path(option);
  const std::string name(option);
  struct stat st {};
  if (::lstat(p.c_str(), &st) != 0) return p;
  if (!S_ISREG(st.st_mode)) {
    throw option_error(name, name + " '" + p + "' exists and is not a regular file",
                       "give the path of a new file, or of an ordinary file to replace");
  }
  // The store's own files, however the path is spelled (a hard link included).
  const std::string store = location();
  std::vector<std::pair<std::string, std::string>> own;
  if (!store::is_server_location(store)) {
    own = {{store, "the store itself"},
           {store + "-wal", "the store's write-ahead log"},
           {store + "-shm", "the store's shared-memory file"},
           {store + "-journal", "the store's journal"}};
  }
  if (const auto key = lab_key_if_any()) own.emplace_back(*key, "the lab key");
  for (const auto& [file, what] : own) {
    if (same_file(st, file)) {
      throw option_error(name, name + " '" + p + "' is " + what + ": it is never written over",
                         "give the path of a new file");
    }
  }
  if (st.st_size == 0) return p;
  if (replaces == Replaces::Nothing) {
    throw option_error(name, name + " '" + p + "' exists; a checkpoint never replaces a file",
                       "give the path of a new file (keep every checkpoint)");
  }
  const auto [signatures, kind] = signatures_of(p);
  const std::string head = first_bytes(p, 8);
  const bool same_kind = std::any_of(signatures.begin(), signatures.end(), [&](const auto& s) {
    return head.compare(0, s.size(), s) == 0;
  });
  if (!signatures.empty() && !same_kind) {
    throw option_error(name,
                       name + " '" + p + "' exists and is not a " + kind + ": it is not replaced",
                       "give the path of a new file, or move that file away first");
  }
  return p;
}

bool Invocation::either(std::string_view first, std::string_view second) const {
  const bool a = has(first), b = has(second);
  if (a == b) {
    throw UsageError("give " + std::string(first) + " or " + std::string(second) +
                     (a ? ", not both" : ""));
  }
  return a;
}

int Invocation::refused(std::string message) {
  return fail(RefusedError(message));
}

int Invocation::fail(const Error& e) {
  failure_ = e;
  return to_int(e.exit_code());
}

std::string Invocation::location() const {
  if (const std::string* db = single("--db")) {
    return naming("--db", [&] {
      if (db->empty()) throw UsageError("--db is empty", "give the path of the store file");
      if (db->size() > kMaxLocationBytes) throw UsageError("--db is too long");
      return *db;
    });
  }
  if (const char* env = std::getenv("CURVEWARDEN_DB"); env != nullptr && *env != '\0') {
    return env;
  }
  return "curvewarden.db";
}

app::Session Invocation::open_session(bool create) const {
  const std::string where = location();
  if (!store::is_server_location(where) && store::is_symlink(where) && !has("--follow-symlink")) {
    throw option_error("--db", "the store path '" + where + "' is a symbolic link",
                       "give the real path of the store, or --follow-symlink if the link is "
                       "meant");
  }
  // Everything the user typed or set is checked before the store is touched.
  std::shared_ptr<const Clock> clock = naming(
      "CURVEWARDEN_NOW", [] { return std::shared_ptr<const Clock>(clock_from_environment()); });
  const Identity who = identity();
  const std::optional<Instant> at = optional_instant("--at");
  if (at && command_.records_event && *at > clock->now() + kFutureTolerance) {
    ValidationError e("--at " + format_utc(*at) + " lies more than 5 minutes after now (" +
                          format_utc(clock->now()) + ")",
                      "events are recorded when they have happened; check the year and the zone "
                      "offset");
    e.set_option("--at");
    throw e;
  }
  // Passphrases are read only when a command signs, and then from one reader: consecutive
  // passphrases are consecutive lines of --passphrase-fd.
  std::optional<int> fd;
  if (auto n = optional_whole("--passphrase-fd", 0, 1 << 20)) fd = static_cast<int>(*n);
  auto input = std::make_shared<PassphraseInput>(fd);
  app::PassphraseSource source = [input](const std::string& prompt, bool is_new) {
    return input->read(prompt, is_new);
  };
  try {
    return app::Session::open(
        {location(), who.code, who.source, os_login(), at, clock, create, std::move(source)});
  } catch (const LocationError& e) {
    throw location_error(e, single("--db") != nullptr ? "--db" : "CURVEWARDEN_DB");
  }
}

LocationError Invocation::named_location_error(const LocationError& e, const std::string& option) {
  return location_error(e, option);
}

std::optional<std::string> Invocation::lab_key_if_any() const {
  if (has("--key")) return path("--key");
  if (const char* env = std::getenv("CURVEWARDEN_KEY"); env != nullptr && *env != '\0') {
    return env;
  }
  const std::string where = location();
  if (store::is_server_location(where)) return std::nullopt;
  return where + ".key";
}

std::string Invocation::key_path() const {
  if (auto key = lab_key_if_any()) return *key;
  throw option_error("--key",
                     "a store on a PostgreSQL server has no folder to keep the lab key next to",
                     "give the lab key file with --key FILE or CURVEWARDEN_KEY (init creates it "
                     "there when it does not exist)");
}

Invocation::Identity Invocation::identity() const {
  // A user code is compared in its canonical form (user codes ignore case); its syntax is
  // checked when the user is registered, here only as text.
  const auto canonical = [](const std::string& raw, const std::string& source) {
    return canonical_user_code(
        naming(source, [&] { return clean_text(raw, source, kMaxNameChars); }));
  };
  if (const std::string* admin = single("--admin")) {
    // init --admin CODE: the first admin acts (and is registered by this init).
    const std::string code = naming("--admin", [&] {
      const std::string c = trim(*admin);
      check_code(c, "--admin");
      return canonical_user_code(c);
    });
    if (const std::string* as = single("--as"); as != nullptr && canonical(*as, "--as") != code) {
      throw option_error("--as", "--as and --admin name different users",
                         "init acts as the admin it registers: give only --admin");
    }
    return {code, "--admin"};
  }
  if (const std::string* as = single("--as")) return {canonical(*as, "--as"), "--as"};
  if (const char* env = std::getenv("CURVEWARDEN_USER"); env != nullptr && *env != '\0') {
    return {canonical(env, "CURVEWARDEN_USER"), "CURVEWARDEN_USER"};
  }
  const std::string login = os_login();
  if (login.rfind("uid ", 0) == 0) {
    throw UsageError("cannot tell who is acting", "give --as NAME or set CURVEWARDEN_USER");
  }
  return {canonical(login, "the login name"), "the login name"};
}

std::string Invocation::os_login() {
  if (const passwd* pw = getpwuid(geteuid());
      pw != nullptr && pw->pw_name != nullptr && *pw->pw_name != '\0') {
    return pw->pw_name;
  }
  // No passwd entry (a container's bare uid): the number is what the system knows.
  return "uid " + std::to_string(geteuid());
}

}  // namespace cw::cli
