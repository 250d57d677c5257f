// SPDX-License-Identifier: Apache-2.0
// Writes the manual page and the bash completion generated from the command table:
//   curvewarden-docgen man FILE | completion FILE
#include <fstream>
#include <iostream>
#include <string>

#include "cli/docs.h"

int main(int argc, char** argv) {
  if (argc != 3) {
    std::cerr << "usage: curvewarden-docgen man|completion FILE\n";
    return 2;
  }
  const std::string what = argv[1];
  std::ofstream out(argv[2], std::ios::binary | std::ios::trunc);
  if (what == "man") {
    out << cw::cli::man_page();
  } else if (what == "completion") {
    out << cw::cli::bash_completion();
  } else {
    std::cerr << "curvewarden-docgen: unknown document '" << what << "'\n";
    return 2;
  }
  return out ? 0 : 1;
}
