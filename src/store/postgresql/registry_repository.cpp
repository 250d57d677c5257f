// SPDX-License-Identifier: Apache-2.0
// SQL for lab settings, instruments, methods and lots.
#include "store/postgresql/registry_repository.h"

#include <map>
#include <stdexcept>

#include "store/postgresql/bind.h"
#include "store/postgresql/sql.h"

namespace cw::store::postgresql {
namespace {

Instrument instrument_of(Statement& s, const std::string& path) {
  Instrument i;
  i.id = InstrumentId{s.getColumn(0).getInt64()};
  i.code = s.getColumn(1).getString();
  i.name = opt_text(s.getColumn(2));
  i.registered_at = stored_instant(s.getColumn(3).getString(), "instruments.registered_at", path);
  return i;
}

Method method_of(Statement& s, const std::string& path) {
  Method m;
  m.id = MethodId{s.getColumn(0).getInt64()};
  m.code = s.getColumn(1).getString();
  m.registered_at = stored_instant(s.getColumn(2).getString(), "methods.registered_at", path);
  return m;
}

Lot lot_of(Statement& s, const std::string& path) {
  Lot l;
  l.id = LotId{s.getColumn(0).getInt64()};
  l.code = s.getColumn(1).getString();
  l.material = s.getColumn(2).getString();
  l.expires_on = stored_date(s.getColumn(3).getString(), "lots.expires_on", path);
  if (auto opened = opt_text(s.getColumn(4))) {
    l.opened_on = stored_date(*opened, "lots.opened_on", path);
  }
  if (auto days = opt_int(s.getColumn(5))) l.in_use_days = static_cast<int>(*days);
  l.certificate = opt_text(s.getColumn(6));
  l.registered_at = stored_instant(s.getColumn(7).getString(), "lots.registered_at", path);
  l.coverage_factor = opt_real(s.getColumn(8));
  return l;
}

template <class T, class Read>
std::vector<T> all_rows(Statement& s, Read read) {
  std::vector<T> out;
  while (s.executeStep()) out.push_back(read(s));
  s.reset();
  return out;
}

template <class T>
auto ids_of(const std::vector<T>& list) {
  std::vector<decltype(list.front().id)> ids;
  for (const auto& x : list) ids.push_back(x.id);
  return ids;
}

}  // namespace

WriteState& PgRegistry::writing() {
  if (w_ == nullptr) throw std::logic_error("a fact was appended through a read unit");
  return *w_;
}

std::optional<LabSettings> PgRegistry::settings() {
  return guarded(db_, [&]() -> std::optional<LabSettings> {
    auto& s = db_.statement(sql::kSettingsLatest);
    if (!s.executeStep()) return std::nullopt;
    LabSettings out{s.getColumn(0).getString(), s.getColumn(1).getString()};
    s.reset();
    return out;
  });
}

std::int64_t PgRegistry::facts_beyond_settings() {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kFactsBeyondSettings);
    s.executeStep();
    const std::int64_t n = s.getColumn(0).getInt64();
    s.reset();
    return n;
  });
}

std::vector<Instrument> PgRegistry::complete(std::vector<Instrument> list) {
  if (list.empty()) return list;
  std::map<InstrumentId, Instrument*> by_id;
  for (auto& i : list) by_id[i.id] = &i;
  auto& s = db_.statement(sql::kServiceEventsOf);
  bind_ids(s, ":ids", ids_of(list));
  while (s.executeStep()) {
    ServiceEvent e;
    e.direction = stored_enum(parse_service_direction, s.getColumn(1).getString(),
                              "instrument_service_events.direction", db_.path);
    e.reason = s.getColumn(2).getString();
    e.occurred_at = stored_instant(s.getColumn(3).getString(),
                                   "instrument_service_events.occurred_at", db_.path);
    by_id.at(InstrumentId{s.getColumn(0).getInt64()})->service.push_back(std::move(e));
  }
  s.reset();
  auto& c = db_.statement(sql::kColumnMapsOf);
  bind_ids(c, ":ids", ids_of(list));
  while (c.executeStep()) {
    SavedColumns saved;
    saved.columns = column_mapping_from_json(
        parse_stored_json(c.getColumn(1).getString(), "instrument_column_maps.columns", db_.path),
        "instrument_column_maps.columns", db_.path);
    saved.reason = opt_text(c.getColumn(2));
    saved.saved_by = c.getColumn(3).getString();
    saved.occurred_at =
        stored_instant(c.getColumn(4).getString(), "instrument_column_maps.occurred_at", db_.path);
    by_id.at(InstrumentId{c.getColumn(0).getInt64()})->columns.push_back(std::move(saved));
  }
  c.reset();
  return list;
}

