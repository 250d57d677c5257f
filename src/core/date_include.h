// SPDX-License-Identifier: Apache-2.0
// The one place that includes the date library. g++ 12 reports a false
// -Wmaybe-uninitialized inside <chrono> when date::parse is inlined at -O2.
#pragma once

#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wmaybe-uninitialized"
#endif
#include <date/date.h>
#include <date/iso_week.h>
#include <date/tz.h>
#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic pop
#endif
