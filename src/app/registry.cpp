// SPDX-License-Identifier: Apache-2.0
// Registry use cases.
#include "app/registry.h"

#include "app/refusal.h"
#include "app/signatures.h"
#include "app/users.h"
#include "core/error.h"
#include "core/text.h"
#include "import/method_file.h"

namespace cw::app {
namespace {

/// The hint of a code not found: the registered code it matches but for case, when there is one
/// (codes match exactly), else `otherwise`.
std::string not_found_hint(store::ReadUnit& unit, store::CodedRegistry kind,
                           const std::string& code, const std::string& otherwise) {
  if (auto twin = unit.registry().code_in_other_case(kind, code)) {
    return "codes match case exactly: did you mean " + quote(*twin) + "?";
  }
  return otherwise;
}

/// The message refusing to register `code` when `what` is registered under a code that differs
/// from it only in case: people read "IC-01" and "ic-01" as one object, so the store never
/// holds both.
std::optional<std::string> case_twin(store::ReadUnit& unit, store::CodedRegistry kind,
                                     const std::string& what, const std::string& code) {
  if (auto twin = unit.registry().code_in_other_case(kind, code)) {
    return what + " " + quote(*twin) + " is already registered; " + quote(code) +
           " differs from it only in case";
  }
  return std::nullopt;
}

}  // namespace

// ------------------------------------------------------------------------------- lookups

Instrument get_instrument(store::ReadUnit& unit, const std::string& code) {
  auto found = unit.registry().instrument(code);
  if (!found) {
    throw NotFoundError(
        "no instrument " + quote(code),
        not_found_hint(unit, store::CodedRegistry::Instrument, code,
                       "list them with 'curvewarden instrument list' or add it with "
                       "'instrument add'"));
  }
  return *found;
}

Method get_method(store::ReadUnit& unit, const std::string& code) {
  auto found = unit.registry().method(code);
  if (!found) {
    throw NotFoundError(
        "no method " + quote(code),
        not_found_hint(unit, store::CodedRegistry::Method, code,
                       "list them with 'curvewarden method list' or add one with 'method add "
                       "FILE.toml'"));
  }
  return *found;
}

Lot get_lot(store::ReadUnit& unit, const std::string& code) {
  auto found = unit.registry().lot(code);
  if (!found) {
    throw NotFoundError("no lot " + quote(code),
                        not_found_hint(unit, store::CodedRegistry::Lot, code,
                                       "list them with 'curvewarden lot list' or add it with "
                                       "'lot add'"));
  }
  return *found;
}

// ------------------------------------------------------------------------------------ lab

InitOutcome init_store(Session& s, const InitRequest& request) {
  InitOutcome out;
  out.created = s.store().was_created();
  const auto any_admin = [](store::ReadUnit& unit) {
    for (const User& u : unit.registry().users()) {
      if (u.enabled() && u.role() == Role::Admin) return true;
    }
    return false;
  };
  // The first admin's passphrase is asked before the write lock is taken.
  std::optional<std::string> first_passphrase;
  if (!any_admin(*s.read())) {
    // The first admin's code becomes a user code: it obeys their syntax.
    try {
      check_code(s.actor().name, s.actor_source());
    } catch (ValidationError& e) {
      if (s.actor_source().rfind("--", 0) == 0) e.set_option(s.actor_source());
      throw;
    }
    first_passphrase = ask_new_passphrase(s, s.actor().name);
  }
  auto unit = s.write_to_register_first_admin();
  const bool has_admin = any_admin(*unit);
  if (!has_admin && !first_passphrase) {
    throw UsageError("the store's last admin was disabled while init ran", "run init again");
  }
  if (!has_admin) {
    const std::string& code = s.actor().name;
    const std::string name = request.admin_name.value_or(code);
    std::optional<User> existing = unit->registry().user(code);
    const UserId id =
        existing ? existing->id : unit->registry_writer().add_user(code, name, s.at());
    if (existing && existing->name != name && request.admin_name) {
      throw ValidationError(
          "user " + quote(code) + " is registered with the name " + quote(existing->name),
          "give the registered name with --name, or another --admin code");
    }
    unit->registry_writer().add_user_event(
        id, {UserStatus::Enabled, Role::Admin, "the store's first admin, registered at init", code,
             s.at()});
    unit->registry_writer().add_passphrase(id, *first_passphrase, s.at());
    // On a new store the admin joins the lab.init entry below; otherwise it has its own.
    if (unit->registry().settings()) {
      unit->append_entry({existing ? "user.enable" : "user.add", "user", code,
                          std::string("the store's first admin"), s.at()});
    }
    out.admin_registered = unit->registry().user(code);
  } else {
    const User acting = acting_user(s, *unit);
    if (request.admin_name && *request.admin_name != acting.name) {
      throw option_error("--name",
                         "the store already has an admin; --name names the first admin only",
                         "an admin registers other users with 'curvewarden user add'");
    }
  }
  const auto current = unit->registry().settings();
  store::LabSettings wanted;
  if (!current) {
    wanted.lab_name = request.lab.value_or("Laboratory");
    wanted.time_zone = request.zone ? request.zone->name() : LabZone::system_default().name();
    unit->registry_writer().add_settings(wanted);
    unit->append_entry({"lab.init", "lab", wanted.lab_name, std::nullopt, s.at()});
    out.changed = true;
  } else {
    wanted = *current;
    const bool new_zone = request.zone && request.zone->name() != current->time_zone;
    const bool new_name = request.lab && *request.lab != current->lab_name;
    if (new_zone || new_name) {
      authorize(s, *unit, Permission::ManageUsers, new_name ? "lab.rename" : "lab.change-zone",
                "lab", current->lab_name);
    }
    if (new_zone && unit->registry().facts_beyond_settings() > 0) {
      refuse(*unit, "lab.change-zone", "lab", current->lab_name, {Reason::ZoneFixed},
             "the lab's time zone is " + current->time_zone + " and cannot change to " +
                 request.zone->name() +
                 " once the store holds records: lot expiry days, curve expiry moments and "
                 "'this week' are all reckoned in it",
             s.at(),
             "keep the zone; a lab that moves starts a new store (the old one stays readable)");
    }
    if (new_name && !request.reason) {
      throw UsageError("renaming the lab from " + quote(current->lab_name) + " to " +
                           quote(*request.lab) + " needs --reason TEXT",
                       "the rename is recorded in the audit trail with its reason");
    }
    if (new_zone) wanted.time_zone = request.zone->name();
    if (new_name) wanted.lab_name = *request.lab;
    if (new_zone || new_name) {
      unit->registry_writer().add_settings(wanted);
      unit->append_entry({new_name ? "lab.rename" : "lab.change-zone", "lab", wanted.lab_name,
                          request.reason, s.at()});
      out.changed = true;
    }
  }
  unit->commit();
  s.set_zone(LabZone::named(wanted.time_zone));
  out.settings = wanted;
  out.schema_version = s.store().schema_version();
  out.grants = s.store().privilege_statements();
  return out;
}

// ---------------------------------------------------------------------------- instruments

Instrument add_instrument(Session& s, const std::string& code,
                          const std::optional<std::string>& name) {
  auto unit = s.write();
  authorize(s, *unit, Permission::ServiceInstruments, "instrument.add", "instrument", code);
  if (unit->registry().instrument(code)) {
    throw ValidationError(
        "instrument " + quote(code) + " is already registered",
        "instrument codes are unique; see 'curvewarden instrument show " + code + "'");
  }
  if (auto twin = case_twin(*unit, store::CodedRegistry::Instrument, "instrument", code)) {
    throw ValidationError(*twin,
                          "use the registered code, or a code that differs in more "
                          "than case; see 'curvewarden instrument list'");
  }
  unit->registry_writer().add_instrument(code, name, s.at());
  unit->append_entry({"instrument.add", "instrument", code, std::nullopt, s.at()});
  Instrument added = get_instrument(*unit, code);
  unit->commit();
  return added;
}

std::vector<Instrument> list_instruments(Session& s) {
  auto unit = s.read();
  std::vector<Instrument> out = unit->registry().instruments();
  for (Instrument& i : out) i = i.known_at(s.at());
  return out;
}

Instrument show_instrument(Session& s, const std::string& code) {
  auto unit = s.read();
  return get_instrument(*unit, code).known_at(s.at());
}

Instrument save_instrument_columns(Session& s, const std::string& code,
                                   const ColumnMapping& columns,
                                   const std::optional<std::string>& reason) {
  auto unit = s.write();
  authorize(s, *unit, Permission::ServiceInstruments, "instrument.columns", "instrument", code);
  const Instrument instrument = get_instrument(*unit, code);
  if (s.at() < instrument.registered_at) {
    throw ValidationError("instrument " + quote(code) + " was registered only at " +
                          s.zone().format_local(instrument.registered_at));
  }
  if (columns.empty() && !instrument.columns_at(s.at())) {
    throw ValidationError("instrument " + quote(code) + " has no saved columns to clear",
                          "save a mapping with --set NAME=HEADER,...");
  }
  unit->registry_writer().add_saved_columns(instrument.id,
                                            {columns, reason, s.actor().name, s.at()});
  unit->append_entry({columns.empty() ? "instrument.clear-columns" : "instrument.columns",
                      "instrument", code, reason, s.at()});
  Instrument saved = get_instrument(*unit, code);
  unit->commit();
  return saved;
}

Instrument record_service(Session& s, const ServiceRequest& request) {
  const std::string meaning =
      request.direction == ServiceDirection::Out ? "taken out of service" : "returned to service";
  std::string passphrase = ask_signature(s, meaning);
  auto unit = s.write();
  const User user = authorize(s, *unit, Permission::ServiceInstruments, "instrument.service",
                              "instrument", request.code);
  const Instrument instrument = get_instrument(*unit, request.code);
  const Instant at = s.at();
  if (at < instrument.registered_at) {
    throw ValidationError("--at " + format_utc(at) + " is before instrument " +
                          quote(instrument.code) + " was registered (" +
                          format_utc(instrument.registered_at) + ")");
  }
  if (!instrument.service.empty() && at < instrument.service.back().occurred_at) {
    throw ValidationError("--at " + format_utc(at) +
                              " is before the instrument's last service event (" +
                              format_utc(instrument.service.back().occurred_at) + ")",
                          "service events are recorded in the order they happened");
  }
  const bool out_now = !instrument.in_service_at(at);
  if (request.direction == ServiceDirection::Out && out_now) {
    throw ValidationError(
        "instrument " + quote(instrument.code) + " is already out of service",
        "return it with 'instrument service " + instrument.code + " --back --reason ...'");
  }
  if (request.direction == ServiceDirection::Back && !out_now) {
    throw ValidationError(
        "instrument " + quote(instrument.code) + " is in service, not out",
        "take it out with 'instrument service " + instrument.code + " --out --reason ...'");
  }
  sign(s, *unit, user, passphrase, {"instrument.service", meaning, "instrument", instrument.code});
  unit->registry_writer().add_service_event(instrument.id, {request.direction, request.reason, at});
  unit->append_entry({request.direction == ServiceDirection::Out ? "instrument.service-out"
                                                                 : "instrument.service-back",
                      "instrument", instrument.code, request.reason, at});
  Instrument after = get_instrument(*unit, request.code);
  unit->commit();
  return after;
}

// -------------------------------------------------------------------------------- methods

MethodVersion add_method(Session& s, const std::string& file) {
  const import::MethodFile parsed = import::read_method_file(file);
  auto unit = s.write();
  authorize(s, *unit, Permission::ReviseMethods, "method.add", "method", parsed.definition.code);
  if (auto existing = unit->registry().method(parsed.definition.code)) {
    throw ValidationError(
        SourceLocation{file, std::nullopt, std::nullopt, "code"},
        "method " + quote(parsed.definition.code) + " already exists (version " +
            std::to_string(existing->latest().version) + ")",
        "register a new version with 'curvewarden method revise " + file + " --reason ...'");
  }
  if (auto twin =
          case_twin(*unit, store::CodedRegistry::Method, "method", parsed.definition.code)) {
    throw ValidationError(SourceLocation{file, std::nullopt, std::nullopt, "code"}, *twin,
                          "revise the registered method with 'curvewarden method revise', or "
                          "give a code that differs in more than case");
  }
  const MethodId id = unit->registry_writer().add_method(parsed.definition.code, s.at());
  MethodVersion v;
  v.method_id = id;
  v.version = 1;
  v.effective_at = s.at();
  v.definition = parsed.definition;
  v.source_name = parsed.file_name;
  v.source_text = parsed.text;
  v.source_sha256 = parsed.sha256;
  unit->registry_writer().add_method_version(id, v);
  unit->append_entry({"method.add", "method", parsed.definition.code, std::nullopt, s.at()});
  MethodVersion added = get_method(*unit, parsed.definition.code).latest();
  unit->commit();
  return added;
}

MethodVersion revise_method(Session& s, const std::string& file, const std::string& reason) {
  const import::MethodFile parsed = import::read_method_file(file);
  std::string passphrase = ask_signature(s, "revised");
  auto unit = s.write();
  const User user = authorize(s, *unit, Permission::ReviseMethods, "method.revise", "method",
                              parsed.definition.code);
  auto existing = unit->registry().method(parsed.definition.code);
  if (!existing) {
    throw NotFoundError(
        "no method " + quote(parsed.definition.code) + " to revise (file '" + file + "')",
        not_found_hint(*unit, store::CodedRegistry::Method, parsed.definition.code,
                       "register it first with 'curvewarden method add " + file + "'"));
  }
  const MethodVersion& latest = existing->latest();
  if (latest.source_sha256 == parsed.sha256) {
    throw ValidationError(SourceLocation{file, std::nullopt, std::nullopt, {}},
                          "'" + file + "' is identical to version " +
                              std::to_string(latest.version) + " of method " +
                              quote(existing->code),
                          "a revision must change the method file");
  }
  if (s.at() < latest.effective_at) {
    throw ValidationError("--at " + format_utc(s.at()) + " is before version " +
                              std::to_string(latest.version) + " took effect (" +
                              format_utc(latest.effective_at) + ")",
                          "versions take effect in order");
  }
  MethodVersion v;
  v.method_id = existing->id;
  v.version = latest.version + 1;
  v.effective_at = s.at();
  v.definition = parsed.definition;
  v.source_name = parsed.file_name;
  v.source_text = parsed.text;
  v.source_sha256 = parsed.sha256;
  v.reason = reason;
  sign(s, *unit, user, passphrase, {"method.revise", "revised", "method", existing->code});
  unit->registry_writer().add_method_version(existing->id, v);
  unit->append_entry({"method.revise", "method", existing->code, reason, s.at()});
  MethodVersion added = get_method(*unit, existing->code).latest();
  unit->commit();
  return added;
}

std::vector<Method> list_methods(Session& s) {
  auto unit = s.read();
  return unit->registry().methods();
}

Method show_method(Session& s, const std::string& code) {
  auto unit = s.read();
  return get_method(*unit, code);
}

// ----------------------------------------------------------------------------------- lots

Lot add_lot(Session& s, Lot lot) {
  if (lot.opened_on && *lot.opened_on > s.zone().local_date(s.now())) {
    throw option_error("--opened",
                       "--opened " + format_date(*lot.opened_on) + " lies in the future",
                       "give the day the lot was opened");
  }
  lot.registered_at = s.at();
  auto unit = s.write();
  authorize(s, *unit, Permission::Log, "lot.add", "lot", lot.code);
  if (unit->registry().lot(lot.code)) {
    throw ValidationError("lot " + quote(lot.code) + " is already registered",
                          "lot codes are unique; see 'curvewarden lot show " + lot.code + "'");
  }
  if (auto twin = case_twin(*unit, store::CodedRegistry::Lot, "lot", lot.code)) {
    throw ValidationError(*twin,
                          "use the registered code, or a code that differs in more "
                          "than case; see 'curvewarden lot list'");
  }
  unit->registry_writer().add_lot(lot);
  unit->append_entry({"lot.add", "lot", lot.code, std::nullopt, s.at()});
  Lot added = get_lot(*unit, lot.code);
  unit->commit();
  return added;
}

std::vector<Lot> list_lots(Session& s) {
  auto unit = s.read();
  std::vector<Lot> out = unit->registry().lots();
  for (Lot& lot : out) lot = lot.known_at(s.at());
  return out;
}

Lot show_lot(Session& s, const std::string& code) {
  auto unit = s.read();
  return get_lot(*unit, code).known_at(s.at());
}

Lot withdraw_lot(Session& s, const std::string& code, const std::string& reason) {
  std::string passphrase = ask_signature(s, "withdrawn");
  auto unit = s.write();
  const User user = authorize(s, *unit, Permission::WithdrawLots, "lot.withdraw", "lot", code);
  const Lot lot = get_lot(*unit, code);
  if (lot.withdrawal) {
    throw ValidationError("lot " + quote(code) + " was already withdrawn on " +
                          s.zone().format_local(lot.withdrawal->occurred_at));
  }
  if (s.at() < lot.registered_at) {
    throw ValidationError("--at " + format_utc(s.at()) + " is before lot " + quote(code) +
                          " was registered (" + format_utc(lot.registered_at) + ")");
  }
  sign(s, *unit, user, passphrase, {"lot.withdraw", "withdrawn", "lot", code});
  unit->registry_writer().add_lot_withdrawal(lot.id, {reason, s.at()});
  unit->append_entry({"lot.withdraw", "lot", code, reason, s.at()});
  Lot after = get_lot(*unit, code);
  unit->commit();
  return after;
}

}  // namespace cw::app
