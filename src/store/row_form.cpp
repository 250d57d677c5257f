// SPDX-License-Identifier: Apache-2.0
// Column lists of the fact tables (kept equal to the migrations by a store test).
#include "store/row_form.h"

#include <array>
#include <stdexcept>

namespace cw::store {
namespace {

using T = ColumnType;

constexpr Column kLabSettings[] = {
    {"id", T::Integer}, {"lab_name", T::Text}, {"time_zone", T::Text}, {"audit_seq", T::Integer}};
constexpr Column kInstruments[] = {{"id", T::Integer},
                                   {"code", T::Text},
                                   {"name", T::Text, true},
                                   {"registered_at", T::Instant},
                                   {"audit_seq", T::Integer}};
constexpr Column kServiceEvents[] = {{"id", T::Integer},          {"instrument_id", T::Integer},
                                     {"direction", T::Text},      {"reason", T::Text},
                                     {"occurred_at", T::Instant}, {"audit_seq", T::Integer}};
constexpr Column kMethods[] = {{"id", T::Integer},
                               {"code", T::Text},
                               {"registered_at", T::Instant},
                               {"audit_seq", T::Integer}};
constexpr Column kMethodVersions[] = {
    {"id", T::Integer},           {"method_id", T::Integer}, {"version", T::Integer},
    {"effective_at", T::Instant}, {"title", T::Text},        {"unit", T::Text},
    {"definition", T::Json},      {"source_name", T::Text},  {"source_text", T::Text},
    {"source_sha256", T::Text},   {"reason", T::Text, true}, {"audit_seq", T::Integer}};
constexpr Column kLots[] = {{"id", T::Integer},
                            {"code", T::Text},
                            {"material", T::Text},
                            {"expires_on", T::Date},
                            {"opened_on", T::Date, true},
                            {"in_use_days", T::Integer, true},
                            {"certificate", T::Text, true},
                            {"registered_at", T::Instant},
                            {"audit_seq", T::Integer},
                            {"coverage_factor", T::Real, true, true}};
constexpr Column kLotValues[] = {
    {"id", T::Integer}, {"lot_id", T::Integer},         {"analyte", T::Text},
    {"value", T::Real}, {"uncertainty", T::Real, true}, {"audit_seq", T::Integer}};
constexpr Column kLotWithdrawals[] = {{"id", T::Integer},
                                      {"lot_id", T::Integer},
                                      {"reason", T::Text},
                                      {"occurred_at", T::Instant},
                                      {"audit_seq", T::Integer}};
constexpr Column kCalibrations[] = {{"id", T::Integer},
                                    {"method_version_id", T::Integer},
                                    {"instrument_id", T::Integer},
                                    {"acquired_at", T::Instant},
                                    {"analyst", T::Text},
                                    {"note", T::Text, true},
                                    {"points_file", T::Text},
                                    {"points_sha256", T::Text},
                                    {"audit_seq", T::Integer}};
constexpr Column kCalibrationLots[] = {{"id", T::Integer},
                                       {"calibration_id", T::Integer},
                                       {"lot_id", T::Integer},
                                       {"audit_seq", T::Integer}};
constexpr Column kCurves[] = {{"id", T::Integer},
                              {"calibration_id", T::Integer},
                              {"method_id", T::Integer},
                              {"instrument_id", T::Integer},
                              {"acquired_at", T::Instant},
                              {"analyte", T::Text},
                              {"model", T::Text},
                              {"weighting", T::Text},
                              {"intercept", T::Real},
                              {"slope", T::Real},
                              {"quadratic", T::Real},
                              {"se_intercept", T::Real},
                              {"se_slope", T::Real},
                              {"se_quadratic", T::Real},
                              {"r2", T::Real},
                              {"residual_sd", T::Real},
                              {"dof", T::Integer},
                              {"n_points", T::Integer},
                              {"n_levels", T::Integer},
                              {"range_low", T::Real},
                              {"range_high", T::Real},
                              {"lod", T::Real},
                              {"loq", T::Real},
                              {"rf_rsd_pct", T::Real},
                              {"verdict", T::Text},
                              {"failed_criteria", T::Json},
                              {"statistics", T::Json},
                              {"acceptance", T::Json},
                              {"expires_at", T::Instant},
                              {"audit_seq", T::Integer}};
constexpr Column kCurvePoints[] = {{"id", T::Integer},
                                   {"curve_id", T::Integer},
                                   {"source_line", T::Integer},
                                   {"level", T::Text},
                                   {"replicate", T::Integer},
                                   {"nominal", T::Real},
                                   {"response", T::Real},
                                   {"is_response", T::Real, true},
                                   {"y", T::Real},
                                   {"back_calculated", T::Real, true},
                                   {"error_pct", T::Real, true},
                                   {"within_limits", T::Boolean},
                                   {"excluded", T::Boolean},
                                   {"exclude_reason", T::Text, true},
                                   {"audit_seq", T::Integer}};
constexpr Column kCurveReviews[] = {{"id", T::Integer},       {"curve_id", T::Integer},
                                    {"decision", T::Text},    {"reviewer", T::Text},
                                    {"reason", T::Text},      {"occurred_at", T::Instant},
                                    {"audit_seq", T::Integer}};
constexpr Column kCurveRetirements[] = {{"id", T::Integer},          {"curve_id", T::Integer},
                                        {"retired_by", T::Text},     {"reason", T::Text},
                                        {"occurred_at", T::Instant}, {"audit_seq", T::Integer}};
constexpr Column kRefusals[] = {
    {"id", T::Integer},     {"action", T::Text},         {"entity_kind", T::Text},
    {"entity_id", T::Text}, {"actor", T::Text},          {"reasons", T::Json},
    {"message", T::Text},   {"occurred_at", T::Instant}, {"audit_seq", T::Integer}};
constexpr Column kChecks[] = {{"id", T::Integer},
                              {"curve_id", T::Integer},
                              {"kind", T::Text},
                              {"nominal", T::Real},
                              {"response", T::Real},
                              {"is_response", T::Real, true},
                              {"measured", T::Real, true},
                              {"recovery_pct", T::Real, true},
                              {"limit_low", T::Real, true},
                              {"limit_high", T::Real, true},
                              {"passed", T::Boolean},
                              {"analyst", T::Text},
                              {"occurred_at", T::Instant},
                              {"audit_seq", T::Integer}};
constexpr Column kResults[] = {{"id", T::Integer},
                               {"sample", T::Text},
                               {"analyte", T::Text},
                               {"status", T::Text},
                               {"curve_id", T::Integer, true},
                               {"method_id", T::Integer, true},
                               {"instrument_id", T::Integer, true},
                               {"response", T::Real},
                               {"is_response", T::Real, true},
                               {"replicates", T::Integer},
                               {"dilution", T::Real},
                               {"x0", T::Real, true},
                               {"sd_x0", T::Real, true},
                               {"concentration", T::Real, true},
                               {"ci_low", T::Real, true},
                               {"ci_high", T::Real, true},
                               {"flags", T::Json},
                               {"reasons", T::Json},
                               {"reason_details", T::Json},
                               {"analyst", T::Text},
                               {"occurred_at", T::Instant},
                               {"audit_seq", T::Integer},
                               // Added by migration 0005.
                               {"censored", T::Text, true, true},
                               {"reporting_limit", T::Real, true, true},
                               {"computed_concentration", T::Real, true, true},
                               {"uncertainty", T::Json, true, true}};

constexpr Column kInstrumentColumnMaps[] = {{"id", T::Integer},       {"instrument_id", T::Integer},
                                            {"columns", T::Json},     {"reason", T::Text, true},
                                            {"saved_by", T::Text},    {"occurred_at", T::Instant},
                                            {"audit_seq", T::Integer}};
constexpr Column kRuns[] = {{"id", T::Integer},
                            {"method_version_id", T::Integer},
                            {"instrument_id", T::Integer},
                            {"acquired_at", T::Instant},
                            {"analyst", T::Text},
                            {"file_name", T::Text},
                            {"file_sha256", T::Text},
                            {"row_count", T::Integer},
                            {"columns", T::Json},
                            {"again_reason", T::Text, true},
                            {"audit_seq", T::Integer}};
constexpr Column kRunResults[] = {{"id", T::Integer},
                                  {"run_id", T::Integer},
                                  {"position", T::Integer},
                                  {"result_id", T::Integer},
                                  {"audit_seq", T::Integer}};
constexpr Column kRunChecks[] = {{"id", T::Integer},       {"run_id", T::Integer},
                                 {"position", T::Integer}, {"check_id", T::Integer},
                                 {"label", T::Text, true}, {"audit_seq", T::Integer}};
constexpr Column kResultStatusEvents[] = {
    {"id", T::Integer},           {"result_id", T::Integer},   {"status", T::Text},
    {"reason", T::Text},          {"detail", T::Text},         {"check_id", T::Integer, true},
    {"run_id", T::Integer, true}, {"occurred_at", T::Instant}, {"audit_seq", T::Integer}};

// Added by migration 0007.
constexpr Column kUsers[] = {{"id", T::Integer},
                             {"code", T::Text},
                             {"name", T::Text},
                             {"registered_at", T::Instant},
                             {"audit_seq", T::Integer}};
constexpr Column kUserEvents[] = {{"id", T::Integer},          {"user_id", T::Integer},
                                  {"status", T::Text},         {"role", T::Text},
                                  {"reason", T::Text},         {"by_user", T::Text},
                                  {"occurred_at", T::Instant}, {"audit_seq", T::Integer}};
constexpr Column kUserPassphrases[] = {{"id", T::Integer},
                                       {"user_id", T::Integer},
                                       {"hash", T::Text},
                                       {"occurred_at", T::Instant},
                                       {"audit_seq", T::Integer}};
constexpr Column kSignatures[] = {{"id", T::Integer},        {"user_id", T::Integer},
                                  {"name", T::Text},         {"meaning", T::Text},
                                  {"entity_kind", T::Text},  {"entity_id", T::Text},
                                  {"signed_at", T::Instant}, {"audit_seq", T::Integer}};
constexpr Column kSignatureFailures[] = {{"id", T::Integer},
                                         {"user_id", T::Integer},
                                         {"action", T::Text},
                                         {"occurred_at", T::Instant},
                                         {"audit_seq", T::Integer}};

const std::array<TableForm, 27> kForms = {{
    {FactTable::LabSettings, "lab_settings", kLabSettings},
    {FactTable::Instruments, "instruments", kInstruments},
    {FactTable::InstrumentServiceEvents, "instrument_service_events", kServiceEvents},
    {FactTable::Methods, "methods", kMethods},
    {FactTable::MethodVersions, "method_versions", kMethodVersions},
    {FactTable::Lots, "lots", kLots},
    {FactTable::LotValues, "lot_values", kLotValues},
    {FactTable::LotWithdrawals, "lot_withdrawals", kLotWithdrawals},
    {FactTable::Calibrations, "calibrations", kCalibrations},
    {FactTable::CalibrationLots, "calibration_lots", kCalibrationLots},
    {FactTable::Curves, "curves", kCurves},
    {FactTable::CurvePoints, "curve_points", kCurvePoints},
    {FactTable::CurveReviews, "curve_reviews", kCurveReviews},
    {FactTable::CurveRetirements, "curve_retirements", kCurveRetirements},
    {FactTable::Refusals, "refusals", kRefusals},
    {FactTable::Checks, "checks", kChecks},
    {FactTable::Results, "results", kResults},
    {FactTable::InstrumentColumnMaps, "instrument_column_maps", kInstrumentColumnMaps},
    {FactTable::Runs, "runs", kRuns},
    {FactTable::RunResults, "run_results", kRunResults},
    {FactTable::RunChecks, "run_checks", kRunChecks},
    {FactTable::ResultStatusEvents, "result_status_events", kResultStatusEvents},
    {FactTable::Users, "users", kUsers},
    {FactTable::UserEvents, "user_events", kUserEvents},
    {FactTable::UserPassphrases, "user_passphrases", kUserPassphrases},
    {FactTable::Signatures, "signatures", kSignatures},
    {FactTable::SignatureFailures, "signature_failures", kSignatureFailures},
}};

}  // namespace

const TableForm& form_of(FactTable table) {
  for (const auto& form : kForms) {
    if (form.table == table) return form;
  }
  throw std::logic_error("fact table without a row form");
}

std::string_view table_name(FactTable t) {
  return form_of(t).name;
}

nlohmann::json canonical_value(const Column& column, const CellValue& value) {
  if (std::holds_alternative<std::monostate>(value)) {
    if (!column.nullable) {
      throw std::logic_error("NULL in the non-null column " + std::string(column.name));
    }
    return nullptr;
  }
  switch (column.type) {
    case ColumnType::Integer:
    case ColumnType::Boolean:
      if (const auto* i = std::get_if<std::int64_t>(&value)) return *i;
      break;
    case ColumnType::Real:
      if (const auto* d = std::get_if<double>(&value)) return *d;
      break;
    case ColumnType::Text:
    case ColumnType::Instant:
    case ColumnType::Date:
    case ColumnType::Json:
      if (const auto* s = std::get_if<std::string>(&value)) return *s;
      break;
  }
  throw std::logic_error("a value of the wrong kind in column " + std::string(column.name));
}

}  // namespace cw::store
