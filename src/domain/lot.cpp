// SPDX-License-Identifier: Apache-2.0
// Lot expiry arithmetic.
#include "domain/lot.h"

#include "core/error.h"
#include "core/number.h"
#include "core/text.h"

namespace cw {

std::optional<CalendarDate> Lot::in_use_expires_on() const {
  if (!opened_on || !in_use_days) return std::nullopt;
  return add_days(*opened_on, *in_use_days);
}

CalendarDate Lot::effective_expires_on() const {
  const auto in_use = in_use_expires_on();
  return in_use && *in_use < expires_on ? *in_use : expires_on;
}

const CertifiedValue* Lot::value_for(const std::string& analyte) const {
  for (const auto& v : values) {
    if (v.analyte == analyte) return &v;
  }
  return nullptr;
}

CertifiedValue parse_certified_value(const std::string& text, const std::string& what) {
  const std::string hint =
      "write ANALYTE=CONC or ANALYTE=CONC±U (also ANALYTE=CONC+/-U), e.g. nitrate=1000±5";
  const auto eq = text.find('=');
  if (eq == std::string::npos)
    throw ValidationError(what + " " + quote(text) + " has no '='", hint);
  CertifiedValue v;
  v.analyte = trim(text.substr(0, eq));
  check_analyte_name(v.analyte, "the analyte in " + what);
  const std::string rest = trim(text.substr(eq + 1));
  std::string conc = rest, unc;
  for (const char* sep_text : {"\u00b1", "+/-", "+-"}) {
    const std::string sep = sep_text;
    if (auto at = rest.find(sep); at != std::string::npos) {
      conc = trim(rest.substr(0, at));
      unc = trim(rest.substr(at + sep.size()));
      if (unc.empty()) {
        throw ValidationError(what + " " + quote(text) + " has no uncertainty after " + quote(sep),
                              hint);
      }
      break;
    }
  }
  v.value = decimal_or_throw(conc, "the value in " + what + " " + quote(text));
  if (!(v.value > 0)) {
    throw ValidationError(what + " " + quote(text) + ": the certified value must be above 0", hint);
  }
  if (!unc.empty()) {
    v.uncertainty = decimal_or_throw(unc, "the uncertainty in " + what + " " + quote(text));
    if (*v.uncertainty < 0) {
      throw ValidationError(what + " " + quote(text) + ": the uncertainty cannot be negative",
                            hint);
    }
  }
  return v;
}

}  // namespace cw
