// SPDX-License-Identifier: Apache-2.0
// The trend of a check standard.
#include "app/trend.h"

#include <set>

#include "app/registry.h"
#include "core/error.h"
#include "core/text.h"
#include "rules/trend.h"

namespace cw::app {

TrendOutcome trend(Session& s, const TrendRequest& r) {
  const Instant at = s.at();
  auto unit = s.read();
  const Method method = get_method(*unit, r.method);
  const Instrument instrument = get_instrument(*unit, r.instrument);
  const MethodVersion* version = method.version_at(at);
  if (!version) {
    throw ValidationError("method " + quote(method.code) + " has no version in force at " +
                          s.zone().format_local(at));
  }
  bool known = false;
  for (const auto& v : method.versions) known = known || v.definition.has_analyte(r.analyte);
  if (!known) {
    std::string list;
    for (const auto& a : version->definition.analytes) list += (list.empty() ? "" : ", ") + a;
    throw ValidationError("method " + quote(method.code) + " has no analyte " + quote(r.analyte),
                          "its analytes: " + list);
  }
  const std::vector<Check> checks =
      unit->curves().checks_of_group(method.id, instrument.id, r.analyte);
  const CheckRules& rules = version->definition.check;
  const rules::TrendAnalysis t = rules::analyse_trend(checks, rules, at);

  TrendOutcome out;
  out.method_code = method.code;
  out.method_version = version->version;
  out.instrument_code = instrument.code;
  out.analyte = r.analyte;
  out.as_of = at;
  out.trend_rules = rules.trend_rules;
  out.limits = t.limits;
  out.established = t.established;
  out.no_limits = t.no_limits;
  out.total_points = static_cast<long>(t.observations.size());
  const std::size_t first = r.last && static_cast<std::size_t>(*r.last) < t.observations.size()
                                ? t.observations.size() - static_cast<std::size_t>(*r.last)
                                : 0;
  std::set<std::int64_t> shown;
  for (std::size_t i = first; i < t.observations.size(); ++i) {
    TrendPoint p;
    p.check = *t.checks[i];
    p.recovery_pct = t.observations[i].recovery_pct;
    if (t.limits) p.z = (p.recovery_pct - t.limits->mean) / t.limits->sd;
    shown.insert(p.check.id.value);
    out.points.push_back(std::move(p));
  }
  const std::set<rules::WestgardRule> rejecting = rules::rejection_rules(rules.trend_rules);
  for (const auto& v : t.violations) {
    if (!shown.count(v.check_id.value)) continue;
    out.violations.push_back({v, t.established && rejecting.count(v.rule) > 0});
  }
  return out;
}

}  // namespace cw::app
