// SPDX-License-Identifier: Apache-2.0
// Registry use cases.
#include "app/registry.h"

#include <filesystem>
#include <set>

#include "core/error.h"
#include "core/text.h"
#include "import/method_file.h"
#include "import/text_file.h"

namespace cw::app {
namespace {

std::string checked_text(const std::string& text, const std::string& what, size_t max = 500) {
  std::string t = trim(text);
  if (t.empty()) throw UsageError(what + " is empty");
  if (t.size() > max)
    throw UsageError(what + " is longer than " + std::to_string(max) + " characters");
  if (!import::is_valid_utf8(t)) throw UsageError(what + " is not UTF-8 text");
  for (char c : t) {
    if (static_cast<unsigned char>(c) < 0x20)
      throw UsageError(what + " contains a control character");
  }
  return t;
}

}  // namespace

std::string checked_reason(const std::string& reason, const std::string& option) {
  return checked_text(reason, option, 2000);
}

// ------------------------------------------------------------------------------------ lab

InitOutcome init_store(const GlobalOptions& options, const InitRequest& request) {
  std::optional<LabZone> zone;
  if (request.tz) zone = LabZone::named(*request.tz);
  std::optional<std::string> lab;
  if (request.lab) lab = checked_text(*request.lab, "--lab", 200);

  const std::string path = resolve_db_path(options);
  std::error_code ec;
  const bool existed = std::filesystem::exists(path, ec);
  Session s = Session::open(options, /*create=*/true);
  InitOutcome out;
  out.created = !existed;
  auto current = store::load_settings(s.db());
  store::LabSettings wanted;
  if (current) {
    wanted = *current;
    if (lab) wanted.lab_name = *lab;
    if (zone) wanted.time_zone = zone->name();
  } else {
    wanted.lab_name = lab.value_or("Laboratory");
    wanted.time_zone = zone ? zone->name() : LabZone::system_default().name();
  }
  if (!current || current->lab_name != wanted.lab_name || current->time_zone != wanted.time_zone) {
    auto tx = s.write();
    store::insert_settings(tx, wanted);
    tx.append_entry(
        {current ? "lab.change" : "lab.init", "lab", wanted.lab_name, std::nullopt, s.at()});
    tx.commit();
    out.changed = true;
  }
  out.settings = wanted;
  out.schema_version = s.db().schema_version();
  return out;
}

// ---------------------------------------------------------------------------- instruments

Instrument get_instrument(Session& s, const std::string& code) {
  auto found = store::find_instrument(s.db(), code);
  if (!found) {
    throw NotFoundError(
        "no instrument " + quote(code),
        "list them with 'curvewarden instrument list' or add it with 'instrument add'");
  }
  return *found;
}

Instrument add_instrument(Session& s, const std::string& code,
                          const std::optional<std::string>& name) {
  check_code(code, "instrument code");
  std::optional<std::string> clean_name;
  if (name) clean_name = checked_text(*name, "--name", 200);
  auto tx = s.write();
  if (store::find_instrument(s.db(), code)) {
    throw ValidationError(
        "instrument " + quote(code) + " is already registered",
        "instrument codes are unique; see 'curvewarden instrument show " + code + "'");
  }
  store::insert_instrument(tx, code, clean_name, s.at());
  tx.append_entry({"instrument.add", "instrument", code, std::nullopt, s.at()});
  tx.commit();
  return get_instrument(s, code);
}

std::vector<Instrument> list_instruments(Session& s) {
  store::ReadTransaction read(s.db());
  return store::list_instruments(s.db());
}

Instrument record_service(Session& s, const ServiceRequest& request) {
  const std::string reason = checked_reason(request.reason);
  auto tx = s.write();
  Instrument instrument = get_instrument(s, request.code);
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
  store::insert_service_event(tx, instrument.id, {request.direction, reason, at});
  tx.append_entry({request.direction == ServiceDirection::Out ? "instrument.service-out"
                                                              : "instrument.service-back",
                   "instrument", instrument.code, reason, at});
  tx.commit();
  return get_instrument(s, request.code);
}

// -------------------------------------------------------------------------------- methods

Method get_method(Session& s, const std::string& code) {
  auto found = store::find_method(s.db(), code);
  if (!found) {
    throw NotFoundError(
        "no method " + quote(code),
        "list them with 'curvewarden method list' or add one with 'method add FILE.toml'");
  }
  return *found;
}

MethodVersion add_method(Session& s, const std::string& file) {
  const import::MethodFile parsed = import::read_method_file(file);
  auto tx = s.write();
  if (auto existing = store::find_method(s.db(), parsed.definition.code)) {
    throw ValidationError(
        SourceLocation{file, std::nullopt, std::nullopt, "code"},
        "method " + quote(parsed.definition.code) + " already exists (version " +
            std::to_string(existing->latest().version) + ")",
        "register a new version with 'curvewarden method revise " + file + " --reason ...'");
  }
  const MethodId id = store::insert_method(tx, parsed.definition.code, s.at());
  MethodVersion v;
  v.method_id = id;
  v.version = 1;
  v.effective_at = s.at();
  v.definition = parsed.definition;
  v.source_name = parsed.file_name;
  v.source_text = parsed.text;
  v.source_sha256 = parsed.sha256;
  store::insert_method_version(tx, id, v);
  tx.append_entry({"method.add", "method", parsed.definition.code, std::nullopt, s.at()});
  tx.commit();
  return get_method(s, parsed.definition.code).latest();
}

MethodVersion revise_method(Session& s, const std::string& file, const std::string& reason_text) {
  const std::string reason = checked_reason(reason_text);
  const import::MethodFile parsed = import::read_method_file(file);
  auto tx = s.write();
  auto existing = store::find_method(s.db(), parsed.definition.code);
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
  store::insert_method_version(tx, existing->id, v);
  tx.append_entry({"method.revise", "method", existing->code, reason, s.at()});
  tx.commit();
  return get_method(s, existing->code).latest();
}

std::vector<Method> list_methods(Session& s) {
  store::ReadTransaction read(s.db());
  return store::list_methods(s.db());
}

// ----------------------------------------------------------------------------------- lots

CertifiedValue parse_certified_value(const std::string& text) {
  const std::string hint =
      "write ANALYTE=CONC or ANALYTE=CONC±U (also ANALYTE=CONC+/-U), e.g. nitrate=1000±5";
  const auto eq = text.find('=');
  if (eq == std::string::npos) throw UsageError("--value " + quote(text) + " has no '='", hint);
  CertifiedValue v;
  v.analyte = trim(text.substr(0, eq));
  check_analyte_name(v.analyte, "analyte in --value");
  std::string rest = trim(text.substr(eq + 1));
  std::string conc = rest, unc;
  for (const char* sep_text : {"\u00b1", "+/-", "+-"}) {
    const std::string sep = sep_text;
    if (auto at = rest.find(sep); at != std::string::npos) {
      conc = trim(rest.substr(0, at));
      unc = trim(rest.substr(at + sep.size()));
      if (unc.empty())
        throw UsageError("--value " + quote(text) + " has no uncertainty after " + quote(sep),
                         hint);
      break;
    }
  }
  auto value = parse_number(conc);
  if (!value)
    throw UsageError("--value " + quote(text) + ": " + quote(conc) + " is not a number", hint);
  if (*value <= 0)
    throw UsageError("--value " + quote(text) + ": the certified value must be above 0", hint);
  v.value = *value;
  if (!unc.empty()) {
    auto u = parse_number(unc);
    if (!u)
      throw UsageError(
          "--value " + quote(text) + ": uncertainty " + quote(unc) + " is not a number", hint);
    if (*u < 0)
      throw UsageError("--value " + quote(text) + ": the uncertainty cannot be negative", hint);
    v.uncertainty = *u;
  }
  return v;
}

Lot get_lot(Session& s, const std::string& code) {
  auto found = store::find_lot(s.db(), code);
  if (!found) {
    throw NotFoundError("no lot " + quote(code),
                        "list them with 'curvewarden lot list' or add it with 'lot add'");
  }
  return *found;
}

Lot add_lot(Session& s, const LotRequest& r) {
  check_code(r.code, "lot code");
  Lot lot;
  lot.code = r.code;
  lot.material = checked_text(r.material, "--material", 200);
  lot.expires_on = parse_date(r.expires, "--expires");
  if (r.opened) lot.opened_on = parse_date(*r.opened, "--opened");
  if (r.in_use_days) {
    if (*r.in_use_days <= 0) {
      throw UsageError("--in-use-days must be a whole number of days above 0, got " +
                       std::to_string(*r.in_use_days));
    }
    if (*r.in_use_days > 36500) throw UsageError("--in-use-days is implausibly large");
    if (!lot.opened_on) {
      throw UsageError("--in-use-days needs --opened DATE",
                       "the in-use period counts from the day the lot was opened");
    }
    lot.in_use_days = static_cast<int>(*r.in_use_days);
  }
  if (r.certificate) lot.certificate = checked_text(*r.certificate, "--certificate", 500);
  if (r.values.empty()) {
    throw UsageError("a lot needs at least one --value ANALYTE=CONC",
                     "e.g. --value nitrate=1000±5");
  }
  std::set<std::string> seen;
  for (const auto& text : r.values) {
    CertifiedValue v = parse_certified_value(text);
    if (!seen.insert(v.analyte).second)
      throw UsageError("--value names analyte " + quote(v.analyte) + " twice");
    lot.values.push_back(std::move(v));
  }
  lot.registered_at = s.at();
  auto tx = s.write();
  if (store::find_lot(s.db(), r.code)) {
    throw ValidationError("lot " + quote(r.code) + " is already registered",
                          "lot codes are unique; see 'curvewarden lot show " + r.code + "'");
  }
  store::insert_lot(tx, lot);
  tx.append_entry({"lot.add", "lot", lot.code, std::nullopt, s.at()});
  tx.commit();
  return get_lot(s, r.code);
}

std::vector<Lot> list_lots(Session& s) {
  store::ReadTransaction read(s.db());
  return store::list_lots(s.db());
}

Lot withdraw_lot(Session& s, const std::string& code, const std::string& reason_text) {
  const std::string reason = checked_reason(reason_text);
  auto tx = s.write();
  Lot lot = get_lot(s, code);
  if (lot.withdrawal) {
    throw ValidationError("lot " + quote(code) + " was already withdrawn on " +
                          s.zone().format_local(lot.withdrawal->occurred_at));
  }
  if (s.at() < lot.registered_at) {
    throw ValidationError("--at " + format_utc(s.at()) + " is before lot " + quote(code) +
                          " was registered (" + format_utc(lot.registered_at) + ")");
  }
  store::insert_lot_withdrawal(tx, lot.id, {reason, s.at()});
  tx.append_entry({"lot.withdraw", "lot", code, reason, s.at()});
  tx.commit();
  return get_lot(s, code);
}

}  // namespace cw::app
