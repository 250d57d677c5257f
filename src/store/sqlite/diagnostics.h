// SPDX-License-Identifier: Apache-2.0
// For tests and benchmarks of the SQLite backend: the query plan of a statement of sql.h, run
// with EXPLAIN QUERY PLAN on the same text the repositories execute.
#pragma once

#include <string>

#include "store/store.h"

namespace cw::store::sqlite {

/// The plan lines ("SEARCH curves USING INDEX ...") of `sql` on `store` (a SQLite store).
std::string query_plan(Store& store, const char* sql);

}  // namespace cw::store::sqlite
