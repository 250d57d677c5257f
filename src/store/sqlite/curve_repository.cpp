// SPDX-License-Identifier: Apache-2.0
// SQL for calibrations, curves, points, reviews, retirements, checks, results and refusals.
#include "store/sqlite/curve_repository.h"

#include <map>
#include <stdexcept>

#include "store/sqlite/bind.h"
#include "store/sqlite/codec.h"
#include "store/sqlite/settled_tallies.h"
#include "store/sqlite/sql.h"

namespace cw::store::sqlite {
namespace {

using nlohmann::json;

/// The earliest instant the store holds, for lower bounds that are not given.
const char* const kBeginningOfTime = "0001-01-01T00:00:00Z";

std::vector<CurveId> curve_ids(SQLite::Statement& s) {
  std::vector<CurveId> out;
  while (s.executeStep()) out.emplace_back(s.getColumn(0).getInt64());
  s.reset();
  return out;
}

}  // namespace

Check read_check(SQLite::Statement& s, int first, bool with_run, const std::string& path) {
  const auto col = [&](int i) { return s.getColumn(first + i); };
  Check k;
  k.id = CheckId{col(0).getInt64()};
  k.curve_id = CurveId{col(1).getInt64()};
  k.kind = stored_enum(parse_check_kind, col(2).getString(), "checks.kind", path);
  k.nominal = col(3).getDouble();
  k.response = col(4).getDouble();
  k.is_response = opt_real(col(5));
  k.measured = opt_real(col(6));
  k.recovery_pct = opt_real(col(7));
  k.limit_low = opt_real(col(8));
  k.limit_high = opt_real(col(9));
  k.passed = col(10).getInt64() != 0;
  k.analyst = col(11).getString();
  k.occurred_at = stored_instant(col(12).getString(), "checks.occurred_at", path);
  if (with_run) {
    if (auto run = opt_int(col(13))) k.run_id = RunId{*run};
  }
  return k;
}

ResultStatusEvent read_status_event(SQLite::Statement& s, int first, const std::string& path) {
  const auto col = [&](int i) { return s.getColumn(first + i); };
  ResultStatusEvent e;
  e.id = StatusEventId{col(0).getInt64()};
  e.result_id = ResultId{col(1).getInt64()};
  e.status =
      stored_enum(parse_result_status, col(2).getString(), "result_status_events.status", path);
  e.reason =
      stored_enum(parse_rerun_reason, col(3).getString(), "result_status_events.reason", path);
  e.detail = col(4).getString();
  if (auto v = opt_int(col(5))) e.check_id = CheckId{*v};
  if (auto v = opt_int(col(6))) e.run_id = RunId{*v};
  e.occurred_at = stored_instant(col(7).getString(), "result_status_events.occurred_at", path);
  return e;
}

Result read_result(SQLite::Statement& s, const std::string& path) {
  Result r;
  r.id = ResultId{s.getColumn(0).getInt64()};
  r.sample = s.getColumn(1).getString();
  r.analyte = s.getColumn(2).getString();
  r.status = stored_enum(parse_result_status, s.getColumn(3).getString(), "results.status", path);
  if (r.status == ResultStatus::RerunRequired) {
    throw_unknown_token(s.getColumn(3).getString(), "results.status", path);
  }
  if (auto v = opt_int(s.getColumn(4))) r.curve_id = CurveId{*v};
  if (auto v = opt_int(s.getColumn(5))) r.method_id = MethodId{*v};
  if (auto v = opt_int(s.getColumn(6))) r.instrument_id = InstrumentId{*v};
  r.response = s.getColumn(7).getDouble();
  r.is_response = opt_real(s.getColumn(8));
  r.replicates = s.getColumn(9).getInt();
  r.dilution = s.getColumn(10).getDouble();
  r.x0 = opt_real(s.getColumn(11));
  r.sd_x0 = opt_real(s.getColumn(12));
  r.concentration = opt_real(s.getColumn(13));
  r.ci_low = opt_real(s.getColumn(14));
  r.ci_high = opt_real(s.getColumn(15));
  r.flags = stored_enum_list(parse_result_flag, s.getColumn(16).getString(), "results.flags", path);
  // The reasons list and the detailed findings hold the same reasons; the findings carry their
  // facts and are what is read back.
  const json details =
      parse_stored_json(s.getColumn(18).getString(), "results.reason_details", path);
  if (!details.is_array()) damaged(path, "results.reason_details is not a list");
  for (const auto& d : details) {
    if (!d.is_object() || !d.contains("reason") || !d["reason"].is_string() ||
        !d.contains("message") || !d["message"].is_string() || !d.contains("since")) {
      damaged(path, "results.reason_details of result " + std::to_string(r.id.value) +
                        " is not a list of findings");
    }
    Finding f{
        stored_enum(parse_reason, d["reason"].get<std::string>(), "results.reason_details", path),
        std::nullopt, d["message"].get<std::string>()};
    if (!d["since"].is_null()) {
      if (!d["since"].is_string()) damaged(path, "results.reason_details has a bad time");
      f.since = stored_instant(d["since"].get<std::string>(), "results.reason_details", path);
    }
    r.reasons.push_back(std::move(f));
  }
  const auto tokens =
      stored_enum_list(parse_reason, s.getColumn(17).getString(), "results.reasons", path);
  if (tokens.size() != r.reasons.size()) {
    damaged(path, "results.reasons and reason_details of result " + std::to_string(r.id.value) +
                      " disagree");
  }
  r.analyst = s.getColumn(19).getString();
  r.occurred_at = stored_instant(s.getColumn(20).getString(), "results.occurred_at", path);
  if (auto censored = opt_text(s.getColumn(21))) {
    if (*censored != "<") damaged(path, "results.censored holds '" + *censored + "'");
    r.censored = true;
  }
  r.reporting_limit = opt_real(s.getColumn(22));
  r.computed_concentration = opt_real(s.getColumn(23));
  if (auto text = opt_text(s.getColumn(24))) {
    const json u = parse_stored_json(*text, "results.uncertainty", path);
    try {
      ResultUncertainty budget;
      for (const auto& c : u.at("components")) {
        budget.components.push_back(
            {c.at("source").get<std::string>(), c.at("relative_u").get<double>()});
      }
      budget.combined = u.at("combined").get<double>();
      budget.expanded = u.at("expanded").get<double>();
      budget.k = u.at("k").get<double>();
      r.uncertainty = std::move(budget);
    } catch (const json::exception&) {
      damaged(path, "results.uncertainty of result " + std::to_string(r.id.value) +
                        " is not an uncertainty budget");
    }
  }
  if (auto run = opt_int(s.getColumn(25))) {
    r.run_id = RunId{*run};
    r.run_position = static_cast<long>(s.getColumn(26).getInt64());
  }
  if (!s.getColumn(27).isNull()) {
    // The latest status event: id, status, reason, detail, check_id, run_id, occurred_at (the
    // result id is this result's).
    ResultStatusEvent e;
    e.id = StatusEventId{s.getColumn(27).getInt64()};
    e.result_id = r.id;
    e.status = stored_enum(parse_result_status, s.getColumn(28).getString(),
                           "result_status_events.status", path);
    e.reason = stored_enum(parse_rerun_reason, s.getColumn(29).getString(),
                           "result_status_events.reason", path);
    e.detail = s.getColumn(30).getString();
    if (auto v = opt_int(s.getColumn(31))) e.check_id = CheckId{*v};
    if (auto v = opt_int(s.getColumn(32))) e.run_id = RunId{*v};
    e.occurred_at =
        stored_instant(s.getColumn(33).getString(), "result_status_events.occurred_at", path);
    r.latest_event = std::move(e);
  }
  return r;
}

WriteState& SqliteCurves::writing() {
  if (w_ == nullptr) throw std::logic_error("a fact was appended through a read unit");
  return *w_;
}

std::optional<Calibration> SqliteCurves::calibration(CalibrationId id) {
  auto list = calibrations({id});
  if (list.empty()) return std::nullopt;
  return list.front();
}

std::vector<Calibration> SqliteCurves::calibrations(const std::vector<CalibrationId>& ids) {
  return guarded(db_, [&] {
    std::vector<Calibration> out;
    if (ids.empty()) return out;
    std::map<CalibrationId, std::size_t> index;
    {
      auto& s = db_.statement(sql::kCalibrationsByIds);
      bind_ids(s, ":ids", ids);
      while (s.executeStep()) {
        Calibration c;
        c.id = CalibrationId{s.getColumn(0).getInt64()};
        c.method_version_id = MethodVersionId{s.getColumn(1).getInt64()};
        c.instrument_id = InstrumentId{s.getColumn(2).getInt64()};
        c.acquired_at =
            stored_instant(s.getColumn(3).getString(), "calibrations.acquired_at", db_.path);
        c.analyst = s.getColumn(4).getString();
        c.note = opt_text(s.getColumn(5));
        c.points_file = s.getColumn(6).getString();
        c.points_sha256 = s.getColumn(7).getString();
        index[c.id] = out.size();
        out.push_back(std::move(c));
      }
      s.reset();
    }
    auto& l = db_.statement(sql::kCalibrationLotsOf);
    bind_ids(l, ":ids", ids);
    while (l.executeStep()) {
      out[index.at(CalibrationId{l.getColumn(0).getInt64()})].lots.emplace_back(
          l.getColumn(1).getInt64());
    }
    l.reset();
    return out;
  });
}

std::vector<Curve> SqliteCurves::curves(const std::vector<CurveId>& ids, CurveDetail detail) {
  return guarded(db_, [&] {
    std::vector<Curve> out;
    if (ids.empty()) return out;
    std::map<CurveId, std::size_t> index;
    {
      auto& s = db_.statement(sql::kCurvesByIds);
      bind_ids(s, ":ids", ids);
      while (s.executeStep()) {
        Curve c;
        c.id = CurveId{s.getColumn(0).getInt64()};
        const std::string where = "curve " + std::to_string(c.id.value);
        c.calibration_id = CalibrationId{s.getColumn(1).getInt64()};
        c.method_id = MethodId{s.getColumn(2).getInt64()};
        c.method_version_id = MethodVersionId{s.getColumn(3).getInt64()};
        c.instrument_id = InstrumentId{s.getColumn(4).getInt64()};
        c.acquired_at = stored_instant(s.getColumn(5).getString(), "curves.acquired_at", db_.path);
        c.analyst = s.getColumn(6).getString();
        c.analyte = s.getColumn(7).getString();
        c.verdict =
            stored_enum(parse_verdict, s.getColumn(8).getString(), "curves.verdict", db_.path);
        c.failed_criteria = stored_enum_list(fitting::parse_criterion, s.getColumn(9).getString(),
                                             "curves.failed_criteria", db_.path);
        try {
          if (detail != CurveDetail::State) {
            c.fit = fit_from_json(
                parse_stored_json(s.getColumn(10).getString(), "curves.statistics", db_.path));
          }
          // A rejected curve's state is worded with its failed criteria; an accepted one's
          // acceptance (its warnings) is shown only with its statistics.
          if (detail != CurveDetail::State || c.verdict == Verdict::Rejected) {
            c.acceptance = acceptance_from_json(
                parse_stored_json(s.getColumn(11).getString(), "curves.acceptance", db_.path));
          } else {
            c.acceptance.accepted = true;  // what the verdict says; its warnings left unread
          }
        } catch (const nlohmann::json::exception& e) {
          damaged(db_.path, "the statistics of " + where + " do not read back (" + e.what() + ")");
        }
        c.expires_at = stored_instant(s.getColumn(12).getString(), "curves.expires_at", db_.path);
        index[c.id] = out.size();
        out.push_back(std::move(c));
      }
      s.reset();
    }
    const auto curve_at = [&](SQLite::Statement& s) -> Curve& {
      return out[index.at(CurveId{s.getColumn(0).getInt64()})];
    };
    if (detail == CurveDetail::Statistics) {
      // What the release limit and a check's range start at, without reading the points.
      for (Curve& c : out) c.lowest_level = c.fit.range_low;
      auto& s = db_.statement(sql::kLowestLevelsOf);
      bind_ids(s, ":ids", ids);
      while (s.executeStep()) curve_at(s).lowest_level = s.getColumn(1).getDouble();
      s.reset();
    }
    if (detail == CurveDetail::Points) {
      auto& s = db_.statement(sql::kPointsOf);
      bind_ids(s, ":ids", ids);
      while (s.executeStep()) {
        CalibrationPoint p;
        p.source_line = static_cast<long>(s.getColumn(1).getInt64());
        p.level = s.getColumn(2).getString();
        p.replicate = s.getColumn(3).getInt();
        p.nominal = s.getColumn(4).getDouble();
        p.response = s.getColumn(5).getDouble();
        p.is_response = opt_real(s.getColumn(6));
        p.y = s.getColumn(7).getDouble();
        p.back_calculated = opt_real(s.getColumn(8));
        p.error_pct = opt_real(s.getColumn(9));
        p.within_limits = s.getColumn(10).getInt64() != 0;
        p.excluded = s.getColumn(11).getInt64() != 0;
        p.exclude_reason = opt_text(s.getColumn(12));
        curve_at(s).points.push_back(std::move(p));
      }
      s.reset();
    }
    {
      auto& s = db_.statement(sql::kReviewsOf);
      bind_ids(s, ":ids", ids);
      while (s.executeStep()) {
        curve_at(s).reviews.push_back(
            {stored_enum(parse_review_decision, s.getColumn(1).getString(),
                         "curve_reviews.decision", db_.path),
             s.getColumn(2).getString(), s.getColumn(3).getString(),
             stored_instant(s.getColumn(4).getString(), "curve_reviews.occurred_at", db_.path)});
      }
      s.reset();
    }
    auto& s = db_.statement(sql::kRetirementsOf);
    bind_ids(s, ":ids", ids);
    while (s.executeStep()) {
      curve_at(s).retirements.push_back(
          {s.getColumn(1).getString(), s.getColumn(2).getString(),
           stored_instant(s.getColumn(3).getString(), "curve_retirements.occurred_at", db_.path)});
    }
    s.reset();
    return out;
  });
}

std::vector<Check> SqliteCurves::checks_of_group(MethodId method, InstrumentId instrument,
                                                 const std::string& analyte) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kChecksOfGroup);
    bind_int(s, ":method", method.value);
    bind_int(s, ":instrument", instrument.value);
    bind_text(s, ":analyte", analyte);
    std::vector<Check> out;
    while (s.executeStep()) out.push_back(check_of(s));
    s.reset();
    return out;
  });
}

