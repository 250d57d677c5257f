// SPDX-License-Identifier: Apache-2.0
// Entry point: hands the arguments to the command line and returns its exit code.
#include <iostream>
#include <string>
#include <vector>

#include "cli/cli_app.h"
#include "cli/safe_output.h"

int main(int argc, char** argv) {
  std::vector<std::string> args(argv + 1, argv + argc);
  cw::cli::SafeStreambuf out_buf(std::cout.rdbuf());
  cw::cli::SafeStreambuf err_buf(std::cerr.rdbuf());
  std::ostream out(&out_buf);
  std::ostream err(&err_buf);
  const int code = cw::cli::run_cli(args, out, err);
  out.flush();
  err.flush();
  return code;
}
