// SPDX-License-Identifier: Apache-2.0
// The registries every curve refers to: the lab's settings, instruments, methods and lots.
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

namespace cw::store {

struct LabSettings {
  std::string lab_name;
  std::string time_zone;
};

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
};

}  // namespace cw::store