std::optional<Instrument> PgRegistry::instrument(std::string_view code) {
  return guarded(db_, [&]() -> std::optional<Instrument> {
    auto& s = db_.statement(sql::kInstrumentByCode);
    bind_text(s, ":code", std::string(code));
    auto list = all_rows<Instrument>(s, [&](auto& st) { return instrument_of(st, db_.path); });
    if (list.empty()) return std::nullopt;
    return complete(std::move(list)).front();
  });
}

std::vector<Instrument> PgRegistry::instruments() {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInstrumentsAll);
    return complete(all_rows<Instrument>(s, [&](auto& st) { return instrument_of(st, db_.path); }));
  });
}

std::vector<Instrument> PgRegistry::instruments(const std::vector<InstrumentId>& ids) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInstrumentsByIds);
    bind_ids(s, ":ids", ids);
    return complete(all_rows<Instrument>(s, [&](auto& st) { return instrument_of(st, db_.path); }));
  });
}

std::vector<Method> PgRegistry::complete(std::vector<Method> list) {
  if (list.empty()) return list;
  std::map<MethodId, Method*> by_id;
  for (auto& m : list) by_id[m.id] = &m;
  auto& s = db_.statement(sql::kVersionsOf);
  bind_ids(s, ":ids", ids_of(list));
  while (s.executeStep()) {
    MethodVersion v;
    v.id = MethodVersionId{s.getColumn(0).getInt64()};
    v.method_id = MethodId{s.getColumn(1).getInt64()};
    v.version = s.getColumn(2).getInt();
    v.effective_at =
        stored_instant(s.getColumn(3).getString(), "method_versions.effective_at", db_.path);
    try {
      v.definition = method_definition_from_json(
          parse_stored_json(s.getColumn(4).getString(), "method_versions.definition", db_.path));
    } catch (const nlohmann::json::exception&) {
      damaged(db_.path, "method_versions.definition of version id " + std::to_string(v.id.value) +
                            " does not hold a method definition");
    }
    v.source_name = s.getColumn(5).getString();
    v.source_text = s.getColumn(6).getString();
    v.source_sha256 = s.getColumn(7).getString();
    v.reason = opt_text(s.getColumn(8));
    by_id.at(v.method_id)->versions.push_back(std::move(v));
  }
  s.reset();
  for (const auto& m : list) {
    if (m.versions.empty()) damaged(db_.path, "method " + m.code + " has no version");
  }
  return list;
}

std::optional<Method> PgRegistry::method(std::string_view code) {
  return guarded(db_, [&]() -> std::optional<Method> {
    auto& s = db_.statement(sql::kMethodByCode);
    bind_text(s, ":code", std::string(code));
    auto list = all_rows<Method>(s, [&](auto& st) { return method_of(st, db_.path); });
    if (list.empty()) return std::nullopt;
    return complete(std::move(list)).front();
  });
}

std::vector<Method> PgRegistry::methods() {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kMethodsAll);
    return complete(all_rows<Method>(s, [&](auto& st) { return method_of(st, db_.path); }));
  });
}

std::vector<Method> PgRegistry::methods(const std::vector<MethodId>& ids) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kMethodsByIds);
    bind_ids(s, ":ids", ids);
    return complete(all_rows<Method>(s, [&](auto& st) { return method_of(st, db_.path); }));
  });
}

