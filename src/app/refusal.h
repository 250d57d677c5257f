// SPDX-License-Identifier: Apache-2.0
// Refusals are facts: recorded, with their typed reasons and audit entry, in the transaction
// that decided them, and then reported as RefusedError (exit 3).
#pragma once

#include <string>
#include <vector>

#include "domain/curve_state.h"
#include "store/store.h"

namespace cw::app {

/// Appends the refusal and its `<action>-refused` entry to `unit`, commits, and throws
/// RefusedError with `message` and `hint`.
[[noreturn]] void refuse(store::WriteUnit& unit, const std::string& action,
                         const std::string& entity_kind, const std::string& entity_id,
                         const std::vector<Reason>& reasons, const std::string& message, Instant at,
                         const std::string& hint = {});

}  // namespace cw::app
