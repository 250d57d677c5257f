// SPDX-License-Identifier: Apache-2.0
// Builds a realistic store of a fictional lab for benchmarks: instruments, methods (some
// revised), reference-material lots, two years of calibrations with their curves and points,
// reviews, retirements, and runs with checks and results. Everything is written through the
// store seam and the same fitting and decision functions the commands use, in a few large
// transactions, each change closed by its audit entry, so `audit verify` accepts the result.
// Seeded and deterministic: the same options give the same facts.
#pragma once

#include <cstdint>
#include <functional>
#include <string>

#include "core/time.h"

namespace cw::bench {

struct GeneratorOptions {
  std::string location;          ///< the store to create (must not exist)
  std::int64_t curves = 10'000;  ///< about this many curves (whole calibrations: a few more)
  std::uint64_t seed = 1;
  Instant end;     ///< the history ends here ("now" of the benchmarks)
  int days = 730;  ///< history length
  int instruments = 50;
  int methods = 200;
  std::int64_t entries_per_transaction = 50'000;
  /// Called now and then with a line of progress (may be empty).
  std::function<void(const std::string&)> progress;
};

/// What was written, and the facts a benchmark needs to address.
struct GeneratorReport {
  std::int64_t calibrations = 0, curves = 0, points = 0, reviews = 0, retirements = 0;
  std::int64_t runs = 0, checks = 0, results = 0, entries = 0;
  std::string wide_method;        ///< the method with 30 analytes
  std::string wide_instrument;    ///< an instrument it runs on
  std::string wide_lot;           ///< a lot certifying its analytes, usable at `end`
  std::int64_t active_curve = 0;  ///< a curve of the wide method active at `end`
  std::string active_analyte;     ///< its analyte
  double check_response = 0;      ///< the response of a passing check at nominal 10 on it
};

/// Builds the store. Throws the library's errors (a StoreError when the file exists).
GeneratorReport generate_store(const GeneratorOptions& options);

/// The slope scale of the wide method's analytes in the store generated from `seed` (its
/// calibrations' responses are this × (0.5 + 0.1·(index mod 10)) per unit of concentration).
double wide_slope_base(std::uint64_t seed);

/// A points file (CSV) for the wide method: `levels` levels × `replicates` replicates of each
/// of its 30 analytes, drawn from `seed`.
std::string wide_points_file(int levels, int replicates, std::uint64_t seed);

/// A run file (CSV) for the wide method of `rows` rows: a check of every analyte, then samples
/// and a closing check every `samples_per_check` samples, drawn from `seed`.
std::string wide_run_file(long rows, int samples_per_check, std::uint64_t seed);

}  // namespace cw::bench
