// SPDX-License-Identifier: Apache-2.0
// `curve list`: the curves matching a filter with their states at the session's moment, read
// from one snapshot and evaluated in batches, so that memory does not grow with the store.
#pragma once

#include <cstddef>
#include <functional>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <tuple>
#include <unordered_set>
#include <vector>

#include "app/curve_view.h"
#include "app/fact_set.h"
#include "app/session.h"
#include "domain/curve_state.h"

namespace cw::app {

struct CurveListRequest {
  std::optional<CurveState> state;
  std::optional<std::string> method;
  std::optional<std::string> instrument;
  std::optional<std::string> analyte;
};

/// The curves of a listing, visited in batches of at most kBatch curves: each batch's facts are
/// loaded, its states evaluated and its views handed out, then dropped. What the batches share
/// is kept per group (method, instrument, analyte): the group's curves that can supersede
/// others (those active at the moment, supersession aside), a handful whatever its history,
/// with their facts once a batch without them needs them.
class CurveListing {
 public:
  static constexpr std::size_t kBatch = 256;

  /// Opens the snapshot and resolves the filter (NotFoundError for an unknown method or
  /// instrument) before anything is listed.
  CurveListing(Session& s, const CurveListRequest& request);

  /// Calls `visit` with each matching curve, oldest first (acquisition, then id), with its state
  /// at the session's moment. May be called again: it visits the same curves (one snapshot).
  void each(const std::function<void(const CurveView&)>& visit);

 private:
  using Group = std::tuple<MethodId, InstrumentId, std::string>;

  /// Fills superseding_ for the groups of `ids` not met before.
  void prepare_groups(FactSet& batch, const std::vector<CurveId>& ids);
  CurveStatus status_of(FactSet& batch, CurveId id);

  const LabZone& zone_;
  Instant at_;
  std::optional<CurveState> state_;
  std::unique_ptr<store::ReadUnit> unit_;
  std::vector<CurveId> ids_;                   ///< the candidates, in listing order
  std::unordered_set<std::int64_t> in_batch_;  ///< the ids of the batch being evaluated
  /// Per group: its curves active at the moment when supersession is left aside, newest first.
  std::map<Group, std::vector<CurveId>> superseding_;
  /// The facts of curves of superseding_ needed by a batch they are not part of.
  std::unique_ptr<FactSet> kept_;
};

}  // namespace cw::app