std::vector<Lot> PgRegistry::complete(std::vector<Lot> list) {
  if (list.empty()) return list;
  std::map<LotId, Lot*> by_id;
  for (auto& l : list) by_id[l.id] = &l;
  {
    auto& s = db_.statement(sql::kLotValuesOf);
    bind_ids(s, ":ids", ids_of(list));
    while (s.executeStep()) {
      by_id.at(LotId{s.getColumn(0).getInt64()})
          ->values.push_back(
              {s.getColumn(1).getString(), s.getColumn(2).getDouble(), opt_real(s.getColumn(3))});
    }
    s.reset();
  }
  auto& s = db_.statement(sql::kLotWithdrawalsOf);
  bind_ids(s, ":ids", ids_of(list));
  while (s.executeStep()) {
    by_id.at(LotId{s.getColumn(0).getInt64()})->withdrawal = LotWithdrawal{
        s.getColumn(1).getString(),
        stored_instant(s.getColumn(2).getString(), "lot_withdrawals.occurred_at", db_.path)};
  }
  s.reset();
  return list;
}

std::optional<std::string> PgRegistry::code_in_other_case(CodedRegistry kind,
                                                          std::string_view code) {
  const char* text = kind == CodedRegistry::Instrument ? sql::kInstrumentCodeInOtherCase
                     : kind == CodedRegistry::Method   ? sql::kMethodCodeInOtherCase
                                                       : sql::kLotCodeInOtherCase;
  return guarded(db_, [&]() -> std::optional<std::string> {
    auto& s = db_.statement(text);
    bind_text(s, ":code", std::string(code));
    if (!s.executeStep()) return std::nullopt;
    std::string found = s.getColumn(0).getString();
    s.reset();
    return found;
  });
}

std::optional<Lot> PgRegistry::lot(std::string_view code) {
  return guarded(db_, [&]() -> std::optional<Lot> {
    auto& s = db_.statement(sql::kLotByCode);
    bind_text(s, ":code", std::string(code));
    auto list = all_rows<Lot>(s, [&](auto& st) { return lot_of(st, db_.path); });
    if (list.empty()) return std::nullopt;
    return complete(std::move(list)).front();
  });
}

std::vector<Lot> PgRegistry::lots() {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kLotsAll);
    return complete(all_rows<Lot>(s, [&](auto& st) { return lot_of(st, db_.path); }));
  });
}

std::vector<Lot> PgRegistry::lots(const std::vector<LotId>& ids) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kLotsByIds);
    bind_ids(s, ":ids", ids);
    return complete(all_rows<Lot>(s, [&](auto& st) { return lot_of(st, db_.path); }));
  });
}

void PgRegistry::add_settings(const LabSettings& settings) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertSettings);
    bind_text(s, ":lab", settings.lab_name);
    bind_text(s, ":tz", settings.time_zone);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::LabSettings, db_.last_insert_id());
  });
}

InstrumentId PgRegistry::add_instrument(const std::string& code,
                                        const std::optional<std::string>& name,
                                        Instant registered_at) {
  WriteState& w = writing();
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertInstrument);
    bind_text(s, ":code", code);
    bind_opt_text(s, ":name", name);
    bind_instant(s, ":at", registered_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    const InstrumentId id{db_.last_insert_id()};
    w.add_row(FactTable::Instruments, id.value);
    return id;
  });
}

void PgRegistry::add_service_event(InstrumentId id, const ServiceEvent& e) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertServiceEvent);
    bind_int(s, ":instrument", id.value);
    bind_text(s, ":direction", std::string(to_string(e.direction)));
    bind_text(s, ":reason", e.reason);
    bind_instant(s, ":at", e.occurred_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::InstrumentServiceEvents, db_.last_insert_id());
  });
}

