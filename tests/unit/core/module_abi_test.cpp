// SPDX-License-Identifier: Apache-2.0
// A module is loaded only when it was built from the binary's headers: module_abi() carries the
// digest of every header under src/ as they are now (src/core/CMakeLists.txt computes it when
// CMake runs, and runs again when a header changes). Recomputed here from the files, with the
// project's SHA-256, the same way: sorted paths relative to the source folder, one line each of
// "path digest".
#include <algorithm>
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "audit/sha256.h"
#include "core/module_loader.h"

namespace {

std::string read_bytes(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

}  // namespace

TEST_CASE("modules: the build identity names the digest of the headers as they are",
          "[core][modules]") {
  const std::filesystem::path root = CW_SOURCE_DIR;
  std::vector<std::string> headers;
  for (const auto& entry : std::filesystem::recursive_directory_iterator(root / "src")) {
    if (entry.is_regular_file() && entry.path().extension() == ".h") {
      headers.push_back(entry.path().lexically_relative(root).generic_string());
    }
  }
  std::sort(headers.begin(), headers.end());  // CMake's list(SORT): by bytes, as std::string
  REQUIRE(headers.size() > 50);
  std::string list;
  for (const auto& h : headers)
    list += h + " " + cw::audit::sha256_hex(read_bytes(root / h)) + "\n";
  const std::string digest = cw::audit::sha256_hex(list).substr(0, 16);
  const std::string abi = cw::module_abi();
  INFO(abi);
  CHECK(abi.rfind("curvewarden ", 0) == 0);
  CHECK(abi.size() > digest.size());
  CHECK(abi.substr(abi.size() - digest.size() - 10) == "interface " + digest);
}