std::vector<Check> SqliteCurves::checks_of(const std::vector<CurveId>& ids) {
  return guarded(db_, [&] {
    std::vector<Check> out;
    if (ids.empty()) return out;
    auto& s = db_.statement(sql::kChecksOf);
    bind_ids(s, ":ids", ids);
    while (s.executeStep()) out.push_back(check_of(s));
    s.reset();
    return out;
  });
}

std::vector<CurveId> SqliteCurves::list(const CurveFilter& f) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kCurveIdsFiltered);
    bind_opt_int(s, ":method", opt_id(f.method));
    bind_opt_int(s, ":instrument", opt_id(f.instrument));
    bind_opt_text(s, ":analyte", f.analyte);
    bind_instant(s, ":by", f.acquired_by);
    return curve_ids(s);
  });
}

std::vector<CurveId> SqliteCurves::of_calibration(CalibrationId id) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kCurvesOfCalibration);
    bind_int(s, ":id", id.value);
    return curve_ids(s);
  });
}

std::vector<CurveId> SqliteCurves::live_in_group(MethodId method, InstrumentId instrument,
                                                 const std::string& analyte,
                                                 std::optional<Instant> after, Instant by) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kLiveInGroup);
    bind_int(s, ":method", method.value);
    bind_int(s, ":instrument", instrument.value);
    bind_text(s, ":analyte", analyte);
    if (after) {
      bind_instant(s, ":after", *after);
    } else {
      bind_text(s, ":after", kBeginningOfTime);
    }
    bind_instant(s, ":by", by);
    return curve_ids(s);
  });
}

