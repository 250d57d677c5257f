// SPDX-License-Identifier: Apache-2.0
// Parts of the tool built as modules of their own (shared objects opened with dlopen), so that
// the libraries they need are loaded only by the commands that use them: the PostgreSQL backend
// (libpq brings TLS, Kerberos and LDAP) and the drawing of plots and reports (cairo, pango,
// fontconfig, glib). Linked into the binary, they made up two thirds of every command's start-up.
// A module is looked for beside the binary (the build tree), then in lib/curvewarden/ of the
// installed layout, and must come from the same build: the objects crossing (interfaces, plain
// structs, strings, typed errors) are C++ classes whose layout the compiler and version decide.
#pragma once

#include <string>

namespace cw {

/// This build's identity (version, compiler and the digest of every header under src/, which
/// declare what crosses between binary and module); a module exports the same string as
/// `extern "C" const char* cw_module_abi()`.
const char* module_abi();

/// A loaded module; stays loaded for the life of the process.
class Module {
 public:
  /// Loads `file` (e.g. "curvewarden-draw.so") once per process; `purpose` says what it is for
  /// in messages ("the PostgreSQL backend"). Throws InstallationError when it is missing, does
  /// not load, or comes from another build.
  static const Module& load(const std::string& file, const std::string& purpose);

  /// The address of the exported C function `name`; throws InstallationError when absent.
  void* symbol(const char* name) const;

 private:
  Module(void* handle, std::string path, std::string purpose)
      : handle_(handle), path_(std::move(path)), purpose_(std::move(purpose)) {}
  void* handle_;
  std::string path_;
  std::string purpose_;
};

}  // namespace cw
