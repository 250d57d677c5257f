// SPDX-License-Identifier: Apache-2.0
// The registries every curve refers to: the lab's settings, instruments, methods and lots; and
// the registered users.
// Reading and appending facts; a backend implements both (store/sqlite/).
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "domain/instrument.h"
#include "domain/lot.h"
#include "domain/method.h"
#include "domain/signature.h"
#include "domain/user.h"

namespace cw::store {

struct LabSettings {
  std::string lab_name;
  std::string time_zone;
};

/// The registries whose objects are named by a code.
enum class CodedRegistry { Instrument, Method, Lot };

class RegistryReader {
 public:
  virtual ~RegistryReader() = default;

  /// The latest settings, or nullopt before `init`.
  virtual std::optional<LabSettings> settings() = 0;
  /// How many facts other than lab settings the store holds (0 on a freshly initialised store).
  virtual std::int64_t facts_beyond_settings() = 0;

  /// With their service history and saved column mappings.
  virtual std::optional<Instrument> instrument(std::string_view code) = 0;
  virtual std::vector<Instrument> instruments() = 0;
  virtual std::vector<Instrument> instruments(const std::vector<InstrumentId>& ids) = 0;

  /// With every version.
  virtual std::optional<Method> method(std::string_view code) = 0;
  virtual std::vector<Method> methods() = 0;
  virtual std::vector<Method> methods(const std::vector<MethodId>& ids) = 0;

  /// With values and withdrawal.
  virtual std::optional<Lot> lot(std::string_view code) = 0;
  virtual std::vector<Lot> lots() = 0;
  virtual std::vector<Lot> lots(const std::vector<LotId>& ids) = 0;

  /// A registered code of `kind` that equals `code` but for ASCII case ("IC-01" for "ic-01"),
  /// nullopt when none does (codes are ASCII: core/text.h check_code).
  virtual std::optional<std::string> code_in_other_case(CodedRegistry kind,
                                                        std::string_view code) = 0;

  /// A user by canonical code, with every status event.
  virtual std::optional<User> user(std::string_view code) = 0;
  /// Every user, by code.
  virtual std::vector<User> users() = 0;
  /// The distinct names in the audit trail that are not users yet (stores written before users
  /// were registered recorded free-text names).
  virtual std::vector<std::string> unregistered_actors() = 0;
  /// The user's current passphrase hash (the latest set), nullopt when none was ever set.
  virtual std::optional<std::string> passphrase_hash(UserId user) = 0;
  /// Wrong passphrases in a row: failures after the user's last signature, passphrase change or
  /// status event (an admin's unlock).
  virtual int failed_signatures_in_a_row(UserId user) = 0;
  /// The signatures given to these entities (kind, id), oldest first.
  virtual std::vector<Signature> signatures_of(const std::string& entity_kind,
                                               const std::vector<std::string>& entity_ids) = 0;
};

/// Appends registry facts; every row joins the unit's current audit entry.
class RegistryWriter {
 public:
  virtual ~RegistryWriter() = default;
  virtual void add_settings(const LabSettings& s) = 0;
  virtual InstrumentId add_instrument(const std::string& code,
                                      const std::optional<std::string>& name,
                                      Instant registered_at) = 0;
  virtual void add_service_event(InstrumentId id, const ServiceEvent& e) = 0;
  virtual void add_saved_columns(InstrumentId id, const SavedColumns& c) = 0;
  virtual MethodId add_method(const std::string& code, Instant registered_at) = 0;
  virtual MethodVersionId add_method_version(MethodId method, const MethodVersion& v) = 0;
  virtual LotId add_lot(const Lot& lot) = 0;
  virtual void add_lot_withdrawal(LotId id, const LotWithdrawal& w) = 0;
  /// `code` canonical; the first event must follow.
  virtual UserId add_user(const std::string& code, const std::string& name,
                          Instant registered_at) = 0;
  virtual void add_user_event(UserId id, const UserEvent& e) = 0;
  virtual void add_passphrase(UserId id, const std::string& hash, Instant at) = 0;
  virtual void add_signature(const Signature& s) = 0;
  virtual void add_signature_failure(UserId id, const std::string& action, Instant at) = 0;
};

}  // namespace cw::store