std::optional<CurveId> SqliteCurves::latest_in_group(MethodId method, InstrumentId instrument,
                                                     const std::string& analyte, Instant by,
                                                     bool accepted_only) {
  return guarded(db_, [&]() -> std::optional<CurveId> {
    auto& s = db_.statement(accepted_only ? sql::kLatestAcceptedInGroup : sql::kLatestInGroup);
    bind_int(s, ":method", method.value);
    bind_int(s, ":instrument", instrument.value);
    bind_text(s, ":analyte", analyte);
    bind_instant(s, ":by", by);
    auto ids = curve_ids(s);
    if (ids.empty()) return std::nullopt;
    return ids.front();
  });
}

std::vector<CurveGroup> SqliteCurves::groups_expiring_between(Instant from, Instant to) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kGroupsExpiringBetween);
    bind_instant(s, ":from", from);
    bind_text(s, ":to", format_utc(to));  // an exclusive bound may lie past the year 9999
    std::vector<CurveGroup> out;
    while (s.executeStep()) {
      out.push_back({MethodId{s.getColumn(0).getInt64()}, InstrumentId{s.getColumn(1).getInt64()},
                     s.getColumn(2).getString()});
    }
    s.reset();
    return out;
  });
}

std::vector<CurveId> SqliteCurves::live_of_instrument(InstrumentId instrument, Instant t) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kLiveOfInstrument);
    bind_int(s, ":instrument", instrument.value);
    bind_instant(s, ":t", t);
    return curve_ids(s);
  });
}

