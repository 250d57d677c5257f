// SPDX-License-Identifier: Apache-2.0
// Fuzz target: run files (CSV), streamed from a file as run import reads them.
#include <unistd.h>

#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <string>

#include "fuzz_support.h"
#include "import/run_file.h"

namespace {

/// One scratch file per process (the reader takes a path; it checks it is a regular file).
const std::string& scratch() {
  static const std::string path = [] {
    const char* dir = std::getenv("TMPDIR");
    return std::string(dir && *dir ? dir : "/tmp") + "/curvewarden-fuzz-run-" +
           std::to_string(::getpid()) + ".csv";
  }();
  return path;
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  std::FILE* f = std::fopen(scratch().c_str(), "wb");
  if (f == nullptr) return 0;
  std::fwrite(data, 1, size, f);
  std::fclose(f);
  const auto& method = cw::fuzz::method();
  cw::fuzz::refusing_only_with_errors([&] {
    cw::import::RunFileReader reader(scratch(), method);
    while (reader.next()) {
    }
  });
  return 0;
}
