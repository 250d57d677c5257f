// SPDX-License-Identifier: Apache-2.0
// Use cases of the registries: the lab, instruments, methods and lots. Each write is one
// transaction that checks, appends and ends with its audit entry.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "app/session.h"
#include "domain/instrument.h"
#include "domain/lot.h"
#include "domain/method.h"
#include "domain/user.h"
#include "store/registry.h"

namespace cw::app {

// ---- lookups shared by the use cases (NotFoundError naming the code)
Instrument get_instrument(store::ReadUnit& unit, const std::string& code);
Method get_method(store::ReadUnit& unit, const std::string& code);
Lot get_lot(store::ReadUnit& unit, const std::string& code);

// ---- lab
struct InitRequest {
  std::optional<std::string> lab;
  std::optional<LabZone> zone;
  std::optional<std::string> reason;  ///< required to rename an existing lab
  /// The first admin's full name (the acting user's code is the admin's code); default: the code.
  std::optional<std::string> admin_name;
};
struct InitOutcome {
  bool created = false;                  ///< the store was created now
  bool changed = false;                  ///< lab name or zone recorded now
  std::optional<User> admin_registered;  ///< the first admin, when registered or enabled now
  std::string lab_key;                   ///< the lab key file (anchors)
  bool lab_key_created = false;          ///< created now
  store::LabSettings settings;
  int schema_version = 0;
  /// On a server store: the GRANT/REVOKE statements that leave the workstations' role only
  /// reading and appending; empty for a file.
  std::string grants;
};
/// Creates the store or applies pending migrations, and records the lab's name and zone. The
/// zone of a store that holds any fact besides its settings cannot change (refused and recorded);
/// renaming the lab needs a reason and is an audited event. When the store has no enabled admin
/// (a new store, or one whose users were all registered from an earlier trail), the acting user
/// becomes its first admin; otherwise the acting user must be registered and enabled, and only an
/// admin may rename the lab.
InitOutcome init_store(Session& s, const InitRequest& request);

// ---- instruments
Instrument add_instrument(Session& s, const std::string& code,
                          const std::optional<std::string>& name);
std::vector<Instrument> list_instruments(Session& s);
Instrument show_instrument(Session& s, const std::string& code);
struct ServiceRequest {
  std::string code;
  ServiceDirection direction = ServiceDirection::Out;
  std::string reason;
};
Instrument record_service(Session& s, const ServiceRequest& request);
/// Saves the headers an instrument's exports use (an audited fact), used for its run and points
/// files when no --columns is given; an empty mapping clears the saved one.
Instrument save_instrument_columns(Session& s, const std::string& code,
                                   const ColumnMapping& columns,
                                   const std::optional<std::string>& reason);

// ---- methods
MethodVersion add_method(Session& s, const std::string& file);
MethodVersion revise_method(Session& s, const std::string& file, const std::string& reason);
std::vector<Method> list_methods(Session& s);
Method show_method(Session& s, const std::string& code);

// ---- lots
/// A lot as given (values parsed and checked at the boundary); registered_at is set here.
Lot add_lot(Session& s, Lot lot);
std::vector<Lot> list_lots(Session& s);
Lot show_lot(Session& s, const std::string& code);
Lot withdraw_lot(Session& s, const std::string& code, const std::string& reason);

}  // namespace cw::app