std::vector<std::pair<CurveState, std::int64_t>> SqliteCurves::settled_counts(
    InstrumentId instrument, Instant t) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kSettledCounts);
    bind_int(s, ":instrument", instrument.value);
    bind_instant(s, ":t", t);
    std::vector<std::pair<CurveState, std::int64_t>> out;
    while (s.executeStep()) {
      const std::int64_t n = s.getColumn(1).getInt64();
      if (n == 0) continue;
      if (n < 0) damaged(db_.path, "settled_tallies: fewer than no curves of an instrument");
      out.emplace_back(stored_enum(parse_curve_state, s.getColumn(0).getString(),
                                   "settled_tallies.state", db_.path),
                       n);
    }
    s.reset();
    return out;
  });
}

std::vector<std::pair<MethodId, std::string>> SqliteCurves::method_analytes(
    InstrumentId instrument) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kNextMethodAnalyte);
    std::vector<std::pair<MethodId, std::string>> out;
    std::pair<MethodId, std::string> after{MethodId{0}, ""};  // before every stored pair
    for (;;) {
      bind_int(s, ":instrument", instrument.value);
      bind_int(s, ":method", after.first.value);
      bind_text(s, ":analyte", after.second);
      const bool found = s.executeStep();
      if (found) after = {MethodId{s.getColumn(0).getInt64()}, s.getColumn(1).getString()};
      s.reset();
      if (!found) return out;
      out.push_back(after);
    }
  });
}

