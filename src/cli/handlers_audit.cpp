// SPDX-License-Identifier: Apache-2.0
// Handlers of the audit commands.
#include "app/audit.h"
#include "cli/handlers.h"
#include "core/clean_text.h"
#include "core/error.h"
#include "report/registry_views.h"

namespace cw::cli::handlers {

int audit_log(Invocation& in) {
  store::AuditFilter filter;
  filter.since = in.optional_instant("--since");
  filter.entity_kind = in.optional_text("--entity", kMaxLabelChars);
  filter.entity_id = in.optional_text("--id", kMaxNameChars);
  auto s = in.open_session();
  const auto entries = app::audit_log(s, filter);
  if (in.json()) {
    report::Json items = report::Json::array();
    for (const auto& e : entries) items.push_back(report::audit_entry_json(e));
    in.emit(report::Json{{"entries", items}});
  } else {
    report::print_audit_log(in.out(), entries, s.zone());
  }
  return 0;
}

int audit_verify(Invocation& in) {
  auto s = in.open_session();
  const auto r = app::verify_audit(s);
  if (in.json()) {
    in.emit(report::verify_json(r));
  } else {
    report::print_verify(in.out(), r);
  }
  if (!r.chain.ok) {
    return in.fail(
        AuditBrokenError("audit trail broken at entry " +
                             (r.chain.first_broken ? std::to_string(*r.chain.first_broken) : "?") +
                             ": " + r.chain.problem,
                         "restore the store from a backup and compare; the entry named is the "
                         "first that no longer holds"));
  }
  if (!r.missing_guards.empty()) {
    std::string list;
    for (const auto& g : r.missing_guards) list += (list.empty() ? "" : ", ") + g;
    return in.fail(StoreError("the store's append-only guards are missing: " + list,
                              "the store was altered outside curvewarden; restore it from a "
                              "backup"));
  }
  return 0;
}

}  // namespace cw::cli::handlers
