// SPDX-License-Identifier: Apache-2.0
// SQL for lab settings, instruments, methods and lots.
#include "store/registry_repository.h"

#include "audit/sha256.h"
#include "core/error.h"
#include "store/codec.h"
#include "store/connection_impl.h"

namespace cw::store {
namespace {

std::vector<ServiceEvent> load_service(Connection::Impl& impl, InstrumentId id) {
  auto& s = impl.statement(
      "SELECT direction, reason, occurred_at FROM instrument_service_events "
      "WHERE instrument_id = :id ORDER BY occurred_at, id");
  bind_int(s, ":id", id.value);
  std::vector<ServiceEvent> out;
  while (s.executeStep()) {
    ServiceEvent e;
    e.direction =
        s.getColumn(0).getString() == "out" ? ServiceDirection::Out : ServiceDirection::Back;
    e.reason = s.getColumn(1).getString();
    e.occurred_at = instant_of(s.getColumn(2));
    out.push_back(std::move(e));
  }
  return out;
}

Instrument instrument_of(SQLite::Statement& s) {
  Instrument i;
  i.id = InstrumentId{s.getColumn("id").getInt64()};
  i.code = s.getColumn("code").getString();
  i.name = opt_text(s.getColumn("name"));
  i.registered_at = instant_of(s.getColumn("registered_at"));
  return i;
}

std::vector<MethodVersion> load_versions(Connection::Impl& impl, MethodId id) {
  auto& s = impl.statement(
      "SELECT id, version, effective_at, definition, source_name, source_text, source_sha256, "
      "reason FROM method_versions WHERE method_id = :id ORDER BY version");
  bind_int(s, ":id", id.value);
  std::vector<MethodVersion> out;
  while (s.executeStep()) {
    MethodVersion v;
    v.id = MethodVersionId{s.getColumn(0).getInt64()};
    v.method_id = id;
    v.version = s.getColumn(1).getInt();
    v.effective_at = instant_of(s.getColumn(2));
    v.definition = method_definition_from_json(nlohmann::json::parse(s.getColumn(3).getString()));
    v.source_name = s.getColumn(4).getString();
    v.source_text = s.getColumn(5).getString();
    v.source_sha256 = s.getColumn(6).getString();
    v.reason = opt_text(s.getColumn(7));
    out.push_back(std::move(v));
  }
  return out;
}

Method method_of(SQLite::Statement& s) {
  Method m;
  m.id = MethodId{s.getColumn("id").getInt64()};
  m.code = s.getColumn("code").getString();
  m.registered_at = instant_of(s.getColumn("registered_at"));
  return m;
}

Lot lot_of(SQLite::Statement& s) {
  Lot l;
  l.id = LotId{s.getColumn("id").getInt64()};
  l.code = s.getColumn("code").getString();
  l.material = s.getColumn("material").getString();
  l.expires_on = parse_date(s.getColumn("expires_on").getString());
  if (auto opened = opt_text(s.getColumn("opened_on"))) l.opened_on = parse_date(*opened);
  if (auto days = opt_int(s.getColumn("in_use_days"))) l.in_use_days = static_cast<int>(*days);
  l.certificate = opt_text(s.getColumn("certificate"));
  l.registered_at = instant_of(s.getColumn("registered_at"));
  return l;
}

void complete_lot(Connection::Impl& impl, Lot& lot) {
  auto& values = impl.statement(
      "SELECT analyte, value, uncertainty FROM lot_values WHERE lot_id = :id ORDER BY id");
  bind_int(values, ":id", lot.id.value);
  while (values.executeStep()) {
    lot.values.push_back({values.getColumn(0).getString(), values.getColumn(1).getDouble(),
                          opt_real(values.getColumn(2))});
  }
  auto& withdrawal =
      impl.statement("SELECT reason, occurred_at FROM lot_withdrawals WHERE lot_id = :id");
  bind_int(withdrawal, ":id", lot.id.value);
  if (withdrawal.executeStep()) {
    lot.withdrawal =
        LotWithdrawal{withdrawal.getColumn(0).getString(), instant_of(withdrawal.getColumn(1))};
  }
}

}  // namespace

std::optional<LabSettings> load_settings(Connection& c) {
  return guarded(c, [](Connection::Impl& impl) -> std::optional<LabSettings> {
    auto& s =
        impl.statement("SELECT lab_name, time_zone FROM lab_settings ORDER BY id DESC LIMIT 1");
    if (!s.executeStep()) return std::nullopt;
    return LabSettings{s.getColumn(0).getString(), s.getColumn(1).getString()};
  });
}

void insert_settings(WriteTransaction& tx, const LabSettings& settings) {
  guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO lab_settings (lab_name, time_zone, audit_seq) VALUES (:lab, :tz, :seq)");
    bind_text(s, ":lab", settings.lab_name);
    bind_text(s, ":tz", settings.time_zone);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    tx.add_row(FactTable::LabSettings, last_id(impl));
  });
}