std::vector<CurveId> SqliteCurves::of_lot(LotId lot) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kCurvesOfLot);
    bind_int(s, ":lot", lot.value);
    return curve_ids(s);
  });
}

std::optional<std::string> SqliteCurves::settled_tallies_disagreement() {
  return guarded(db_, [&] { return sqlite::settled_tallies_disagreement(db_); });
}

std::vector<CheckId> SqliteCurves::checks_recorded_after(ResultId id) {
  return guarded(db_, [&] {
    std::vector<CheckId> out;
    auto& s = db_.statement(sql::kChecksRecordedAfterResult);
    bind_int(s, ":id", id.value);
    while (s.executeStep()) out.emplace_back(s.getColumn(0).getInt64());
    s.reset();
    return out;
  });
}

std::optional<Check> SqliteCurves::check(CheckId id) {
  return guarded(db_, [&]() -> std::optional<Check> {
    auto& s = db_.statement(sql::kCheckById);
    bind_int(s, ":id", id.value);
    if (!s.executeStep()) return std::nullopt;
    Check k = check_of(s);
    s.reset();
    return k;
  });
}

std::map<InstrumentId, std::vector<Check>> SqliteCurves::recent_failed_checks(
    const std::vector<InstrumentId>& instruments, Instant by, std::size_t limit) {
  return guarded(db_, [&] {
    std::map<InstrumentId, std::vector<Check>> out;
    for (InstrumentId id : instruments) out[id];
    std::size_t open = limit == 0 ? 0 : out.size();  // instruments still short of `limit`
    auto& s = db_.statement(sql::kFailedChecksBack);
    bind_instant(s, ":by", by);
    // Stepped lazily: the pass ends at the first row that leaves no instrument short.
    while (open > 0 && s.executeStep()) {
      auto it = out.find(InstrumentId{s.getColumn(14).getInt64()});
      if (it == out.end() || it->second.size() >= limit) continue;
      it->second.push_back(check_of(s));
      if (it->second.size() == limit) --open;
    }
    s.reset();
    return out;
  });
}

