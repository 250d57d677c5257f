// SPDX-License-Identifier: Apache-2.0
// Recording a refusal.
#include "app/refusal.h"

#include "core/error.h"

namespace cw::app {

void refuse(store::WriteUnit& unit, const std::string& action, const std::string& entity_kind,
            const std::string& entity_id, const std::vector<Reason>& reasons,
            const std::string& message, Instant at, const std::string& hint) {
  unit.curve_writer().add_refusal({action, entity_kind, entity_id, reasons, message, at});
  unit.append_entry({action + "-refused", entity_kind, entity_id, message, at});
  unit.commit();
  throw RefusedError(message, hint);
}

}  // namespace cw::app