std::optional<Instrument> find_instrument(Connection& c, const std::string& code) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Instrument> {
    auto& s = impl.statement("SELECT * FROM instruments WHERE code = :code");
    bind_text(s, ":code", code);
    if (!s.executeStep()) return std::nullopt;
    Instrument i = instrument_of(s);
    i.service = load_service(impl, i.id);
    return i;
  });
}

std::optional<Instrument> find_instrument(Connection& c, InstrumentId id) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Instrument> {
    auto& s = impl.statement("SELECT * FROM instruments WHERE id = :id");
    bind_int(s, ":id", id.value);
    if (!s.executeStep()) return std::nullopt;
    Instrument i = instrument_of(s);
    i.service = load_service(impl, i.id);
    return i;
  });
}

std::vector<Instrument> list_instruments(Connection& c) {
  return guarded(c, [&](Connection::Impl& impl) {
    std::vector<Instrument> out;
    {
      auto& s = impl.statement("SELECT * FROM instruments ORDER BY code");
      while (s.executeStep()) out.push_back(instrument_of(s));
    }
    for (auto& i : out) i.service = load_service(impl, i.id);
    return out;
  });
}

InstrumentId insert_instrument(WriteTransaction& tx, const std::string& code,
                               const std::optional<std::string>& name, Instant registered_at) {
  return guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO instruments (code, name, registered_at, audit_seq) "
        "VALUES (:code, :name, :at, :seq)");
    bind_text(s, ":code", code);
    bind_opt_text(s, ":name", name);
    bind_instant(s, ":at", registered_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    const auto id = last_id(impl);
    tx.add_row(FactTable::Instruments, id);
    return InstrumentId{id};
  });
}

void insert_service_event(WriteTransaction& tx, InstrumentId id, const ServiceEvent& e) {
  guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO instrument_service_events (instrument_id, direction, reason, occurred_at, "
        "audit_seq) VALUES (:instrument, :direction, :reason, :at, :seq)");
    bind_int(s, ":instrument", id.value);
    bind_text(s, ":direction", std::string(to_string(e.direction)));
    bind_text(s, ":reason", e.reason);
    bind_instant(s, ":at", e.occurred_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    tx.add_row(FactTable::InstrumentServiceEvents, last_id(impl));
  });
}

std::optional<Method> find_method(Connection& c, const std::string& code) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Method> {
    auto& s = impl.statement("SELECT * FROM methods WHERE code = :code");
    bind_text(s, ":code", code);
    if (!s.executeStep()) return std::nullopt;
    Method m = method_of(s);
    m.versions = load_versions(impl, m.id);
    return m;
  });
}

std::optional<Method> find_method(Connection& c, MethodId id) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Method> {
    auto& s = impl.statement("SELECT * FROM methods WHERE id = :id");
    bind_int(s, ":id", id.value);
    if (!s.executeStep()) return std::nullopt;
    Method m = method_of(s);
    m.versions = load_versions(impl, m.id);
    return m;
  });
}

std::vector<Method> list_methods(Connection& c) {
  return guarded(c, [&](Connection::Impl& impl) {
    std::vector<Method> out;
    {
      auto& s = impl.statement("SELECT * FROM methods ORDER BY code");
      while (s.executeStep()) out.push_back(method_of(s));
    }
    for (auto& m : out) m.versions = load_versions(impl, m.id);
    return out;
  });
}

std::optional<MethodVersion> find_method_version(Connection& c, MethodVersionId id) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<MethodVersion> {
    auto& s = impl.statement("SELECT method_id FROM method_versions WHERE id = :id");
    bind_int(s, ":id", id.value);
    if (!s.executeStep()) return std::nullopt;
    const MethodId method{s.getColumn(0).getInt64()};
    for (auto& v : load_versions(impl, method)) {
      if (v.id == id) return v;
    }
    return std::nullopt;
  });
}

MethodId insert_method(WriteTransaction& tx, const std::string& code, Instant registered_at) {
  return guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO methods (code, registered_at, audit_seq) VALUES (:code, :at, :seq)");
    bind_text(s, ":code", code);
    bind_instant(s, ":at", registered_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    const auto id = last_id(impl);
    tx.add_row(FactTable::Methods, id);
    return MethodId{id};
  });
}

