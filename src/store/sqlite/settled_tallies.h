// SPDX-License-Identifier: Apache-2.0
// Internal to the SQLite backend: the derived tally steps of settled curves (migration 0009,
// domain/settled_state.h), appended with the facts that cause them, built for a whole store and
// compared with the facts.
#pragma once

#include <cstdint>
#include <optional>
#include <string>

#include "core/clock.h"
#include "domain/ids.h"
#include "domain/settled_state.h"
#include "store/sqlite/database.h"
#include "store/sqlite/settled_scan.h"

namespace cw::store::sqlite {

/// What the store holds about one curve's settled state (its reviews and retirements so far).
SettledHistory settled_history(Database& db, CurveId id);

/// Appends `steps` of curve `id`, caused by the entry `seq`, and the instrument's running
/// totals per state they change.
void append_tally_steps(Database& db, CurveId id, const std::vector<TallyStep>& steps,
                        std::int64_t seq, LatestTotals& known);

/// Appends the steps of every stored curve (a store with no steps yet): migration 0009's step
/// and the end of `store copy`. Each curve's steps name its latest entry (curve, review or
/// retirement).
void build_settled_tallies(Database& db);
/// The signature of a migration's step.
void build_settled_tallies_step(Database& db, const Clock& clock);

/// Appends each instrument's running totals per state from its steps, all built (`store copy`;
/// migration 0010 does the same in SQL).
void build_settled_totals(Database& db);

/// The first disagreement between the stored steps and the steps the facts give, or between an
/// instrument's latest running total per state and its steps, in words; nullopt when they
/// agree. Streams the steps and the facts in curve order.
std::optional<std::string> settled_tallies_disagreement(Database& db);

}  // namespace cw::store::sqlite
