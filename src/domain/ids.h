// SPDX-License-Identifier: Apache-2.0
// Strong row ids: a curve id cannot be passed where a lot id is wanted.
#pragma once

#include <compare>
#include <cstdint>
#include <functional>

namespace cw {

template <class Tag>
struct Id {
  std::int64_t value = 0;
  constexpr Id() = default;
  constexpr explicit Id(std::int64_t v) : value(v) {}
  auto operator<=>(const Id&) const = default;
};

using InstrumentId = Id<struct InstrumentTag>;
using MethodId = Id<struct MethodTag>;
using MethodVersionId = Id<struct MethodVersionTag>;
using LotId = Id<struct LotTag>;
using CalibrationId = Id<struct CalibrationTag>;
using CurveId = Id<struct CurveTag>;
using CheckId = Id<struct CheckTag>;
using ResultId = Id<struct ResultTag>;
using RunId = Id<struct RunTag>;
using StatusEventId = Id<struct StatusEventTag>;

}  // namespace cw

template <class Tag>
struct std::hash<cw::Id<Tag>> {
  std::size_t operator()(const cw::Id<Tag>& id) const noexcept {
    return std::hash<std::int64_t>{}(id.value);
  }
};
