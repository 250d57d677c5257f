// SPDX-License-Identifier: Apache-2.0
// Registry use cases.
#include "app/registry.h"

#include "app/refusal.h"
#include "core/error.h"
#include "core/text.h"
#include "import/method_file.h"

namespace cw::app {

// ------------------------------------------------------------------------------- lookups

Instrument get_instrument(store::ReadUnit& unit, const std::string& code) {
  auto found = unit.registry().instrument(code);
  if (!found) {
    throw NotFoundError(
        "no instrument " + quote(code),
        "list them with 'curvewarden instrument list' or add it with 'instrument add'");
  }
  return *found;
}

Method get_method(store::ReadUnit& unit, const std::string& code) {
  auto found = unit.registry().method(code);
  if (!found) {
    throw NotFoundError(
        "no method " + quote(code),
        "list them with 'curvewarden method list' or add one with 'method add FILE.toml'");
  }
  return *found;
}

Lot get_lot(store::ReadUnit& unit, const std::string& code) {
  auto found = unit.registry().lot(code);
  if (!found) {
    throw NotFoundError("no lot " + quote(code),
                        "list them with 'curvewarden lot list' or add it with 'lot add'");
  }
  return *found;
}

// ------------------------------------------------------------------------------------ lab

InitOutcome init_store(Session& s, const InitRequest& request) {
  InitOutcome out;
  out.created = s.store().was_created();
  auto unit = s.write();
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
  return out;
}

// ---------------------------------------------------------------------------- instruments

Instrument add_instrument(Session& s, const std::string& code,
                          const std::optional<std::string>& name) {
  auto unit = s.write();
  if (unit->registry().instrument(code)) {
    throw ValidationError(
        "instrument " + quote(code) + " is already registered",
        "instrument codes are unique; see 'curvewarden instrument show " + code + "'");
  }
  unit->registry_writer().add_instrument(code, name, s.at());
  unit->append_entry({"instrument.add", "instrument", code, std::nullopt, s.at()});
  Instrument added = get_instrument(*unit, code);
  unit->commit();
  return added;
}

std::vector<Instrument> list_instruments(Session& s) {
  auto unit = s.read();
  return unit->registry().instruments();
}

Instrument show_instrument(Session& s, const std::string& code) {
  auto unit = s.read();
  return get_instrument(*unit, code);
}

Instrument save_instrument_columns(Session& s, const std::string& code,
                                   const ColumnMapping& columns,
                                   const std::optional<std::string>& reason) {
  auto unit = s.write();
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
  auto unit = s.write();
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
  if (auto existing = unit->registry().method(parsed.definition.code)) {
    throw ValidationError(
        SourceLocation{file, std::nullopt, std::nullopt, "code"},
        "method " + quote(parsed.definition.code) + " already exists (version " +
            std::to_string(existing->latest().version) + ")",
        "register a new version with 'curvewarden method revise " + file + " --reason ...'");
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
  auto unit = s.write();
  auto existing = unit->registry().method(parsed.definition.code);
  if (!existing) {
    throw NotFoundError(
        "no method " + quote(parsed.definition.code) + " to revise (file '" + file + "')",
        "register it first with 'curvewarden method add " + file + "'");
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
  if (unit->registry().lot(lot.code)) {
    throw ValidationError("lot " + quote(lot.code) + " is already registered",
                          "lot codes are unique; see 'curvewarden lot show " + lot.code + "'");
  }
  unit->registry_writer().add_lot(lot);
  unit->append_entry({"lot.add", "lot", lot.code, std::nullopt, s.at()});
  Lot added = get_lot(*unit, lot.code);
  unit->commit();
  return added;
}

std::vector<Lot> list_lots(Session& s) {
  auto unit = s.read();
  return unit->registry().lots();
}

Lot show_lot(Session& s, const std::string& code) {
  auto unit = s.read();
  return get_lot(*unit, code);
}

Lot withdraw_lot(Session& s, const std::string& code, const std::string& reason) {
  auto unit = s.write();
  const Lot lot = get_lot(*unit, code);
  if (lot.withdrawal) {
    throw ValidationError("lot " + quote(code) + " was already withdrawn on " +
                          s.zone().format_local(lot.withdrawal->occurred_at));
  }
  if (s.at() < lot.registered_at) {
    throw ValidationError("--at " + format_utc(s.at()) + " is before lot " + quote(code) +
                          " was registered (" + format_utc(lot.registered_at) + ")");
  }
  unit->registry_writer().add_lot_withdrawal(lot.id, {reason, s.at()});
  unit->append_entry({"lot.withdraw", "lot", code, reason, s.at()});
  Lot after = get_lot(*unit, code);
  unit->commit();
  return after;
}

}  // namespace cw::app
