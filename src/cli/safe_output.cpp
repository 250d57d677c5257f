// SPDX-License-Identifier: Apache-2.0
// The control-character filter of the tool's output.
#include "cli/safe_output.h"

namespace cw::cli {

SafeStreambuf::int_type SafeStreambuf::overflow(int_type ch) {
  if (traits_type::eq_int_type(ch, traits_type::eof())) return traits_type::not_eof(ch);
  const auto byte = static_cast<unsigned char>(traits_type::to_char_type(ch));
  if (pending_cr_) {  // a carriage return is kept only as the first half of CRLF (CSV records)
    pending_cr_ = false;
    if (target_->sputc(byte == '\n' ? '\r' : '?') == traits_type::eof()) return traits_type::eof();
  }
  if (byte == '\r') {
    pending_cr_ = true;
    return ch;
  }
  if (pending_c2_) {
    pending_c2_ = false;
    if (byte >= 0x80 && byte <= 0x9F)
      return target_->sputc('?') == traits_type::eof() ? traits_type::eof() : ch;
    if (target_->sputc(static_cast<char>(0xC2)) == traits_type::eof()) return traits_type::eof();
  }
  if (byte == 0xC2) {
    pending_c2_ = true;
    return ch;
  }
  const bool control = (byte < 0x20 && byte != '\n' && byte != '\t') || byte == 0x7F;
  const char out = control ? '?' : static_cast<char>(byte);
  return target_->sputc(out) == traits_type::eof() ? traits_type::eof() : ch;
}

int SafeStreambuf::sync() {
  if (pending_cr_) {
    pending_cr_ = false;
    target_->sputc('?');
  }
  if (pending_c2_) {
    pending_c2_ = false;
    target_->sputc(static_cast<char>(0xC2));
  }
  return target_->pubsync();
}

}  // namespace cw::cli
