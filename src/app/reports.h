// SPDX-License-Identifier: Apache-2.0
// What a printed report needs besides the record itself: the lab, the people, the instrument's
// name, the checks, and the audit entries behind the records with the head of the trail, all
// read from one consistent snapshot.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "app/curve_view.h"
#include "app/session.h"
#include "audit/audit_entry.h"
#include "domain/check.h"
#include "domain/instrument.h"
#include "store/audit_trail.h"

namespace cw::app {

struct CurveReportFacts {
  std::string lab_name;
  CurveView view;  ///< with its points, state at the session's moment
  Instrument instrument;
  Calibration calibration;
  std::vector<Check> checks;  ///< on this curve, in time order
  /// The entries that wrote the records shown: the calibration, the curve and its reviews,
  /// retirement and refusals, its checks, and the lots used; in sequence order.
  std::vector<audit::AuditEntry> entries;
  std::optional<store::ChainHead> head;
};

/// The facts of the report of curve `id`, as of the session's moment.
CurveReportFacts curve_report_facts(Session& s, CurveId id);

}  // namespace cw::app
