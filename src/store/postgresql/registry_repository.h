// SPDX-License-Identifier: Apache-2.0
// Internal to the PostgreSQL backend: lab settings, instruments, methods and lots.
#pragma once

#include "store/postgresql/audit_repository.h"
#include "store/postgresql/database.h"
#include "store/registry.h"

namespace cw::store::postgresql {

class PgRegistry final : public RegistryReader, public RegistryWriter {
 public:
  /// `w` is the write state of a write unit, nullptr in a read unit.
  PgRegistry(Database& db, WriteState* w) : db_(db), w_(w) {}

  std::optional<LabSettings> settings() override;
  std::int64_t facts_beyond_settings() override;
  std::optional<Instrument> instrument(std::string_view code) override;
  std::vector<Instrument> instruments() override;
  std::vector<Instrument> instruments(const std::vector<InstrumentId>& ids) override;
  std::optional<Method> method(std::string_view code) override;
  std::vector<Method> methods() override;
  std::vector<Method> methods(const std::vector<MethodId>& ids) override;
  std::optional<Lot> lot(std::string_view code) override;
  std::optional<std::string> code_in_other_case(CodedRegistry kind, std::string_view code) override;
  std::vector<Lot> lots() override;
  std::vector<Lot> lots(const std::vector<LotId>& ids) override;
  std::optional<User> user(std::string_view code) override;
  std::vector<User> users() override;
  std::vector<std::string> unregistered_actors() override;
  std::optional<std::string> passphrase_hash(UserId user) override;
  int failed_signatures_in_a_row(UserId user) override;
  std::vector<Signature> signatures_of(const std::string& entity_kind,
                                       const std::vector<std::string>& entity_ids) override;

  void add_settings(const LabSettings& s) override;
  InstrumentId add_instrument(const std::string& code, const std::optional<std::string>& name,
                              Instant registered_at) override;
  void add_service_event(InstrumentId id, const ServiceEvent& e) override;
  void add_saved_columns(InstrumentId id, const SavedColumns& c) override;
  MethodId add_method(const std::string& code, Instant registered_at) override;
  MethodVersionId add_method_version(MethodId method, const MethodVersion& v) override;
  LotId add_lot(const Lot& lot) override;
  void add_lot_withdrawal(LotId id, const LotWithdrawal& w) override;
  UserId add_user(const std::string& code, const std::string& name, Instant registered_at) override;
  void add_user_event(UserId id, const UserEvent& e) override;
  void add_passphrase(UserId id, const std::string& hash, Instant at) override;
  void add_signature(const Signature& s) override;
  void add_signature_failure(UserId id, const std::string& action, Instant at) override;

 private:
  WriteState& writing();
  std::vector<Instrument> complete(std::vector<Instrument> list);
  std::vector<Method> complete(std::vector<Method> list);
  std::vector<Lot> complete(std::vector<Lot> list);
  std::vector<User> complete(std::vector<User> list);

  Database& db_;
  WriteState* w_;
};

}  // namespace cw::store::postgresql
