// SPDX-License-Identifier: Apache-2.0
// One text form per enum value: a constexpr table read in both directions, so that a value is
// printed and parsed by the same entry and the two cannot drift.
#pragma once

#include <optional>
#include <string_view>
#include <utility>

namespace cw {

template <class E, std::size_t N>
constexpr std::string_view text_of(const std::pair<E, std::string_view> (&table)[N], E value) {
  for (const auto& [v, text] : table) {
    if (v == value) return text;
  }
  return {};
}

template <class E, std::size_t N>
constexpr std::optional<E> value_of(const std::pair<E, std::string_view> (&table)[N],
                                    std::string_view text) {
  for (const auto& [v, t] : table) {
    if (t == text) return v;
  }
  return std::nullopt;
}

}  // namespace cw
