// SPDX-License-Identifier: Apache-2.0
// The entry points of curvewarden-postgresql.so (module.h). Everything else in the module is
// hidden: it carries its own copy of the backend and of what the backend uses.
#include "store/postgresql/module.h"

#include "core/module_loader.h"
#include "store/postgresql/open.h"

extern "C" {

__attribute__((visibility("default"))) const char* cw_module_abi() {
  return cw::module_abi();
}

__attribute__((visibility("default"))) cw::store::Store* cw_postgresql_open(
    const cw::store::OpenOptions& options) {
  return cw::store::postgresql::open_postgresql(options).release();
}

}  // extern "C"