MethodVersionId insert_method_version(WriteTransaction& tx, MethodId method,
                                      const MethodVersion& v) {
  return guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO method_versions (method_id, version, effective_at, title, unit, definition, "
        "source_name, source_text, source_sha256, reason, audit_seq) VALUES (:method, :version, "
        ":at, :title, :unit, :definition, :source_name, :source_text, :sha, :reason, :seq)");
    bind_int(s, ":method", method.value);
    bind_int(s, ":version", v.version);
    bind_instant(s, ":at", v.effective_at);
    bind_text(s, ":title", v.definition.title);
    bind_text(s, ":unit", v.definition.unit);
    bind_text(s, ":definition", method_definition_to_json(v.definition).dump());
    bind_text(s, ":source_name", v.source_name);
    bind_text(s, ":source_text", v.source_text);
    bind_text(s, ":sha", v.source_sha256);
    bind_opt_text(s, ":reason", v.reason);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    const auto id = last_id(impl);
    tx.add_row(FactTable::MethodVersions, id);
    return MethodVersionId{id};
  });
}

std::optional<Lot> find_lot(Connection& c, const std::string& code) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Lot> {
    std::optional<Lot> lot;
    {
      auto& s = impl.statement("SELECT * FROM lots WHERE code = :code");
      bind_text(s, ":code", code);
      if (!s.executeStep()) return std::nullopt;
      lot = lot_of(s);
    }
    complete_lot(impl, *lot);
    return lot;
  });
}

std::optional<Lot> find_lot(Connection& c, LotId id) {
  return guarded(c, [&](Connection::Impl& impl) -> std::optional<Lot> {
    std::optional<Lot> lot;
    {
      auto& s = impl.statement("SELECT * FROM lots WHERE id = :id");
      bind_int(s, ":id", id.value);
      if (!s.executeStep()) return std::nullopt;
      lot = lot_of(s);
    }
    complete_lot(impl, *lot);
    return lot;
  });
}

std::vector<Lot> list_lots(Connection& c) {
  return guarded(c, [&](Connection::Impl& impl) {
    std::vector<Lot> out;
    {
      auto& s = impl.statement("SELECT * FROM lots ORDER BY code");
      while (s.executeStep()) out.push_back(lot_of(s));
    }
    for (auto& l : out) complete_lot(impl, l);
    return out;
  });
}

LotId insert_lot(WriteTransaction& tx, const Lot& lot) {
  return guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO lots (code, material, expires_on, opened_on, in_use_days, certificate, "
        "registered_at, audit_seq) VALUES (:code, :material, :expires, :opened, :days, :cert, "
        ":at, :seq)");
    bind_text(s, ":code", lot.code);
    bind_text(s, ":material", lot.material);
    bind_text(s, ":expires", format_date(lot.expires_on));
    bind_opt_text(
        s, ":opened",
        lot.opened_on ? std::optional<std::string>(format_date(*lot.opened_on)) : std::nullopt);
    bind_opt_int(s, ":days",
                 lot.in_use_days ? std::optional<std::int64_t>(*lot.in_use_days) : std::nullopt);
    bind_opt_text(s, ":cert", lot.certificate);
    bind_instant(s, ":at", lot.registered_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    const LotId id{last_id(impl)};
    tx.add_row(FactTable::Lots, id.value);
    for (const auto& v : lot.values) {
      auto& value = impl.statement(
          "INSERT INTO lot_values (lot_id, analyte, value, uncertainty, audit_seq) "
          "VALUES (:lot, :analyte, :value, :u, :seq)");
      bind_int(value, ":lot", id.value);
      bind_text(value, ":analyte", v.analyte);
      bind_real(value, ":value", v.value);
      bind_opt_real(value, ":u", v.uncertainty);
      bind_int(value, ":seq", tx.seq());
      value.exec();
      tx.add_row(FactTable::LotValues, last_id(impl));
    }
    return id;
  });
}

void insert_lot_withdrawal(WriteTransaction& tx, LotId id, const LotWithdrawal& w) {
  guarded(tx.connection(), [&](Connection::Impl& impl) {
    auto& s = impl.statement(
        "INSERT INTO lot_withdrawals (lot_id, reason, occurred_at, audit_seq) "
        "VALUES (:lot, :reason, :at, :seq)");
    bind_int(s, ":lot", id.value);
    bind_text(s, ":reason", w.reason);
    bind_instant(s, ":at", w.occurred_at);
    bind_int(s, ":seq", tx.seq());
    s.exec();
    tx.add_row(FactTable::LotWithdrawals, last_id(impl));
  });
}

}  // namespace cw::store
