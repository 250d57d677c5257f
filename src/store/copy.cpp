// SPDX-License-Identifier: Apache-2.0
// The tables a copy carries (store/copy.h).
#include "store/copy.h"

#include <array>

namespace cw::store {
namespace {

using T = ColumnType;

// The audit trail's columns (schema/current.sql), kept equal to the migrated schema by a store
// test. os_login was added by a later migration.
constexpr Column kAuditLog[] = {{"seq", T::Integer},
                                {"recorded_at", T::Instant},
                                {"occurred_at", T::Instant},
                                {"actor", T::Text},
                                {"action", T::Text},
                                {"entity_kind", T::Text},
                                {"entity_id", T::Text},
                                {"reason", T::Text, true},
                                {"clock_overridden", T::Boolean},
                                {"tool_version", T::Text},
                                {"payload", T::Text},
                                {"prev_hash", T::Text},
                                {"hash", T::Text},
                                {"os_login", T::Text, true, true}};

std::array<CopyTable, 1 + kAllFactTables.size()> make_tables() {
  std::array<CopyTable, 1 + kAllFactTables.size()> tables{};
  tables[0] = {"audit_log", kAuditLog};
  for (std::size_t i = 0; i < kAllFactTables.size(); ++i) {
    const TableForm& form = form_of(kAllFactTables[i]);
    tables[i + 1] = {form.name, form.columns};
  }
  return tables;
}

}  // namespace

std::span<const CopyTable> copy_tables() {
  static const auto tables = make_tables();
  return tables;
}

}  // namespace cw::store
