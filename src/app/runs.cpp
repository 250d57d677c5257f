// SPDX-License-Identifier: Apache-2.0
// Run import and the listings of runs, results and checks.
#include "app/runs.h"

#include <algorithm>
#include <map>
#include <set>

#include "app/fact_set.h"
#include "app/quantitation.h"
#include "app/refusal.h"
#include "app/registry.h"
#include "app/users.h"
#include "core/error.h"
#include "core/text.h"
#include "domain/bracketing.h"
#include "domain/check_judgement.h"
#include "domain/quantitation.h"
#include "import/run_file.h"
#include "rules/curve_facts.h"
#include "rules/westgard.h"

namespace cw::app {
namespace {

/// How often the progress callback is called.
constexpr long kProgressEvery = 2000;

/// What a run is imported against, loaded and checked at the run's time.
struct RunBasis {
  Method method;
  const MethodVersion* version = nullptr;  ///< points into `method`
  Instrument instrument;
  std::optional<import::HeaderMapping> mapping;
};

RunBasis load_basis(store::ReadUnit& unit, const RunImportRequest& r, Instant at,
                    const LabZone& zone) {
  RunBasis b;
  b.method = get_method(unit, r.method);
  b.instrument = get_instrument(unit, r.instrument);
  // `version` must point into the object's own copy: set after the copy is in place.
  if (!b.method.version_at(at)) {
    throw ValidationError(
        "method " + quote(b.method.code) + " has no version in force at " + zone.format_local(at),
        "version 1 took effect " + zone.format_local(b.method.versions.front().effective_at));
  }
  if (at < b.instrument.registered_at) {
    throw ValidationError("instrument " + quote(b.instrument.code) + " was registered only at " +
                          zone.format_local(b.instrument.registered_at));
  }
  if (const ServiceEvent* out = b.instrument.out_of_service_event_at(at)) {
    throw ValidationError(
        "instrument " + quote(b.instrument.code) + " is out of service since " +
            zone.format_local(out->occurred_at) + " (" + out->reason + ")",
        "return it with 'instrument service " + b.instrument.code + " --back --reason ...' first");
  }
  if (r.columns) {
    b.mapping = import::HeaderMapping{*r.columns, "--columns"};
  } else if (const SavedColumns* saved = b.instrument.columns_at(at)) {
    b.mapping = import::HeaderMapping{saved->columns,
                                      "the saved columns of instrument " + b.instrument.code};
  }
  return b;
}

/// What the first reading of the file found.
struct FileScan {
  std::string sha256;
  long rows = 0;
  std::set<std::string> analytes;
  std::set<std::string> checked;  ///< analytes with check or blank rows
  std::vector<std::string> ignored_columns;
};

FileScan scan_file(const RunImportRequest& r, const RunBasis& b) {
  FileScan scan;
  import::RunFileReader reader(r.file, b.version->definition, b.mapping ? &*b.mapping : nullptr);
  scan.ignored_columns = reader.header().ignored();
  while (auto row = reader.next()) {
    scan.analytes.insert(row->analyte);
    if (row->kind != RunRowKind::Sample) scan.checked.insert(row->analyte);
    if (r.progress && reader.rows() % kProgressEvery == 0) {
      r.progress({RunProgress::Phase::Checking, reader.rows(), 0});
    }
  }
  scan.sha256 = reader.sha256();
  scan.rows = reader.rows();
  return scan;
}

/// One analyte of the run: its curve, the facts its state is evaluated from (with the run's
/// checks appended as they come) and its bracket.
struct AnalyteRun {
  std::string analyte;
  CurveId curve;
  rules::CurveFacts facts;  ///< a copy: checks grow with the run
  std::vector<const rules::CurveFacts*> newer;
  CurveStatus status;
  CurveStatus status_at_start;
  std::optional<Bracket> bracket;
  bool trend = false;  ///< the method's trend rules read the group's checks
  bool dirty = false;  ///< checks were added since `status` was evaluated
};

/// The curve an analyte of the run is measured against: the group's active curve; else one
/// whose only stale reason is check-overdue (the run's opening check can verify it again); else
/// the newest live curve that checks can be recorded against (stale or awaiting review: its
/// checks are judged, its samples refused). Nullopt when there is none.
std::optional<CurveId> choose_run_curve(const std::vector<CurveId>& live_newest_first,
                                        const std::map<CurveId, CurveStatus>& states) {
  for (CurveId id : live_newest_first) {
    if (states.at(id).state == CurveState::Active) return id;
  }
  for (CurveId id : live_newest_first) {
    const CurveStatus& st = states.at(id);
    if (st.state != CurveState::Stale) continue;
    const bool only_overdue =
        std::all_of(st.reasons.begin(), st.reasons.end(),
                    [](const Finding& f) { return f.reason == Reason::CheckOverdue; });
    if (only_overdue) return id;
  }
  for (CurveId id : live_newest_first) {
    const CurveState state = states.at(id).state;
    if (state == CurveState::Stale || state == CurveState::AwaitingReview) return id;
  }
  return std::nullopt;
}

/// Reading labels of a run file's columns (for messages of the decisions): the file's own
/// headers where a mapping renames them.
ReadingLabels run_labels(const import::CsvHeader& header) {
  return ReadingLabels{header.label("nominal"), header.label("response"),
                       header.label("is_response"), header.label("dilution")};
}

/// The column a decision's error is about: the last label its message names (the decisions
/// name the value to change last, e.g. "the recovery from 'response' and 'nominal'").
std::string blamed_column(const std::string& message, const ReadingLabels& labels) {
  std::string best = "response";
  std::size_t at = 0;
  for (const auto& [name, label] :
       {std::pair<const char*, const std::string&>{"nominal", labels.nominal},
        {"response", labels.response},
        {"is_response", labels.is_response},
        {"dilution", labels.dilution}}) {
    const auto pos = message.rfind(label);
    if (pos != std::string::npos && pos >= at) {
      at = pos;
      best = name;
    }
  }
  return best;
}

std::string result_summary(const Result& result) {
  std::string summary =
      result.sample + " " + result.analyte + ": " + std::string(to_string(result.status));
  for (const auto& f : result.reasons) summary += " " + std::string(to_string(f.reason));
  return summary;
}

RunView make_run_view(store::ReadUnit& unit, FactSet& facts, const Run& run) {
  RunView v;
  v.run = run;
  const Method& m = facts.method(run.method_id);
  v.method_code = m.code;
  for (const auto& version : m.versions) {
    if (version.id == run.method_version_id) {
      v.method_version = version.version;
      v.unit = version.definition.unit;
    }
  }
  v.instrument_code = facts.instrument(run.instrument_id).code;
  v.summary = unit.runs().run_summary(run.id);
  return v;
}

}  // namespace

RunImportOutcome import_run(Session& s, const RunImportRequest& r) {
  const Instant at = s.at();
  if (r.again != r.reason.has_value()) {
    throw UsageError(r.again ? "--again needs --reason TEXT" : "--reason goes with --again",
                     "--again --reason TEXT imports a file that was imported before, on purpose");
  }
  // 1. Outside the write lock: what the file is read against, and the whole file checked.
  RunBasis basis;
  {
    auto unit = s.read();
    basis = load_basis(*unit, r, at, s.zone());
    basis.version = basis.method.version_at(at);
  }
  const FileScan scan = scan_file(r, basis);

  // 2. One transaction: the same checks on the current facts, then every row decided in order.
  auto unit = s.write();
  authorize(s, *unit, Permission::Log, "run.import", "method", r.method);
  RunBasis now = load_basis(*unit, r, at, s.zone());
  now.version = now.method.version_at(at);
  const MethodDefinition& definition = now.version->definition;

  RunImportOutcome out;
  out.method_code = now.method.code;
  out.method_version = now.version->version;
  out.instrument_code = now.instrument.code;
  out.unit = definition.unit;
  out.columns_source = now.mapping ? now.mapping->source : "";
  out.ignored_columns = scan.ignored_columns;

  const auto previous = unit->runs().runs_with_sha256(scan.sha256);
  if (!previous.empty() && !r.again) {
    const Run& p = previous.back();
    refuse(*unit, "run.import", "run", std::to_string(p.id.value), {Reason::AlreadyImported},
           "'" + import::recorded_name(r.file) + "' (sha256 " + scan.sha256 +
               ") was imported before as run " + std::to_string(p.id.value) + " at " +
               s.zone().format_local(p.acquired_at) + " by " + p.analyst +
               "; nothing of it was imported again",
           at,
           "a sequence is imported once; to import the same file again on purpose, give "
           "--again --reason TEXT");
  }
  if (previous.empty() && r.again) {
    throw UsageError("--again: '" + import::recorded_name(r.file) +
                         "' was never imported (sha256 " + scan.sha256 + ")",
                     "leave out --again and --reason");
  }

  // The curve of every analyte in the file, chosen at the run's time.
  FactSet facts(*unit, s.zone());
  std::map<std::string, AnalyteRun> analytes;
  std::vector<std::string> without_curve;
  for (const auto& analyte : scan.analytes) {
    const auto live =
        unit->curves().live_in_group(now.method.id, now.instrument.id, analyte, std::nullopt, at);
    const auto states = facts.live_statuses(live, at);
    const auto chosen = choose_run_curve(live, states);
    if (!chosen) {
      without_curve.push_back(analyte);
      continue;
    }
    AnalyteRun a;
    a.analyte = analyte;
    a.curve = *chosen;
    facts.load(live);  // in one batch: the chosen curve and its newer ones are read in full
    // Its points too: the release limit and a check's range start at its lowest calibrator.
    facts.load({*chosen}, store::CurveDetail::Points);
    a.facts = facts.facts(*chosen);
    for (CurveId other : live) {
      const Curve& o = facts.curve(other);
      if (other != *chosen && o.acquired_at >= a.facts.curve->acquired_at) {
        a.newer.push_back(&facts.facts(other));
      }
    }
    a.status = states.at(*chosen);
    a.status_at_start = a.status;
    a.trend = !rules::rejection_rules(a.facts.version().definition.check.trend_rules).empty();
    analytes.emplace(analyte, std::move(a));
  }
  if (!without_curve.empty()) {
    std::string list;
    for (const auto& a : without_curve) list += (list.empty() ? "" : ", ") + a;
    refuse(*unit, "run.import", "run", import::recorded_name(r.file), {Reason::NoActiveCurve},
           "no curve of method " + now.method.code + " on instrument " + now.instrument.code +
               " can take the run's rows for " + list + " at " + s.zone().format_local(at) +
               " (none active, stale or awaiting review); nothing of the run was imported",
           at,
           "log a calibration for each analyte first ('curvewarden curve log'), or leave the "
           "analyte out of the file");
  }

  Run run;
  run.method_id = now.method.id;
  run.method_version_id = now.version->id;
  run.instrument_id = now.instrument.id;
  run.acquired_at = at;
  run.analyst = s.actor().name;
  run.file_name = import::recorded_name(r.file);
  run.file_sha256 = scan.sha256;
  run.rows = scan.rows;
  if (now.mapping) run.columns = now.mapping->entries;
  run.again_reason = r.reason;
  run.id = unit->run_writer().add_run(run);
  unit->append_entry({"run.import", "run", std::to_string(run.id.value), r.reason, at});
  out.run = run;

  // Brackets start from each curve's last passing check standard before the run.
  for (auto& [analyte, a] : analytes) {
    const SinceLastPass since = since_last_pass(a.facts.checks, at);
    const auto reported = unit->curves().reported_between(a.curve, since.at, since.check, at);
    std::vector<ResultId> open;
    for (const auto& result : reported) {
      if (result.current_status() != ResultStatus::RerunRequired) open.push_back(result.id);
    }
    a.bracket.emplace(a.facts.version().definition.check.samples_per_check,
                      static_cast<long>(reported.size()), std::move(open), since.check);
    out.curves.push_back({analyte, a.curve, a.status_at_start});
  }

  const auto rerun = [&](const RerunDecision& d) {
    record_rerun(*unit, d, run.id, at);
    ++out.status_events;
  };
  import::RunFileReader reader(r.file, definition, now.mapping ? &*now.mapping : nullptr);
  const ReadingLabels labels = run_labels(reader.header());
  while (auto row = reader.next()) {
    AnalyteRun& a = analytes.at(row->analyte);
    const MethodDefinition& curve_definition = a.facts.version().definition;
    const Curve& curve = *a.facts.curve;
    try {
      if (row->kind == RunRowKind::Sample) {
        if (a.dirty && !(a.bracket->has_failed() && !a.status.is_usable())) {
          // The curve's state changes only with its checks: evaluate it again before the next
          // sample needs it (once the analyte has failed in the run it stays refused).
          a.status = rules::evaluate(a.facts, at, s.zone(), a.newer);
          a.dirty = false;
        }
        const QuantitationReading reading{row->response, row->is_response, 1, row->dilution};
        const QuantitationDecision d =
            decide_quantitation(curve, a.status, curve_definition, a.facts.lots, reading, labels);
        Result result;
        result.sample = row->sample;
        result.analyte = row->analyte;
        result.curve_id = a.curve;
        result.method_id = now.method.id;
        result.instrument_id = now.instrument.id;
        result.response = row->response;
        result.is_response = row->is_response;
        result.replicates = 1;
        result.dilution = row->dilution;
        record_decision(result, d);
        result.analyst = s.actor().name;
        result.occurred_at = at;
        result.id = unit->curve_writer().add_result(result);
        unit->run_writer().add_run_result(run.id, row->position, result.id);
        unit->append_entry(
            {result.status == ResultStatus::Reported ? "result.report" : "result.refuse", "result",
             std::to_string(result.id.value), result_summary(result), at});
        if (auto decision = a.bracket->on_sample(result.id, result.status == ResultStatus::Reported,
                                                 row->position)) {
          rerun(*decision);
        }
      } else {
        CheckReading reading;
        reading.kind = row->kind == RunRowKind::Check ? CheckKind::Check : CheckKind::Blank;
        reading.nominal = row->nominal;
        reading.response = row->response;
        reading.is_response = row->is_response;
        Check check = judge_check(reading, curve, curve_definition, labels);
        check.curve_id = a.curve;
        check.analyst = s.actor().name;
        check.occurred_at = at;
        check.id = unit->curve_writer().add_check(check);
        const std::optional<std::string> label =
            row->sample.empty() ? std::nullopt : std::optional<std::string>(row->sample);
        unit->run_writer().add_run_check(run.id, row->position, check.id, label);
        unit->append_entry({"check.log", "check", std::to_string(check.id.value),
                            std::string(to_string(check.kind)) +
                                (check.passed ? " passed" : " FAILED") + " on curve " +
                                std::to_string(a.curve.value) + " in run " +
                                std::to_string(run.id.value),
                            at});
        check.run_id = run.id;
        if (!check.passed) {
          out.failures.push_back(
              {row->position, a.analyte, check.id, describe_failure(check, row->position)});
        }
        a.facts.checks.push_back(check);
        if (a.trend) a.facts.group_checks.push_back(check);
        a.dirty = true;
        for (const auto& decision : a.bracket->on_check(check, row->position)) rerun(decision);
      }
    } catch (ValidationError& e) {
      if (!e.location()) {
        const std::string column = blamed_column(e.what(), labels);
        e.set_location(reader.error_at(row->line, column, "").location().value());
      }
      throw;
    }
    if (r.progress && reader.rows() % kProgressEvery == 0) {
      r.progress({RunProgress::Phase::Importing, reader.rows(), scan.rows});
    }
  }
  if (reader.sha256() != scan.sha256 || reader.rows() != scan.rows) {
    throw ValidationError(
        SourceLocation{import::recorded_name(r.file), std::nullopt, std::nullopt, {}},
        "'" + import::recorded_name(r.file) + "' changed while it was being imported",
        "import it again once nothing is writing to it; nothing was written");
  }
  for (auto& [analyte, a] : analytes) {
    for (const auto& decision : a.bracket->on_end()) rerun(decision);
  }
  out.summary = unit->runs().run_summary(run.id);
  unit->commit();
  if (r.progress) r.progress({RunProgress::Phase::Importing, scan.rows, scan.rows});
  return out;
}

std::vector<RunView> list_runs(Session& s) {
  auto unit = s.read();
  FactSet facts(*unit, s.zone());
  std::vector<RunView> out;
  for (const auto& run : unit->runs().runs(s.at())) out.push_back(make_run_view(*unit, facts, run));
  return out;
}

namespace {

/// Shows run `id` from `unit` to `visitor`; returns the run.
Run visit_run(store::ReadUnit& unit, FactSet& facts, RunId id, RunVisitor& visitor) {
  const auto run = unit.runs().run(id);
  if (!run) {
    throw NotFoundError("no run " + std::to_string(id.value),
                        "list runs with 'curvewarden run list'");
  }
  const RunView view = make_run_view(unit, facts, *run);
  visitor.begin(view);
  unit.runs().each_run_result(id, [&](const store::RunResultRow& row) { visitor.result(row); });
  unit.runs().each_run_check(id, [&](const store::RunCheckRow& row) { visitor.check(row); });
  visitor.end(view);
  return *run;
}

}  // namespace

void show_run(Session& s, RunId id, RunVisitor& visitor) {
  auto unit = s.read();
  FactSet facts(*unit, s.zone());
  visit_run(*unit, facts, id, visitor);
}

RunReportContext show_run_for_report(Session& s, RunId id, RunVisitor& visitor) {
  auto unit = s.read();
  FactSet facts(*unit, s.zone());
  const Run run = visit_run(*unit, facts, id, visitor);
  RunReportContext c;
  if (const auto settings = unit->registry().settings()) c.lab_name = settings->lab_name;
  const Method& m = facts.method(run.method_id);
  for (const auto& v : m.versions) {
    if (v.id == run.method_version_id) c.method_title = v.definition.title;
  }
  c.instrument_name = facts.instrument(run.instrument_id).name;
  c.entries = unit->audit().list({std::nullopt, std::string("run"), std::to_string(id.value)});
  c.head = unit->audit().head();
  return c;
}

void list_results(Session& s, const ResultListRequest& r,
                  const std::function<void(const Result&, const std::string& unit)>& fn) {
  auto unit = s.read();
  if (r.run && !unit->runs().run(*r.run)) {
    throw NotFoundError("no run " + std::to_string(r.run->value),
                        "list runs with 'curvewarden run list'");
  }
  FactSet facts(*unit, s.zone());
  std::map<MethodId, std::string> units;
  const auto unit_of = [&](const Result& result) -> const std::string& {
    static const std::string none;
    if (!result.method_id) return none;
    auto it = units.find(*result.method_id);
    if (it == units.end()) {
      const Method& m = facts.method(*result.method_id);
      const MethodVersion* v = m.version_at(result.occurred_at);
      it = units.emplace(*result.method_id, v ? v->definition.unit : m.latest().definition.unit)
               .first;
    }
    return it->second;
  };
  store::ResultFilter filter;
  filter.sample = r.sample;
  filter.status = r.status;
  filter.since = r.since;
  filter.run = r.run;
  filter.until = s.at();
  unit->runs().each_result(filter, [&](const Result& result) { fn(result, unit_of(result)); });
}

ResultDetail show_result(Session& s, ResultId id) {
  auto unit = s.read();
  auto result = unit->curves().result(id);
  if (!result) {
    throw NotFoundError("no result " + std::to_string(id.value),
                        "list results with 'curvewarden result list'");
  }
  ResultDetail d;
  d.result = *result;
  if (result->method_id) {
    FactSet facts(*unit, s.zone());
    const Method& m = facts.method(*result->method_id);
    const MethodVersion* v = m.version_at(result->occurred_at);
    d.unit = v ? v->definition.unit : m.latest().definition.unit;
  }
  d.history = unit->runs().status_events_of(id);
  return d;
}

std::vector<Check> list_checks(Session& s, const CheckListRequest& r) {
  auto unit = s.read();
  if (r.curve) {
    FactSet facts(*unit, s.zone());
    facts.curve(*r.curve);  // NotFoundError for an unknown curve
  }
  store::CheckFilter filter;
  filter.curve = r.curve;
  filter.since = r.since;
  filter.until = s.at();
  return unit->runs().checks(filter);
}

}  // namespace cw::app
