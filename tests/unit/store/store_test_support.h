// SPDX-License-Identifier: Apache-2.0
// Helpers for the store tests: a temporary directory per test and raw SQLite access through
// the C API, independent of the store layer under test.
#pragma once

#include <openssl/evp.h>
#include <sqlite3.h>
#include <stdlib.h>

#include <array>
#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

namespace cw::store_test {

/// A fresh directory under the system temp dir, removed with everything in it.
class TempDir {
 public:
  TempDir() {
    std::string pattern = (std::filesystem::temp_directory_path() / "curvewarden-store-XXXXXX");
    if (mkdtemp(pattern.data()) == nullptr) throw std::runtime_error("mkdtemp failed");
    dir_ = pattern;
  }
  ~TempDir() {
    std::error_code ec;
    std::filesystem::remove_all(dir_, ec);
  }
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;
  std::filesystem::path operator/(const std::string& name) const { return dir_ / name; }

 private:
  std::filesystem::path dir_;
};

/// SHA-256 as lowercase hex, straight from OpenSSL's EVP interface (not the project's
/// audit::sha256_hex, which is under test).
inline std::string evp_sha256_hex(const std::string& data) {
  std::array<unsigned char, EVP_MAX_MD_SIZE> digest{};
  unsigned int length = 0;
  if (EVP_Digest(data.data(), data.size(), digest.data(), &length, EVP_sha256(), nullptr) != 1) {
    throw std::runtime_error("EVP_Digest failed");
  }
  std::string hex;
  char byte[3];
  for (unsigned int i = 0; i < length; ++i) {
    std::snprintf(byte, sizeof byte, "%02x", digest[i]);
    hex += byte;
  }
  return hex;
}

inline std::string read_bytes(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

inline void write_bytes(const std::filesystem::path& p, const std::string& bytes) {
  std::ofstream out(p, std::ios::binary | std::ios::trunc);
  out << bytes;
}

/// A raw sqlite3 connection (read-write, no create) closed on scope exit.
class RawDb {
 public:
  explicit RawDb(const std::filesystem::path& p, bool create = false) {
    const int flags = SQLITE_OPEN_READWRITE | (create ? SQLITE_OPEN_CREATE : 0);
    if (sqlite3_open_v2(p.c_str(), &db_, flags, nullptr) != SQLITE_OK) {
      const std::string message = db_ ? sqlite3_errmsg(db_) : "out of memory";
      sqlite3_close(db_);
      throw std::runtime_error("cannot open " + p.string() + ": " + message);
    }
  }
  ~RawDb() { sqlite3_close(db_); }
  RawDb(const RawDb&) = delete;
  RawDb& operator=(const RawDb&) = delete;

  /// Runs `sql`; returns the SQLite result code and puts the message in `error`.
  int exec(const std::string& sql, std::string* error = nullptr) {
    char* message = nullptr;
    const int rc = sqlite3_exec(db_, sql.c_str(), nullptr, nullptr, &message);
    if (error) *error = message ? message : "";
    sqlite3_free(message);
    return rc;
  }

  /// Every row of a query, each column as text (NULL as "<null>").
  std::vector<std::vector<std::string>> rows(const std::string& sql) {
    sqlite3_stmt* s = nullptr;
    if (sqlite3_prepare_v2(db_, sql.c_str(), -1, &s, nullptr) != SQLITE_OK) {
      throw std::runtime_error("cannot prepare '" + sql + "': " + sqlite3_errmsg(db_));
    }
    std::vector<std::vector<std::string>> out;
    while (sqlite3_step(s) == SQLITE_ROW) {
      std::vector<std::string> row;
      for (int i = 0; i < sqlite3_column_count(s); ++i) {
        const auto* t = sqlite3_column_text(s, i);
        row.emplace_back(t ? reinterpret_cast<const char*>(t) : "<null>");
      }
      out.push_back(std::move(row));
    }
    sqlite3_finalize(s);
    return out;
  }

  std::int64_t integer(const std::string& sql) { return std::stoll(rows(sql).at(0).at(0)); }
  std::string text(const std::string& sql) { return rows(sql).at(0).at(0); }

 private:
  sqlite3* db_ = nullptr;
};

}  // namespace cw::store_test