std::optional<Result> SqliteCurves::result(ResultId id) {
  return guarded(db_, [&]() -> std::optional<Result> {
    auto& s = db_.statement(sql::kResultById);
    bind_int(s, ":id", id.value);
    if (!s.executeStep()) return std::nullopt;
    Result r = result_of(s);
    s.reset();
    return r;
  });
}

std::vector<Result> SqliteCurves::results_of(const std::vector<CurveId>& ids) {
  return guarded(db_, [&] {
    std::vector<Result> out;
    if (ids.empty()) return out;
    auto& s = db_.statement(sql::kResultsOf);
    bind_ids(s, ":ids", ids);
    while (s.executeStep()) out.push_back(result_of(s));
    s.reset();
    return out;
  });
}

std::vector<Result> SqliteCurves::reported_between(CurveId id, std::optional<Instant> after,
                                                   std::optional<CheckId> after_check,
                                                   Instant until) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kReportedBetween);
    bind_int(s, ":id", id.value);
    if (after) {
      bind_instant(s, ":after", *after);
    } else {
      bind_text(s, ":after", "");  // every stored time sorts after the empty text
    }
    bind_opt_int(s, ":check",
                 after_check ? std::optional<std::int64_t>(after_check->value) : std::nullopt);
    bind_instant(s, ":until", until);
    std::vector<Result> out;
    while (s.executeStep()) out.push_back(result_of(s));
    s.reset();
    return out;
  });
}

std::int64_t SqliteCurves::count_reported_between(CurveId id, std::optional<Instant> after,
                                                  std::optional<CheckId> after_check,
                                                  Instant until) {
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kCountReportedBetween);
    bind_int(s, ":id", id.value);
    if (after) {
      bind_instant(s, ":after", *after);
    } else {
      bind_text(s, ":after", "");  // every stored time sorts after the empty text
    }
    bind_opt_int(s, ":check",
                 after_check ? std::optional<std::int64_t>(after_check->value) : std::nullopt);
    bind_instant(s, ":until", until);
    s.executeStep();
    const std::int64_t n = s.getColumn(0).getInt64();
    s.reset();
    return n;
  });
}

CalibrationId SqliteCurves::add_calibration(const Calibration& c) {
  WriteState& w = writing();
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertCalibration);
    bind_int(s, ":mv", c.method_version_id.value);
    bind_int(s, ":instrument", c.instrument_id.value);
    bind_instant(s, ":at", c.acquired_at);
    bind_text(s, ":analyst", c.analyst);
    bind_opt_text(s, ":note", c.note);
    bind_text(s, ":file", c.points_file);
    bind_text(s, ":sha", c.points_sha256);
    bind_int(s, ":seq", w.seq);
    s.exec();
    const CalibrationId id{db_.db->getLastInsertRowid()};
    w.add_row(FactTable::Calibrations, id.value);
    for (const LotId lot : c.lots) {
      auto& l = db_.statement(sql::kInsertCalibrationLot);
      bind_int(l, ":calibration", id.value);
      bind_int(l, ":lot", lot.value);
      bind_int(l, ":seq", w.seq);
      l.exec();
      w.add_row(FactTable::CalibrationLots, db_.db->getLastInsertRowid());
    }
    return id;
  });
}

bool SqliteCurves::review_required_of(CalibrationId calibration) {
  if (auto found = review_required_.find(calibration.value); found != review_required_.end()) {
    return found->second;
  }
  auto& s = db_.statement(sql::kReviewRequiredOfCalibration);
  bind_int(s, ":calibration", calibration.value);
  if (!s.executeStep()) {
    throw std::logic_error("calibration " + std::to_string(calibration.value) +
                           " of a new curve is not stored");
  }
  const bool required = s.getColumn(0).getInt64() != 0;
  s.reset();
  return review_required_[calibration.value] = required;
}

