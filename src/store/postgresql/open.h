// SPDX-License-Identifier: Apache-2.0
// Opening a PostgreSQL store. No libpqxx types here.
#pragma once

#include <memory>
#include <string>

#include "store/store.h"

namespace cw::store::postgresql {

/// True when `location` is a libpq connection URI (postgresql:// or postgres://): the store is
/// on a PostgreSQL server. Anything else is the path of a SQLite file.
bool is_uri(const std::string& location);

/// `location` with any password replaced by "***", for messages.
std::string masked(const std::string& location);

/// Opens the PostgreSQL store at the URI `options.location`, applying pending migrations.
std::unique_ptr<Store> open_postgresql(const OpenOptions& options);

/// Makes sure open_postgresql can run: loads the backend's module in the binary (its errors as
/// open_postgresql's); nothing to do where the backend is linked in.
void require_postgresql();

/// The role the printed grants name: the role the workstations connect as (README, "Choosing a
/// backend"; the administrator renames it when the lab's role is called otherwise).
inline constexpr const char* kWorkstationRole = "curvewarden_app";

/// The statements a database administrator runs so that `role` may read and append to the store
/// in `schema` and nothing else: no UPDATE, DELETE or TRUNCATE on any fact table, the audit trail
/// or the migration record.
std::string grants_for(const std::string& role, const std::string& schema);

}  // namespace cw::store::postgresql
