// SPDX-License-Identifier: Apache-2.0
// Use cases of the registries: the lab, instruments, methods and lots. Each write is one
// transaction ending with its audit entry.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "app/session.h"
#include "domain/instrument.h"
#include "domain/lot.h"
#include "domain/method.h"
#include "store/registry_repository.h"

namespace cw::app {

// ---- lab
struct InitRequest {
  std::optional<std::string> lab;
  std::optional<std::string> tz;
};
struct InitOutcome {
  bool created = false;  ///< the store file was created now
  bool changed = false;  ///< lab name or zone recorded now
  store::LabSettings settings;
  int schema_version = 0;
};
/// Checks the request before opening (so a bad zone writes nothing), then creates or updates.
InitOutcome init_store(const GlobalOptions& options, const InitRequest& request);

// ---- instruments
Instrument add_instrument(Session& s, const std::string& code,
                          const std::optional<std::string>& name);
std::vector<Instrument> list_instruments(Session& s);
Instrument get_instrument(Session& s, const std::string& code);
struct ServiceRequest {
  std::string code;
  ServiceDirection direction = ServiceDirection::Out;
  std::string reason;
};
Instrument record_service(Session& s, const ServiceRequest& request);

// ---- methods
MethodVersion add_method(Session& s, const std::string& file);
MethodVersion revise_method(Session& s, const std::string& file, const std::string& reason);
std::vector<Method> list_methods(Session& s);
Method get_method(Session& s, const std::string& code);

// ---- lots
struct LotRequest {
  std::string code;
  std::string material;
  std::string expires;
  std::optional<std::string> opened;
  std::optional<long> in_use_days;
  std::optional<std::string> certificate;
  std::vector<std::string> values;  ///< "ANALYTE=CONC[±U]"
};
Lot add_lot(Session& s, const LotRequest& request);
std::vector<Lot> list_lots(Session& s);
Lot get_lot(Session& s, const std::string& code);
Lot withdraw_lot(Session& s, const std::string& code, const std::string& reason);

/// Parses "ANALYTE=CONC", "ANALYTE=CONC±U" or "ANALYTE=CONC+/-U".
CertifiedValue parse_certified_value(const std::string& text);
/// A reason text given with --reason: trimmed, non-empty, UTF-8, one line.
std::string checked_reason(const std::string& reason, const std::string& option = "--reason");

}  // namespace cw::app
