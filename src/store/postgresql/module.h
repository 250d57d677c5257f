// SPDX-License-Identifier: Apache-2.0
// The PostgreSQL backend as a module (core/module_loader.h): the binary opens the backend from
// curvewarden-postgresql.so only when a store is a PostgreSQL URI (loader.cpp); the test
// programs link the backend directly (pg_store.cpp), through the same open.h.
#pragma once

#include "store/store.h"

namespace cw::store::postgresql {

inline constexpr const char* kModuleFile = "curvewarden-postgresql.so";

/// The module's entry point: opens the store the options name; the caller owns the result
/// (throws the typed errors).
inline constexpr const char* kOpenSymbol = "cw_postgresql_open";
using OpenFunction = Store* (*)(const OpenOptions&);

}  // namespace cw::store::postgresql