void PgRegistry::add_saved_columns(InstrumentId id, const SavedColumns& c) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertColumnMap);
    bind_int(s, ":instrument", id.value);
    bind_text(s, ":columns", column_mapping_to_json(c.columns).dump());
    bind_opt_text(s, ":reason", c.reason);
    bind_text(s, ":by", c.saved_by);
    bind_instant(s, ":at", c.occurred_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::InstrumentColumnMaps, db_.last_insert_id());
  });
}

MethodId PgRegistry::add_method(const std::string& code, Instant registered_at) {
  WriteState& w = writing();
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertMethod);
    bind_text(s, ":code", code);
    bind_instant(s, ":at", registered_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    const MethodId id{db_.last_insert_id()};
    w.add_row(FactTable::Methods, id.value);
    return id;
  });
}

MethodVersionId PgRegistry::add_method_version(MethodId method, const MethodVersion& v) {
  WriteState& w = writing();
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertMethodVersion);
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
    bind_int(s, ":seq", w.seq);
    s.exec();
    const MethodVersionId id{db_.last_insert_id()};
    w.add_row(FactTable::MethodVersions, id.value);
    return id;
  });
}

LotId PgRegistry::add_lot(const Lot& lot) {
  WriteState& w = writing();
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertLot);
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
    bind_int(s, ":seq", w.seq);
    bind_opt_real(s, ":k", lot.coverage_factor);
    s.exec();
    const LotId id{db_.last_insert_id()};
    w.add_row(FactTable::Lots, id.value);
    for (const auto& v : lot.values) {
      auto& value = db_.statement(sql::kInsertLotValue);
      bind_int(value, ":lot", id.value);
      bind_text(value, ":analyte", v.analyte);
      bind_real(value, ":value", v.value);
      bind_opt_real(value, ":u", v.uncertainty);
      bind_int(value, ":seq", w.seq);
      value.exec();
      w.add_row(FactTable::LotValues, db_.last_insert_id());
    }
    return id;
  });
}

void PgRegistry::add_lot_withdrawal(LotId id, const LotWithdrawal& wd) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertLotWithdrawal);
    bind_int(s, ":lot", id.value);
    bind_text(s, ":reason", wd.reason);
    bind_instant(s, ":at", wd.occurred_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::LotWithdrawals, db_.last_insert_id());
  });
}

}  // namespace cw::store::postgresql

namespace cw::store::postgresql {

std::vector<User> PgRegistry::complete(std::vector<User> list) {
  if (list.empty()) return list;
  std::map<UserId, User*> by_id;
  for (auto& u : list) by_id[u.id] = &u;
  auto& s = db_.statement(sql::kUserEventsOf);
  bind_ids(s, ":ids", ids_of(list));
  while (s.executeStep()) {
    UserEvent e;
    e.status =
        stored_enum(parse_user_status, s.getColumn(1).getString(), "user_events.status", db_.path);
    e.role = stored_enum(parse_role, s.getColumn(2).getString(), "user_events.role", db_.path);
    e.reason = s.getColumn(3).getString();
    e.by = s.getColumn(4).getString();
    e.occurred_at = stored_instant(s.getColumn(5).getString(), "user_events.occurred_at", db_.path);
    by_id.at(UserId{s.getColumn(0).getInt64()})->events.push_back(std::move(e));
  }
  s.reset();
  for (const auto& u : list) {
    if (u.events.empty()) damaged(db_.path, "user " + u.code + " has no status event");
  }
  return list;
}

namespace {
User user_of(Statement& s, const std::string& path) {
  User u;
  u.id = UserId{s.getColumn(0).getInt64()};
  u.code = s.getColumn(1).getString();
  u.name = s.getColumn(2).getString();
  u.registered_at = stored_instant(s.getColumn(3).getString(), "users.registered_at", path);
  return u;
}
}  // namespace

std::optional<User> PgRegistry::user(std::string_view code) {
  return guarded(db_, [&]() -> std::optional<User> {
    auto& s = db_.statement(sql::kUserByCode);
    bind_text(s, ":code", std::string(code));
    auto list = complete(all_rows<User>(s, [&](auto& st) { return user_of(st, db_.path); }));
    if (list.empty()) return std::nullopt;
    return list.front();
  });
}

std::vector<User> PgRegistry::users() {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kUsersAll);
    return complete(all_rows<User>(s, [&](auto& st) { return user_of(st, db_.path); }));
  });
}

