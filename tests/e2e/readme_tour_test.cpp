// SPDX-License-Identifier: Apache-2.0
// The README's tour runs as written: its shell blocks are run in order, in one bash, from the
// repository root with the built binary first on PATH, and each block's output must be the
// output block that follows it in the README ("..." in the README stands for lines left out).
#include <catch2/catch.hpp>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "harness.h"

namespace {

struct Block {
  std::string commands;
  std::vector<std::string> expected;  ///< lines; empty when the README shows no output
  bool has_expected = false;
};

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) out.push_back(line);
  return out;
}

/// The ```sh blocks of the README's "A short tour" section, each with the plain ``` block that
/// directly follows it.
std::vector<Block> tour_blocks(const std::string& readme) {
  const auto start = readme.find("## A short tour");
  const auto end = readme.find("\n## ", start + 1);
  REQUIRE(start != std::string::npos);
  const auto lines = lines_of(readme.substr(start, end - start));
  std::vector<Block> blocks;
  for (std::size_t i = 0; i < lines.size(); ++i) {
    if (lines[i] != "```sh") continue;
    Block b;
    for (++i; i < lines.size() && lines[i] != "```"; ++i) b.commands += lines[i] + "\n";
    if (i + 1 < lines.size() && lines[i + 1] == "```") {
      b.has_expected = true;
      for (i += 2; i < lines.size() && lines[i] != "```"; ++i) b.expected.push_back(lines[i]);
    }
    blocks.push_back(std::move(b));
  }
  return blocks;
}

/// True when `actual` is `expected`, where an expected line "..." (indentation aside) stands for
/// any number of lines.
bool matches(const std::vector<std::string>& expected, std::size_t e,
             const std::vector<std::string>& actual, std::size_t a) {
  if (e == expected.size()) return a == actual.size();
  const auto first = expected[e].find_first_not_of(' ');
  if (first != std::string::npos && expected[e].substr(first) == "...") {
    for (std::size_t skip = a; skip <= actual.size(); ++skip) {
      if (matches(expected, e + 1, actual, skip)) return true;
    }
    return false;
  }
  return a < actual.size() && expected[e] == actual[a] && matches(expected, e + 1, actual, a + 1);
}

}  // namespace

// The tour makes its own store file (tour.db), as the README tells a reader to: [sqlite-only].
TEST_CASE("e2e readme: the tour runs as written and shows what the README shows",
          "[e2e][sqlite-only]") {
  std::ifstream in(CW_README);
  std::stringstream text;
  text << in.rdbuf();
  const auto blocks = tour_blocks(text.str());
  REQUIRE(blocks.size() >= 3);

  // One bash for the whole tour (exports and `cd` carry over, as when pasted into a terminal or
  // a script); a marker line separates the blocks' output.
  cw::test::Sandbox box;
  std::string script = "cd '" + std::string(CW_SOURCE_DIR) + "'\nexport PATH='" +
                       cw::test::binary_path().parent_path().string() + "':\"$PATH\"\n";
  for (std::size_t i = 0; i < blocks.size(); ++i) {
    script += "echo '@@ block " + std::to_string(i) + "'\n" + blocks[i].commands;
  }
  box.write_file("tour.sh", script);
  const auto r = cw::test::run_process("/bin/bash", {"tour.sh"},
                                       box.environment({{"CURVEWARDEN_DB", std::nullopt},
                                                        {"CURVEWARDEN_USER", std::nullopt},
                                                        {"CURVEWARDEN_NOW", std::nullopt}}),
                                       box.dir());
  INFO(r.describe());
  const auto out = lines_of(r.out);
  std::vector<std::vector<std::string>> outputs;
  for (const auto& line : out) {
    if (line.rfind("@@ block ", 0) == 0) {
      outputs.emplace_back();
    } else if (!outputs.empty()) {
      outputs.back().push_back(line);
    }
  }
  REQUIRE(outputs.size() == blocks.size());
  for (std::size_t i = 0; i < blocks.size(); ++i) {
    if (!blocks[i].has_expected) continue;
    INFO("block " << i << ":\n" << blocks[i].commands);
    std::string got;
    for (const auto& l : outputs[i]) got += l + "\n";
    INFO("actual output:\n" << got);
    CHECK(matches(blocks[i].expected, 0, outputs[i], 0));
  }
}
