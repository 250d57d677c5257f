// SPDX-License-Identifier: Apache-2.0
// Internal to the store: JSON forms of values kept in TEXT columns (method definitions,
// fit statistics, acceptance findings).
#pragma once

#include <nlohmann/json.hpp>

#include "domain/method.h"
#include "fitting/acceptance.h"
#include "fitting/fit.h"

namespace cw::store {

nlohmann::json method_definition_to_json(const MethodDefinition& d);
MethodDefinition method_definition_from_json(const nlohmann::json& j);

/// Every number of the fit except the per-point table (kept in curve_points).
nlohmann::json fit_to_json(const fitting::FitResult& f);
fitting::FitResult fit_from_json(const nlohmann::json& j);

nlohmann::json acceptance_to_json(const fitting::Acceptance& a);
fitting::Acceptance acceptance_from_json(const nlohmann::json& j);

}  // namespace cw::store
