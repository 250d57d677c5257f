// SPDX-License-Identifier: Apache-2.0
// Finding, opening and checking the tool's modules (module_loader.h).
#include "core/module_loader.h"

#include <dlfcn.h>

#include <filesystem>
#include <map>
#include <memory>
#include <mutex>

#include "core/error.h"

namespace cw {
namespace {

/// Where modules are looked for, relative to the folder of the running binary: beside it, then
/// the installed layout (bin/ → lib/curvewarden/, from CMake's install directories).
constexpr const char* kModuleDirs[] = {".", CURVEWARDEN_MODULE_DIR_FROM_BIN};

[[noreturn]] void unavailable(const std::string& purpose, const std::string& file,
                              const std::string& what) {
  throw InstallationError(purpose + " could not be loaded: " + what,
                          "install " + file +
                              " from the same build as this binary, beside it or in its "
                              "lib/curvewarden folder");
}

}  // namespace

const char* module_abi() {
  return "curvewarden " CURVEWARDEN_VERSION " / " __VERSION__
         " / interface " CURVEWARDEN_INTERFACE_DIGEST;
}

const Module& Module::load(const std::string& file, const std::string& purpose) {
  static std::mutex mutex;
  static std::map<std::string, std::unique_ptr<Module>> loaded;
  const std::lock_guard<std::mutex> lock(mutex);
  if (auto it = loaded.find(file); it != loaded.end()) return *it->second;

  std::error_code ec;
  const std::filesystem::path self = std::filesystem::read_symlink("/proc/self/exe", ec);
  if (ec) {
    unavailable(purpose, file,
                "the binary's own folder is unknown (/proc/self/exe: " + ec.message() + ")");
  }
  std::string tried;
  for (const char* dir : kModuleDirs) {
    const std::filesystem::path candidate = (self.parent_path() / dir / file).lexically_normal();
    if (!std::filesystem::is_regular_file(candidate, ec)) {
      tried += (tried.empty() ? "" : ", ") + candidate.string();
      continue;
    }
    // RTLD_LOCAL: the module's libraries stay out of the binary's namespace.
    void* handle = dlopen(candidate.c_str(), RTLD_NOW | RTLD_LOCAL);
    if (handle == nullptr) unavailable(purpose, file, dlerror());
    const auto abi = reinterpret_cast<const char* (*)()>(dlsym(handle, "cw_module_abi"));
    if (abi == nullptr) unavailable(purpose, file, candidate.string() + " is not a module");
    if (std::string(abi()) != module_abi()) {
      unavailable(purpose, file,
                  candidate.string() + " was built as '" + abi() + "', this binary as '" +
                      module_abi() + "'");
    }
    auto module = std::unique_ptr<Module>(new Module(handle, candidate.string(), purpose));
    return *loaded.emplace(file, std::move(module)).first->second;
  }
  unavailable(purpose, file, file + " not found (looked for " + tried + ")");
}

void* Module::symbol(const char* name) const {
  void* address = dlsym(handle_, name);
  if (address == nullptr) {
    unavailable(purpose_, path_, path_ + " does not export " + name);
  }
  return address;
}

}  // namespace cw
