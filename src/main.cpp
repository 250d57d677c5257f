// SPDX-License-Identifier: Apache-2.0
// Entry point: hands the arguments to the command line and returns its exit code.
#include <iostream>
#include <string>
#include <vector>

#include "cli/cli_app.h"

int main(int argc, char** argv) {
  std::vector<std::string> args(argv + 1, argv + argc);
  return cw::cli::run_cli(args, std::cout, std::cerr);
}
