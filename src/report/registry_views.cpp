// SPDX-License-Identifier: Apache-2.0
// Views of the registries and the audit trail.
#include "report/registry_views.h"

#include <algorithm>

#include "core/text.h"
#include "report/table.h"

namespace cw::report {
namespace {

std::string or_dash(const std::optional<std::string>& s) {
  return s ? *s : "-";
}

std::string opt_num(const std::optional<double>& v, const std::string& suffix = "") {
  return v ? format_shortest(*v) + suffix : "-";
}

}  // namespace

Json init_json(const app::InitOutcome& o, const std::string& path) {
  return Json{
      {"store", path},
      {"created", o.created},
      {"changed", o.changed},
      {"lab", o.settings.lab_name},
      {"time_zone", o.settings.time_zone},
      {"schema_version", o.schema_version},
      {"admin_registered", o.admin_registered ? user_json(*o.admin_registered) : Json(nullptr)},
      {"lab_key", o.lab_key},
      {"lab_key_created", o.lab_key_created},
      {"grants", o.grants.empty() ? Json(nullptr) : Json(o.grants)}};
}

void print_init(std::ostream& out, const app::InitOutcome& o, const std::string& path) {
  if (o.created) {
    out << "Created store " << path << " for " << o.settings.lab_name << " (time zone "
        << o.settings.time_zone << ", schema " << o.schema_version << ").\n";
    if (o.admin_registered) {
      out << "Registered " << o.admin_registered->code << " (" << o.admin_registered->name
          << ") as the store's first admin.\n";
    }
    if (o.lab_key_created) {
      out << "Created the lab key " << o.lab_key
          << " (mode 0600; it signs audit checkpoints: keep a copy off this machine).\n";
    }
  } else if (o.changed) {
    out << "Store " << path << " now records lab " << o.settings.lab_name << ", time zone "
        << o.settings.time_zone << ".\n";
  } else if (o.admin_registered) {
    out << "Store " << path << " had no enabled admin: " << o.admin_registered->code << " ("
        << o.admin_registered->name << ") is now its admin.\n";
  } else {
    out << "Store " << path << " is up to date (schema " << o.schema_version
        << "): " << o.settings.lab_name << ", time zone " << o.settings.time_zone << ".\n";
  }
  if (!o.grants.empty()) {
    out << "A database administrator applies these statements so that the workstations' role\n"
           "may only read and append (rename curvewarden_app to the lab's role):\n"
        << o.grants;
  }
}

Json instrument_json(const Instrument& i, Instant at) {
  Json service = Json::array();
  for (const auto& e : i.service) {
    service.push_back({{"direction", std::string(to_string(e.direction))},
                       {"reason", e.reason},
                       {"at", json_instant(e.occurred_at)}});
  }
  Json columns = nullptr;
  if (const SavedColumns* c = i.columns_at(at)) {
    columns = Json::object();
    for (const auto& [name, header] : c->columns) columns[name] = header;
  }
  Json history = Json::array();
  for (const auto& c : i.columns) {
    Json mapping = Json::object();
    for (const auto& [name, header] : c.columns) mapping[name] = header;
    history.push_back({{"columns", mapping},
                       {"reason", json_optional(c.reason)},
                       {"saved_by", c.saved_by},
                       {"at", json_instant(c.occurred_at)}});
  }
  return Json{{"code", i.code},
              {"name", json_optional(i.name)},
              {"registered_at", json_instant(i.registered_at)},
              {"in_service", i.in_service_at(at)},
              {"service", service},
              {"columns", columns},
              {"column_history", history}};
}

void print_instrument(std::ostream& out, const Instrument& i, const LabZone& zone, Instant at) {
  out << "Instrument " << i.code << (i.name ? "  " + *i.name : "") << "\n";
  out << "  registered  " << zone.format_local(i.registered_at) << "\n";
  if (const ServiceEvent* e = i.out_of_service_event_at(at)) {
    out << "  status      OUT OF SERVICE since " << zone.format_local(e->occurred_at) << " ("
        << e->reason << ")\n";
  } else {
    out << "  status      in service\n";
  }
  if (const SavedColumns* c = i.columns_at(at)) {
    out << "  columns     " << column_mapping_text(c->columns) << " (saved "
        << zone.format_local(c->occurred_at) << " by " << c->saved_by << ")\n";
  }
  if (!i.service.empty()) {
    out << "  service history:\n";
    Table t({{"when"}, {"event"}, {"reason"}});
    for (const auto& e : i.service) {
      t.add_row(
          {zone.format_local(e.occurred_at),
           e.direction == ServiceDirection::Out ? "taken out of service" : "returned to service",
           e.reason});
    }
    t.print(out, 4);
  }
}

void print_instrument_list(std::ostream& out, const std::vector<Instrument>& list,
                           const LabZone& zone, Instant at) {
  if (list.empty()) {
    out << "No instruments registered. Add one with 'curvewarden instrument add CODE --name "
           "TEXT'.\n";
    return;
  }
  Table t({{"code"}, {"name"}, {"status"}, {"registered"}});
  for (const auto& i : list) {
    const ServiceEvent* e = i.out_of_service_event_at(at);
    t.add_row({i.code, or_dash(i.name),
               e ? "out of service since " + zone.format_local(e->occurred_at) : "in service",
               zone.format_local(i.registered_at)});
  }
  t.print(out);
}

Json method_version_json(const Method& m, const MethodVersion& v, bool with_source) {
  const auto& d = v.definition;
  const auto& c = d.calibration;
  const auto& k = d.check;
  Json j{{"code", m.code},
         {"version", v.version},
         {"effective_at", json_instant(v.effective_at)},
         {"title", d.title},
         {"unit", d.unit},
         {"analytes", d.analytes},
         {"internal_standard", json_optional(d.internal_standard)},
         {"calibration",
          {{"model", std::string(fitting::to_string(c.model))},
           {"weighting", std::string(fitting::to_string(c.weighting))},
           {"min_levels", c.min_levels},
           {"min_r2", json_number(c.min_r2)},
           {"max_error_pct", json_number(c.max_error_pct)},
           {"max_error_pct_lowest", json_number(c.max_error_pct_lowest)},
           {"min_levels_within", json_number(c.min_levels_within)},
           {"max_rf_rsd_pct", json_number(c.max_rf_rsd_pct)},
           {"valid_for", to_string(c.valid_for)},
           {"review_required", c.review_required}}},
         {"check",
          {{"tolerance_pct", k.tolerance_pct},
           {"samples_per_check", json_optional(k.samples_per_check)},
           {"check_every", k.check_every ? Json(to_string(*k.check_every)) : Json(nullptr)},
           {"trend_rules", k.trend_rules},
           {"blank_limit", json_number(k.blank_limit)},
           {"trend_mean", json_number(k.trend_mean)},
           {"trend_sd", json_number(k.trend_sd)}}},
         {"source_name", v.source_name},
         {"source_sha256", v.source_sha256},
         {"reason", json_optional(v.reason)}};
  if (with_source) j["source_text"] = v.source_text;
  return j;
}

Json method_json(const Method& m, Instant at) {
  const MethodVersion* in_force = m.version_at(at);
  Json versions = Json::array();
  for (const auto& v : m.versions) {
    versions.push_back({{"version", v.version},
                        {"effective_at", json_instant(v.effective_at)},
                        {"source_sha256", v.source_sha256},
                        {"reason", json_optional(v.reason)}});
  }
  return Json{{"code", m.code},
              {"title", m.latest().definition.title},
              {"latest_version", m.latest().version},
              {"version_in_force", in_force ? Json(in_force->version) : Json(nullptr)},
              {"registered_at", json_instant(m.registered_at)},
              {"versions", versions}};
}

void print_method_version(std::ostream& out, const Method& m, const MethodVersion& v,
                          const LabZone& zone, Instant at) {
  const auto& d = v.definition;
  const auto& c = d.calibration;
  const auto& k = d.check;
  const MethodVersion* in_force = m.version_at(at);
  out << "Method " << m.code << " version " << v.version << " of " << m.latest().version;
  if (in_force && in_force->version == v.version) out << " (in force)";
  out << "\n  " << d.title << "\n";
  out << "  effective   " << zone.format_local(v.effective_at) << "\n";
  if (v.reason) out << "  reason      " << *v.reason << "\n";
  out << "  unit        " << d.unit << "\n";
  std::string analytes;
  for (const auto& a : d.analytes) analytes += (analytes.empty() ? "" : ", ") + a;
  out << "  analytes    " << analytes << "\n";
  if (d.internal_standard) out << "  internal standard  " << *d.internal_standard << "\n";
  out << "  calibration " << fitting::to_string(c.model) << ", weighting "
      << fitting::to_string(c.weighting) << ", valid for " << to_string(c.valid_for)
      << (c.review_required ? ", second-person review required" : ", no review required") << "\n";
  out << "  acceptance  at least " << c.min_levels << " levels";
  if (c.min_r2) out << "; r² ≥ " << format_shortest(*c.min_r2);
  if (c.max_error_pct) {
    out << "; |%RE| ≤ " << format_shortest(*c.max_error_pct) << " %";
    if (c.max_error_pct_lowest)
      out << " (lowest level ≤ " << format_shortest(*c.max_error_pct_lowest) << " %)";
    if (c.min_levels_within) {
      out << " for at least " << format_shortest(100 * *c.min_levels_within) << " % of levels";
    } else {
      out << " at every level";
    }
  }
  if (c.max_rf_rsd_pct)
    out << "; response-factor %RSD ≤ " << format_shortest(*c.max_rf_rsd_pct) << " %";
  out << "\n";
  out << "  checks      recovery within 100 ± " << format_shortest(k.tolerance_pct) << " %";
  if (k.check_every) out << ", due every " << to_string(*k.check_every);
  if (k.samples_per_check) out << ", at most " << *k.samples_per_check << " samples per check";
  if (k.blank_limit) out << ", blanks below " << format_shortest(*k.blank_limit) << " " << d.unit;
  out << "\n";
  if (!k.trend_rules.empty()) {
    std::string rules;
    for (const auto& r : k.trend_rules) rules += (rules.empty() ? "" : ", ") + r;
    out << "  trend rules " << rules << "\n";
  }
  if (k.trend_mean && k.trend_sd) {
    out << "  trend limits mean " << format_plain(*k.trend_mean, 6) << " %, s "
        << format_plain(*k.trend_sd, 6) << " % (set by the method)\n";
  }
  out << "  file        " << v.source_name << "  sha256 " << v.source_sha256 << "\n";
  if (m.versions.size() > 1) {
    out << "  versions:\n";
    Table t({{"version", Table::Align::Right}, {"effective"}, {"reason"}});
    for (const auto& other : m.versions) {
      t.add_row({std::to_string(other.version), zone.format_local(other.effective_at),
                 or_dash(other.reason)});
    }
    t.print(out, 4);
  }
}

void print_method_list(std::ostream& out, const std::vector<Method>& list, const LabZone& zone,
                       Instant at) {
  if (list.empty()) {
    out << "No methods registered. Add one with 'curvewarden method add FILE.toml'.\n";
    return;
  }
  Table t({{"code"}, {"version", Table::Align::Right}, {"in force since"}, {"model"}, {"title"}});
  for (const auto& m : list) {
    const MethodVersion* v = m.version_at(at);
    if (!v) v = &m.latest();
    t.add_row({m.code, std::to_string(v->version), zone.format_local(v->effective_at),
               std::string(fitting::to_string(v->definition.calibration.model)),
               v->definition.title});
  }
  t.print(out);
}

std::string lot_status(const Lot& lot, const LabZone& zone, Instant at) {
  if (lot.is_withdrawn_at(at)) return "withdrawn";
  if (lot.is_expired_at(at, zone)) return "expired";
  return "usable";
}

namespace {

/// The lot's last day is 9999-12-31: the end of it is 10000-01-01 in the lab's zone, which no
/// four-digit time writes (whether or not it lies within the years the store holds in UTC).
bool ends_with_the_calendar(const Lot& lot) {
  return lot.effective_expires_on() == CalendarDate{9999, 12, 31};
}

}  // namespace

std::string usable_until_text(const Lot& lot, const LabZone& zone) {
  if (ends_with_the_calendar(lot)) return "the end of " + format_date(lot.effective_expires_on());
  return zone.format_local(lot.expiry_instant(zone));
}

Json lot_json(const Lot& lot, const LabZone& zone, Instant at) {
  Json values = Json::array();
  for (const auto& v : lot.values) {
    values.push_back(
        {{"analyte", v.analyte}, {"value", v.value}, {"uncertainty", json_number(v.uncertainty)}});
  }
  const auto in_use = lot.in_use_expires_on();
  return Json{
      {"code", lot.code},
      {"material", lot.material},
      {"certificate", json_optional(lot.certificate)},
      {"coverage_factor", lot.coverage()},
      {"expires_on", format_date(lot.expires_on)},
      {"opened_on", lot.opened_on ? Json(format_date(*lot.opened_on)) : Json(nullptr)},
      {"in_use_days", json_optional(lot.in_use_days)},
      {"in_use_expires_on", in_use ? Json(format_date(*in_use)) : Json(nullptr)},
      {"effective_expires_on", format_date(lot.effective_expires_on())},
      {"usable_until", json_instant(std::min(lot.expiry_instant(zone), last_stored_moment()))},
      {"status", lot_status(lot, zone, at)},
      {"withdrawn_at", lot.withdrawal ? json_instant(lot.withdrawal->occurred_at) : Json(nullptr)},
      {"withdrawal_reason", lot.withdrawal ? Json(lot.withdrawal->reason) : Json(nullptr)},
      {"registered_at", json_instant(lot.registered_at)},
      {"values", values}};
}

void print_lot(std::ostream& out, const Lot& lot, const LabZone& zone, Instant at) {
  out << "Lot " << lot.code << "  " << lot.material << "\n";
  if (lot.certificate) out << "  certificate " << *lot.certificate << "\n";
  out << "  uncertainties stated with k = " << format_shortest(lot.coverage())
      << (lot.coverage_factor ? "" : " (the default)") << "\n";
  out << "  expires     " << format_date(lot.expires_on) << " (certificate)\n";
  if (lot.opened_on) {
    out << "  opened      " << format_date(*lot.opened_on);
    if (auto in_use = lot.in_use_expires_on()) {
      out << ", in use for " << *lot.in_use_days << " days: until " << format_date(*in_use);
    }
    out << "\n";
  }
  out << "  usable until " << usable_until_text(lot, zone);
  if (!ends_with_the_calendar(lot)) {
    out << " (end of " << format_date(lot.effective_expires_on()) << ")";
  }
  out << "\n";
  out << "  status      " << lot_status(lot, zone, at);
  if (lot.withdrawal) {
    out << " (withdrawn " << zone.format_local(lot.withdrawal->occurred_at) << ": "
        << lot.withdrawal->reason << ")";
  }
  out << "\n  certified values:\n";
  Table t({{"analyte"}, {"value", Table::Align::Right}, {"uncertainty", Table::Align::Right}});
  for (const auto& v : lot.values)
    t.add_row({v.analyte, format_shortest(v.value), opt_num(v.uncertainty)});
  t.print(out, 4);
}

void print_lot_list(std::ostream& out, const std::vector<Lot>& list, const LabZone& zone,
                    Instant at) {
  if (list.empty()) {
    out << "No lots registered. Add one with 'curvewarden lot add CODE --material TEXT --expires "
           "DATE --value A=C'.\n";
    return;
  }
  Table t({{"code"}, {"material"}, {"usable until"}, {"status"}, {"analytes"}});
  for (const auto& lot : list) {
    std::string analytes;
    for (const auto& v : lot.values) analytes += (analytes.empty() ? "" : ", ") + v.analyte;
    t.add_row({lot.code, lot.material, format_date(lot.effective_expires_on()),
               lot_status(lot, zone, at), analytes});
  }
  t.print(out);
}

Json audit_entry_json(const audit::AuditEntry& e) {
  Json payload;
  try {
    payload = Json::parse(e.payload);
  } catch (const nlohmann::json::exception&) {
    payload = e.payload;
  }
  return Json{{"seq", e.seq},
              {"recorded_at", e.recorded_at},
              {"occurred_at", e.occurred_at},
              {"actor", e.actor},
              {"action", e.action},
              {"entity_kind", e.entity_kind},
              {"entity_id", e.entity_id},
              {"reason", json_optional(e.reason)},
              {"back_dated", e.occurred_at < e.recorded_at},
              {"clock_overridden", e.clock_overridden},
              {"tool_version", e.tool_version},
              {"os_login", json_optional(e.os_login)},
              {"values", payload},
              {"prev_hash", e.prev_hash},
              {"hash", e.hash}};
}

void print_audit_log(std::ostream& out, const std::vector<audit::AuditEntry>& entries,
                     const LabZone& zone) {
  if (entries.empty()) {
    out << "No audit entries match.\n";
    return;
  }
  Table t({{"seq", Table::Align::Right}, {"recorded"}, {"by"}, {"action"}, {"entity"}, {"note"}});
  bool any_override = false;
  for (const auto& e : entries) {
    std::string note;
    const Instant recorded = parse_instant(e.recorded_at);
    const Instant occurred = parse_instant(e.occurred_at);
    if (occurred < recorded) note = "back-dated to " + zone.format_local(occurred);
    if (occurred > recorded) note = "dated ahead to " + zone.format_local(occurred);
    if (e.reason) note += (note.empty() ? "" : "; ") + std::string("reason: ") + *e.reason;
    if (e.clock_overridden) any_override = true;
    t.add_row({std::to_string(e.seq), zone.format_local(recorded), e.actor, e.action,
               e.entity_kind + " " + e.entity_id, note});
  }
  t.print(out);
  if (any_override) {
    out << "note: some entries were recorded with CURVEWARDEN_NOW set (a fixed clock for tests and "
           "demos).\n";
  }
}

Json verify_json(const app::VerifyOutcome& o) {
  const store::VerifyReport& r = o.chain;
  return Json{{"entries", r.entries},
              {"ok", o.ok()},
              {"chain_intact", r.ok},
              {"derived_intact", r.ok ? Json(!o.derived_problem) : Json(nullptr)},
              {"derived_problem", o.derived_problem ? Json(*o.derived_problem) : Json(nullptr)},
              {"first_broken", json_optional(r.first_broken)},
              {"problem", r.ok ? Json(nullptr) : Json(r.problem)},
              {"head_hash", r.ok ? Json(r.head_hash) : Json(nullptr)},
              {"missing_guards", o.missing_guards}};
}

void print_verify(std::ostream& out, const app::VerifyOutcome& o) {
  const store::VerifyReport& r = o.chain;
  if (r.ok) {
    out << "Audit trail intact: " << r.entries
        << " entries, every hash and every fact row checked.\n";
    out << "Head hash " << r.head_hash << "\n";
    out << "(Record the head hash outside this store, e.g. in the lab notebook, so that a rewrite "
           "of the whole file can be detected later.)\n";
  } else {
    out << "AUDIT TRAIL BROKEN at entry "
        << (r.first_broken ? std::to_string(*r.first_broken) : "?") << ": " << r.problem << "\n";
  }
  if (o.derived_problem) {
    out << "DERIVED COUNTS DISAGREE WITH THE FACTS: the counts of settled curves that status adds "
           "up do not match the stored facts ("
        << *o.derived_problem << ").\n";
  }
  if (!o.missing_guards.empty()) {
    out << "APPEND-ONLY GUARDS MISSING (" << o.missing_guards.size()
        << "): the store was altered outside curvewarden; writes are refused.\n";
    for (const auto& g : o.missing_guards) out << "  missing trigger " << g << "\n";
  }
}

}  // namespace cw::report

