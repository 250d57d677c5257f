// SPDX-License-Identifier: Apache-2.0
// The output filter: terminal control characters become '?', a CRLF (the end of a CSV record)
// passes, a lone carriage return (which would let a stored text overwrite a line) does not.
#include <catch2/catch.hpp>
#include <sstream>

#include "cli/safe_output.h"

namespace {

std::string filtered(const std::string& text) {
  std::ostringstream target;
  cw::cli::SafeStreambuf buf(target.rdbuf());
  std::ostream out(&buf);
  out << text << std::flush;
  return target.str();
}

}  // namespace

TEST_CASE("safe output: controls are shown as '?', text and CRLF pass", "[cli]") {
  CHECK(filtered("a,b\r\nc,d\r\n") == "a,b\r\nc,d\r\n");
  CHECK(filtered("tab\tand\nline") == "tab\tand\nline");
  CHECK(filtered("over\rwrite") == "over?write");
  CHECK(filtered("end\r") == "end?");
  CHECK(filtered("\r\r\n") == "?\r\n");
  CHECK(filtered("\x1b[2Jclear") == "?[2Jclear");
  CHECK(filtered("del\x7f") == "del?");
  CHECK(filtered("c1 \xc2\x9b x") == "c1 ? x");       // CSI as a C1 control in UTF-8
  CHECK(filtered("Müller – Ø") == "Müller – Ø");      // ordinary UTF-8, including U+00xx
  CHECK(filtered("\xc2\xa0nbsp") == "\xc2\xa0nbsp");  // U+00A0 is text, not a control
}
