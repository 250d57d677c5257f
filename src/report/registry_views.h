// SPDX-License-Identifier: Apache-2.0
// Text and JSON views of the lab, instruments, methods, lots, users and the audit trail.
#pragma once

#include <ostream>
#include <vector>

#include "app/audit.h"
#include "app/registry.h"
#include "app/store_copy.h"
#include "app/users.h"
#include "audit/audit_entry.h"
#include "report/json.h"

namespace cw::report {

Json init_json(const app::InitOutcome& o, const std::string& path);
void print_init(std::ostream& out, const app::InitOutcome& o, const std::string& path);

Json instrument_json(const Instrument& i, Instant at);
void print_instrument(std::ostream& out, const Instrument& i, const LabZone& zone, Instant at);
void print_instrument_list(std::ostream& out, const std::vector<Instrument>& list,
                           const LabZone& zone, Instant at);

Json method_version_json(const Method& m, const MethodVersion& v, bool with_source);
Json method_json(const Method& m, Instant at);
void print_method_version(std::ostream& out, const Method& m, const MethodVersion& v,
                          const LabZone& zone, Instant at);
void print_method_list(std::ostream& out, const std::vector<Method>& list, const LabZone& zone,
                       Instant at);

/// The moment a lot stops being usable, as shown: the end of its last day in the lab's zone
/// (local time), or "the end of 9999-12-31" for a lot whose last day is that one (registered as
/// never expiring): its end, 10000-01-01 local time, no four-digit time can write.
std::string usable_until_text(const Lot& lot, const LabZone& zone);
Json lot_json(const Lot& lot, const LabZone& zone, Instant at);
void print_lot(std::ostream& out, const Lot& lot, const LabZone& zone, Instant at);
void print_lot_list(std::ostream& out, const std::vector<Lot>& list, const LabZone& zone,
                    Instant at);
/// "usable", "expired" or "withdrawn" at `at`.
std::string lot_status(const Lot& lot, const LabZone& zone, Instant at);

Json user_json(const User& u);
void print_user(std::ostream& out, const User& u, const LabZone& zone);
void print_user_list(std::ostream& out, const std::vector<User>& list, const LabZone& zone);

Json audit_entry_json(const audit::AuditEntry& e);
void print_audit_log(std::ostream& out, const std::vector<audit::AuditEntry>& entries,
                     const LabZone& zone);
Json verify_json(const app::VerifyOutcome& o);
void print_verify(std::ostream& out, const app::VerifyOutcome& o);

Json store_copy_json(const app::StoreCopyOutcome& o);
void print_store_copy(std::ostream& out, const app::StoreCopyOutcome& o);

}  // namespace cw::report
