// SPDX-License-Identifier: Apache-2.0
// Facts for printed reports.
#include "app/reports.h"

#include <algorithm>

#include "app/curves.h"
#include "app/fact_set.h"

namespace cw::app {

namespace {

void add_entries(store::ReadUnit& unit, const std::string& kind, const std::string& id,
                 std::vector<audit::AuditEntry>& out) {
  auto list = unit.audit().list({std::nullopt, kind, id});
  out.insert(out.end(), std::make_move_iterator(list.begin()), std::make_move_iterator(list.end()));
}

}  // namespace

CurveReportFacts curve_report_facts(Session& s, CurveId id) {
  auto unit = s.read();
  FactSet facts(*unit, s.zone());
  require_acquired(s.at(), facts.curve(id, store::CurveDetail::Points), s.zone());
  CurveReportFacts r;
  if (const auto settings = unit->registry().settings()) r.lab_name = settings->lab_name;
  r.view = make_views(facts, {id}, s.at(), true).front();
  r.instrument = facts.instrument(r.view.curve.instrument_id);
  r.calibration = facts.calibration(r.view.curve.calibration_id);
  for (const auto& k : facts.facts(id).checks) {
    if (k.occurred_at <= s.at()) r.checks.push_back(k);
  }
  add_entries(*unit, "calibration", std::to_string(r.calibration.id.value), r.entries);
  add_entries(*unit, "curve", std::to_string(id.value), r.entries);
  for (const auto& k : r.checks) add_entries(*unit, "check", std::to_string(k.id.value), r.entries);
  for (const auto& l : r.view.lots) add_entries(*unit, "lot", l.code, r.entries);
  std::sort(r.entries.begin(), r.entries.end(),
            [](const audit::AuditEntry& a, const audit::AuditEntry& b) { return a.seq < b.seq; });
  r.head = unit->audit().head();
  return r;
}

}  // namespace cw::app