CurveId SqliteCurves::add_curve(const Curve& c) {
  WriteState& w = writing();
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertCurve);
    const auto& f = c.fit;
    bind_int(s, ":calibration", c.calibration_id.value);
    bind_int(s, ":method", c.method_id.value);
    bind_int(s, ":instrument", c.instrument_id.value);
    bind_instant(s, ":at", c.acquired_at);
    bind_text(s, ":analyte", c.analyte);
    bind_text(s, ":model", std::string(fitting::to_string(f.model)));
    bind_text(s, ":weighting", std::string(fitting::to_string(f.weighting)));
    bind_real(s, ":a", f.intercept);
    bind_real(s, ":b", f.slope);
    bind_real(s, ":c", f.quadratic);
    bind_real(s, ":sa", f.se_intercept);
    bind_real(s, ":sb", f.se_slope);
    bind_real(s, ":sc", f.se_quadratic);
    bind_real(s, ":r2", f.r2);
    bind_real(s, ":sd", f.residual_sd);
    bind_int(s, ":dof", f.dof);
    bind_int(s, ":n", f.n_points);
    bind_int(s, ":levels", f.n_levels);
    bind_real(s, ":low", f.range_low);
    bind_real(s, ":high", f.range_high);
    bind_real(s, ":lod", f.lod);
    bind_real(s, ":loq", f.loq);
    bind_real(s, ":rsd", f.rf_rsd_pct);
    bind_text(s, ":verdict", std::string(to_string(c.verdict)));
    bind_text(s, ":failed", tokens_json(c.failed_criteria));
    bind_text(s, ":statistics", fit_to_json(f).dump());
    bind_text(s, ":acceptance", acceptance_to_json(c.acceptance).dump());
    bind_instant(s, ":expires", c.expires_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    const CurveId id{db_.db->getLastInsertRowid()};
    w.add_row(FactTable::Curves, id.value);
    for (const auto& p : c.points) {
      auto& ps = db_.statement(sql::kInsertPoint);
      bind_int(ps, ":curve", id.value);
      bind_int(ps, ":line", p.source_line);
      bind_text(ps, ":level", p.level);
      bind_int(ps, ":rep", p.replicate);
      bind_real(ps, ":nominal", p.nominal);
      bind_real(ps, ":response", p.response);
      bind_opt_real(ps, ":is", p.is_response);
      bind_real(ps, ":y", p.y);
      bind_opt_real(ps, ":back", p.back_calculated);
      bind_opt_real(ps, ":re", p.error_pct);
      bind_int(ps, ":within", p.within_limits ? 1 : 0);
      bind_int(ps, ":excluded", p.excluded ? 1 : 0);
      bind_opt_text(ps, ":why", p.exclude_reason);
      bind_int(ps, ":seq", w.seq);
      ps.exec();
      w.add_row(FactTable::CurvePoints, db_.db->getLastInsertRowid());
    }
    // A new curve has no review or retirement yet: its settled history is the row just
    // inserted and its method version's review_required, not read back.
    SettledHistory h;
    h.instrument = c.instrument_id;
    h.expires_at = c.expires_at;
    h.verdict = c.verdict;
    h.review_required = review_required_of(c.calibration_id);
    append_tally_steps(db_, id, tally_change(nullptr, h), w.seq, w.settled_totals);
    return id;
  });
}

void SqliteCurves::add_review(CurveId id, const CurveReview& r) {
  WriteState& w = writing();
  guarded(db_, [&] {
    const SettledHistory before = settled_history(db_, id);
    SettledHistory after = before;
    after.reviews.push_back({r.occurred_at, r.decision});
    auto& s = db_.statement(sql::kInsertReview);
    bind_int(s, ":curve", id.value);
    bind_text(s, ":decision", std::string(to_string(r.decision)));
    bind_text(s, ":reviewer", r.reviewer);
    bind_text(s, ":reason", r.reason);
    bind_instant(s, ":at", r.occurred_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::CurveReviews, db_.db->getLastInsertRowid());
    append_tally_steps(db_, id, tally_change(&before, after), w.seq, w.settled_totals);
  });
}

void SqliteCurves::add_retirement(CurveId id, const CurveRetirement& r) {
  WriteState& w = writing();
  guarded(db_, [&] {
    const SettledHistory before = settled_history(db_, id);
    SettledHistory after = before;
    after.retirements.push_back(r.occurred_at);
    auto& s = db_.statement(sql::kInsertRetirement);
    bind_int(s, ":curve", id.value);
    bind_text(s, ":by", r.retired_by);
    bind_text(s, ":reason", r.reason);
    bind_instant(s, ":at", r.occurred_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::CurveRetirements, db_.db->getLastInsertRowid());
    append_tally_steps(db_, id, tally_change(&before, after), w.seq, w.settled_totals);
  });
}

