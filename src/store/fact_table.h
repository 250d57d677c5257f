// SPDX-License-Identifier: Apache-2.0
// The fact tables: rows written once, each named in the payload of the audit entry that
// wrote it (column audit_seq).
#pragma once

#include <array>
#include <string_view>

namespace cw::store {

enum class FactTable {
  LabSettings,
  Instruments,
  InstrumentServiceEvents,
  Methods,
  MethodVersions,
  Lots,
  LotValues,
  LotWithdrawals,
  Calibrations,
  CalibrationLots,
  Curves,
  CurvePoints,
  CurveReviews,
  CurveRetirements,
  Refusals,
  Checks,
  Results,
  InstrumentColumnMaps,
  Runs,
  RunResults,
  RunChecks,
  ResultStatusEvents,
  Users,
  UserEvents,
  UserPassphrases,
  Signatures,
  SignatureFailures,
};

inline constexpr std::array kAllFactTables = {
    FactTable::LabSettings,
    FactTable::Instruments,
    FactTable::InstrumentServiceEvents,
    FactTable::Methods,
    FactTable::MethodVersions,
    FactTable::Lots,
    FactTable::LotValues,
    FactTable::LotWithdrawals,
    FactTable::Calibrations,
    FactTable::CalibrationLots,
    FactTable::Curves,
    FactTable::CurvePoints,
    FactTable::CurveReviews,
    FactTable::CurveRetirements,
    FactTable::Refusals,
    FactTable::Checks,
    FactTable::Results,
    FactTable::InstrumentColumnMaps,
    FactTable::Runs,
    FactTable::RunResults,
    FactTable::RunChecks,
    FactTable::ResultStatusEvents,
    FactTable::Users,
    FactTable::UserEvents,
    FactTable::UserPassphrases,
    FactTable::Signatures,
    FactTable::SignatureFailures,
};

/// The table name (a fixed identifier, never user input); see row_form.h.
std::string_view table_name(FactTable t);

}  // namespace cw::store
