// SPDX-License-Identifier: Apache-2.0
// Set-up shared by the run scenarios: a lab with active nitrate (M1) and sulfate curves on one
// instrument, run files written and imported at a fixed time, and lookups in the run document.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <vector>

#include "scenario_support.h"

namespace cw::scenario {

/// When the curves of a RunLab are logged, and when its runs are imported by default.
inline constexpr const char* kCurvesAt = "2026-03-02T08:00:00Z";
inline constexpr const char* kRunAt = "2026-03-02T12:00:00Z";

// Responses of the rows, constructed here on the two calibrations (x = (y − a)/b):
// nitrate, M1 (calibration-practice.md §9 M1: a = 1.517857143, b = 1.930357143, LOD 0.74)
inline constexpr const char* kNitratePass = "13.5";       ///< 6.207215541 of 6: 103.45 %, passes
inline constexpr const char* kNitrateFail = "17.3";       ///< 8.175763182 of 6: 136.26 %, fails
inline constexpr const char* kNitrateLow = "9.0";         ///< reads 3.876040703
inline constexpr const char* kNitrateHigh = "30";         ///< reads 14.75: above 12, refused
inline constexpr const char* kBlankPass = "2.483035714";  ///< reads 0.5, below the LOD
inline constexpr const char* kBlankFail = "3.5";          ///< reads 1.026827012, above the LOD
// sulfate, the duplicate series of scenario_support.h (a = 0.9033333333, b = 3.09)
inline constexpr const char* kSulfatePass = "19.44";   ///< 5.998921790 of 6: 99.98 %, passes
inline constexpr const char* kSulfateFail = "25.0";    ///< 7.798274002 of 6: 129.97 %, fails
inline constexpr const char* kSulfateSample = "10.0";  ///< reads 2.943905070

/// A lab with instrument IC-01, lot CRM-A and method ANION-IC (`spec`), and one calibration
/// logged at kCurvesAt: nitrate (M1) and sulfate (duplicates), both active at once.
class RunLab {
 public:
  explicit RunLab(MethodSpec spec = {});

  Lab lab;
  std::int64_t nitrate = 0;
  std::int64_t sulfate = 0;

  /// Writes `csv` to `name` and runs `run import` with --json at `at`; `extra` options follow.
  RunResult import(const std::string& name, const std::string& csv,
                   const std::vector<std::string>& extra = {},
                   const std::string& at = kRunAt) const;
  /// Like import(), REQUIREs `expected_exit` and returns the JSON document.
  Json import_json(const std::string& name, const std::string& csv, int expected_exit,
                   const std::vector<std::string>& extra = {},
                   const std::string& at = kRunAt) const;
};

/// The header of the run files of these scenarios.
inline constexpr const char* kRunHeader = "position,kind,sample,analyte,response,nominal\n";

/// Rows of a run file: `position,kind,sample,analyte,response,nominal`.
std::string row(long position, const std::string& kind, const std::string& sample,
                const std::string& analyte, const std::string& response,
                const std::string& nominal = "");

/// The current status of each sample's result in a run document, by sample id.
std::map<std::string, std::string> status_by_sample(const Json& run);
/// The result item of a sample in a run document.
const Json& result_of(const Json& run, const std::string& sample);

}  // namespace cw::scenario
