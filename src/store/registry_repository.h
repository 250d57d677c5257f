// SPDX-License-Identifier: Apache-2.0
// Lab settings, instruments, methods and lots: the registries every curve refers to.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "domain/instrument.h"
#include "domain/lot.h"
#include "domain/method.h"
#include "store/connection.h"

namespace cw::store {

struct LabSettings {
  std::string lab_name;
  std::string time_zone;
};

std::optional<LabSettings> load_settings(Connection& c);
void insert_settings(WriteTransaction& tx, const LabSettings& s);

// Instruments
std::optional<Instrument> find_instrument(Connection& c, const std::string& code);
std::optional<Instrument> find_instrument(Connection& c, InstrumentId id);
std::vector<Instrument> list_instruments(Connection& c);
InstrumentId insert_instrument(WriteTransaction& tx, const std::string& code,
                               const std::optional<std::string>& name, Instant registered_at);
void insert_service_event(WriteTransaction& tx, InstrumentId id, const ServiceEvent& e);

// Methods
std::optional<Method> find_method(Connection& c, const std::string& code);
std::optional<Method> find_method(Connection& c, MethodId id);
std::vector<Method> list_methods(Connection& c);
/// The method version with this id, with its method's code in definition.code.
std::optional<MethodVersion> find_method_version(Connection& c, MethodVersionId id);
MethodId insert_method(WriteTransaction& tx, const std::string& code, Instant registered_at);
MethodVersionId insert_method_version(WriteTransaction& tx, MethodId method,
                                      const MethodVersion& v);

// Lots
std::optional<Lot> find_lot(Connection& c, const std::string& code);
std::optional<Lot> find_lot(Connection& c, LotId id);
std::vector<Lot> list_lots(Connection& c);
LotId insert_lot(WriteTransaction& tx, const Lot& lot);
void insert_lot_withdrawal(WriteTransaction& tx, LotId id, const LotWithdrawal& w);

}  // namespace cw::store
