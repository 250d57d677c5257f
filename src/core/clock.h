// SPDX-License-Identifier: Apache-2.0
// The source of "now". CURVEWARDEN_NOW (ISO-8601) fixes it for tests and the demo; every
// audit entry records whether it was fixed.
#pragma once

#include <memory>

#include "core/time.h"

namespace cw {

class Clock {
 public:
  virtual ~Clock() = default;
  virtual Instant now() const = 0;
  /// True when "now" does not come from the system clock.
  virtual bool is_overridden() const = 0;
};

class SystemClock final : public Clock {
 public:
  Instant now() const override;
  bool is_overridden() const override { return false; }
};

class FixedClock final : public Clock {
 public:
  explicit FixedClock(Instant t) : t_(t) {}
  Instant now() const override { return t_; }
  bool is_overridden() const override { return true; }

 private:
  Instant t_;
};

/// FixedClock when CURVEWARDEN_NOW is set (a bad value is a ValidationError), else SystemClock.
std::unique_ptr<Clock> clock_from_environment();

}  // namespace cw