std::vector<std::string> PgRegistry::unregistered_actors() {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kUnregisteredActors);
    return all_rows<std::string>(s, [](auto& st) { return st.getColumn(0).getString(); });
  });
}

UserId PgRegistry::add_user(const std::string& code, const std::string& name,
                            Instant registered_at) {
  WriteState& w = writing();
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertUser);
    bind_text(s, ":code", code);
    bind_text(s, ":name", name);
    bind_instant(s, ":at", registered_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    const UserId id{db_.last_insert_id()};
    w.add_row(FactTable::Users, id.value);
    return id;
  });
}

void PgRegistry::add_user_event(UserId id, const UserEvent& e) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertUserEvent);
    bind_int(s, ":user", id.value);
    bind_text(s, ":status", std::string(to_string(e.status)));
    bind_text(s, ":role", std::string(to_string(e.role)));
    bind_text(s, ":reason", e.reason);
    bind_text(s, ":by", e.by);
    bind_instant(s, ":at", e.occurred_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::UserEvents, db_.last_insert_id());
  });
}

std::optional<std::string> PgRegistry::passphrase_hash(UserId user) {
  return guarded(db_, [&]() -> std::optional<std::string> {
    auto& s = db_.statement(sql::kPassphraseOf);
    bind_int(s, ":user", user.value);
    std::optional<std::string> out;
    if (s.executeStep()) out = s.getColumn(0).getString();
    s.reset();
    return out;
  });
}

int PgRegistry::failed_signatures_in_a_row(UserId user) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kFailedSignaturesInARow);
    bind_int(s, ":user", user.value);
    s.executeStep();
    const int n = s.getColumn(0).getInt();
    s.reset();
    return n;
  });
}

std::vector<Signature> PgRegistry::signatures_of(const std::string& entity_kind,
                                                 const std::vector<std::string>& entity_ids) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kSignaturesOf);
    bind_text(s, ":kind", entity_kind);
    bind_texts(s, ":ids", entity_ids);
    return all_rows<Signature>(s, [&](auto& st) {
      Signature g;
      g.user = UserId{st.getColumn(0).getInt64()};
      g.code = st.getColumn(1).getString();
      g.name = st.getColumn(2).getString();
      g.meaning = st.getColumn(3).getString();
      g.entity_kind = st.getColumn(4).getString();
      g.entity_id = st.getColumn(5).getString();
      g.signed_at = stored_instant(st.getColumn(6).getString(), "signatures.signed_at", db_.path);
      return g;
    });
  });
}

void PgRegistry::add_passphrase(UserId id, const std::string& hash, Instant at) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertPassphrase);
    bind_int(s, ":user", id.value);
    bind_text(s, ":hash", hash);
    bind_instant(s, ":at", at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::UserPassphrases, db_.last_insert_id());
  });
}

void PgRegistry::add_signature(const Signature& g) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertSignature);
    bind_int(s, ":user", g.user.value);
    bind_text(s, ":name", g.name);
    bind_text(s, ":meaning", g.meaning);
    bind_text(s, ":kind", g.entity_kind);
    bind_text(s, ":id", g.entity_id);
    bind_instant(s, ":at", g.signed_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::Signatures, db_.last_insert_id());
  });
}

void PgRegistry::add_signature_failure(UserId id, const std::string& action, Instant at) {
  WriteState& w = writing();
  guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertSignatureFailure);
    bind_int(s, ":user", id.value);
    bind_text(s, ":action", action);
    bind_instant(s, ":at", at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::SignatureFailures, db_.last_insert_id());
  });
}

}  // namespace cw::store::postgresql