CheckId SqliteCurves::add_check(const Check& k) {
  WriteState& w = writing();
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertCheck);
    bind_int(s, ":curve", k.curve_id.value);
    bind_text(s, ":kind", std::string(to_string(k.kind)));
    bind_real(s, ":nominal", k.nominal);
    bind_real(s, ":response", k.response);
    bind_opt_real(s, ":is", k.is_response);
    bind_opt_real(s, ":measured", k.measured);
    bind_opt_real(s, ":recovery", k.recovery_pct);
    bind_opt_real(s, ":low", k.limit_low);
    bind_opt_real(s, ":high", k.limit_high);
    bind_int(s, ":passed", k.passed ? 1 : 0);
    bind_text(s, ":analyst", k.analyst);
    bind_instant(s, ":at", k.occurred_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    const CheckId id{db_.db->getLastInsertRowid()};
    w.add_row(FactTable::Checks, id.value);
    return id;
  });
}

ResultId SqliteCurves::add_result(const Result& r) {
  WriteState& w = writing();
  if (r.status == ResultStatus::RerunRequired) {
    throw std::logic_error("a result is recorded reported or refused; rerun-required is an event");
  }
  return guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertResult);
    bind_text(s, ":sample", r.sample);
    bind_text(s, ":analyte", r.analyte);
    bind_text(s, ":status", std::string(to_string(r.status)));
    bind_opt_int(s, ":curve", opt_id(r.curve_id));
    bind_opt_int(s, ":method", opt_id(r.method_id));
    bind_opt_int(s, ":instrument", opt_id(r.instrument_id));
    bind_real(s, ":response", r.response);
    bind_opt_real(s, ":is", r.is_response);
    bind_int(s, ":m", r.replicates);
    bind_real(s, ":dilution", r.dilution);
    bind_opt_real(s, ":x0", r.x0);
    bind_opt_real(s, ":sd", r.sd_x0);
    bind_opt_real(s, ":conc", r.concentration);
    bind_opt_real(s, ":low", r.ci_low);
    bind_opt_real(s, ":high", r.ci_high);
    bind_text(s, ":flags", tokens_json(r.flags));
    std::vector<Reason> reasons;
    json details = json::array();
    for (const auto& f : r.reasons) {
      reasons.push_back(f.reason);
      details.push_back({{"reason", std::string(to_string(f.reason))},
                         {"since", f.since ? json(format_utc(*f.since)) : json(nullptr)},
                         {"message", f.message}});
    }
    bind_text(s, ":reasons", tokens_json(reasons));
    bind_text(s, ":details", details.dump());
    bind_text(s, ":analyst", r.analyst);
    bind_instant(s, ":at", r.occurred_at);
    bind_int(s, ":seq", w.seq);
    bind_opt_text(s, ":censored", r.censored ? std::optional<std::string>("<") : std::nullopt);
    bind_opt_real(s, ":limit", r.reporting_limit);
    bind_opt_real(s, ":computed", r.computed_concentration);
    if (r.uncertainty) {
      bind_text(s, ":uncertainty", uncertainty_json(*r.uncertainty));
    } else {
      bind_opt_text(s, ":uncertainty", std::nullopt);
    }
    s.exec();
    const ResultId id{db_.db->getLastInsertRowid()};
    w.add_row(FactTable::Results, id.value);
    return id;
  });
}

void SqliteCurves::add_refusal(const Refusal& r) {
  WriteState& w = writing();
  if (actor_ == nullptr) throw std::logic_error("a refusal without an actor");
  guarded(db_, [&] {
    auto& s = db_.statement(sql::kInsertRefusal);
    bind_text(s, ":action", r.action);
    bind_text(s, ":kind", r.entity_kind);
    bind_text(s, ":id", r.entity_id);
    bind_text(s, ":actor", actor_->name);
    bind_text(s, ":reasons", tokens_json(r.reasons));
    bind_text(s, ":message", r.message);
    bind_instant(s, ":at", r.occurred_at);
    bind_int(s, ":seq", w.seq);
    s.exec();
    w.add_row(FactTable::Refusals, db_.db->getLastInsertRowid());
  });
}

}  // namespace cw::store::sqlite