namespace cw::report {

Json user_json(const User& u) {
  Json history = Json::array();
  for (const auto& e : u.events) {
    history.push_back({{"status", std::string(to_string(e.status))},
                       {"role", std::string(to_string(e.role))},
                       {"reason", e.reason},
                       {"by", e.by},
                       {"at", json_instant(e.occurred_at)}});
  }
  Json permissions = Json::array();
  for (Permission p : all_permissions()) {
    if (role_permits(u.role(), p)) permissions.push_back(std::string(to_string(p)));
  }
  return Json{{"code", u.code},
              {"name", u.name},
              {"role", std::string(to_string(u.role()))},
              {"status", std::string(to_string(u.current().status))},
              {"locked", u.locked},
              {"permissions", permissions},
              {"registered_at", json_instant(u.registered_at)},
              {"changed_at", json_instant(u.current().occurred_at)},
              {"history", history}};
}

void print_user(std::ostream& out, const User& u, const LabZone& zone) {
  out << "User " << u.code << ": " << u.name << "\n"
      << "  role:       " << to_string(u.role()) << "\n"
      << "  status:     " << to_string(u.current().status)
      << (u.locked ? " (locked by wrong passphrases: an admin runs 'curvewarden user unlock " +
                         u.code + " --reason TEXT')"
                   : "")
      << "\n"
      << "  registered: " << zone.format_local(u.registered_at) << "\n";
  std::string rights;
  for (Permission p : all_permissions()) {
    if (role_permits(u.role(), p))
      rights += (rights.empty() ? "" : ", ") + std::string(to_string(p));
  }
  out << "  may:        " << (rights.empty() ? "-" : rights) << "\n";
  out << "History:\n";
  Table t({{"at"}, {"status"}, {"role"}, {"by"}, {"reason"}});
  for (const auto& e : u.events) {
    t.add_row({zone.format_local(e.occurred_at), std::string(to_string(e.status)),
               std::string(to_string(e.role)), e.by, e.reason});
  }
  t.print(out);
}

void print_user_list(std::ostream& out, const std::vector<User>& list, const LabZone& zone) {
  if (list.empty()) {
    out << "No users registered.\n";
    return;
  }
  Table t({{"code"}, {"name"}, {"role"}, {"status"}, {"since"}});
  for (const auto& u : list) {
    t.add_row({u.code, u.name, std::string(to_string(u.role())),
               std::string(to_string(u.current().status)) + (u.locked ? ", locked" : ""),
               zone.format_local(u.current().occurred_at)});
  }
  t.print(out);
}

Json store_copy_json(const app::StoreCopyOutcome& o) {
  Json tables = Json::object();
  for (const auto& t : o.tables) tables[t.table] = t.rows;
  return Json{{"from", o.from},
              {"to", o.to},
              {"schema_version", o.schema_version},
              {"entries", o.entries},
              {"rows", o.rows},
              {"tables", tables},
              {"source_head_hash", o.source_head_hash},
              {"destination_head_hash", o.destination_head_hash}};
}

void print_store_copy(std::ostream& out, const app::StoreCopyOutcome& o) {
  out << "Copied " << o.from << " to " << o.to << ": " << o.entries << " audit entries and "
      << o.rows << " fact rows (schema version " << o.schema_version << ").\n"
      << "Both verify: head hash of the source " << o.source_head_hash << "\n"
      << "             head hash of the copy   " << o.destination_head_hash << "\n";
}

}  // namespace cw::report
