// SPDX-License-Identifier: Apache-2.0
// Output that cannot drive the terminal: control characters (C0 other than tab, line feed and
// a carriage return that starts a CRLF, DEL, and C1 encoded as UTF-8) are written as '?'. Every text the tool prints passes through it,
// so that a name or reason stored by an older version with an escape sequence in it is shown, not
// obeyed.
#pragma once

#include <ostream>
#include <streambuf>

namespace cw::cli {

class SafeStreambuf final : public std::streambuf {
 public:
  explicit SafeStreambuf(std::streambuf* target) : target_(target) {}

 protected:
  int_type overflow(int_type ch) override;
  int sync() override;

 private:
  std::streambuf* target_;
  bool pending_cr_ = false;  ///< a carriage return waits: kept before a line feed, else '?'
  bool pending_c2_ = false;  ///< a 0xC2 byte waits for the next to tell whether it starts a C1
};

}  // namespace cw::cli
