// SPDX-License-Identifier: Apache-2.0
// The CLI11 command tree. Each subcommand declares its options and, when chosen, sets the
// handler to run after parsing; nothing else happens here.
#include "cli/cli_app.h"

#include <CLI/CLI.hpp>
#include <algorithm>
#include <functional>

#include "cli/commands.h"
#include "cli/error_output.h"
#include "core/error.h"

namespace cw::cli {

const char* const kCautionText =
    "Curvewarden records calibration data and applies the rules your laboratory has configured. "
    "It supports your quality system and never replaces it: your SOPs and method validation, your "
    "accreditation body and the regulations that apply to you decide acceptance criteria, "
    "intervals and reporting. Limits in the examples come from published documents and common "
    "practice and may not suit your method. A qualified, authorised person reviews every result "
    "before it is released.";

namespace {

using Action = std::function<int()>;

/// A subcommand that also accepts the global options after its own name.
CLI::App* sub(CLI::App* parent, const std::string& name, const std::string& description) {
  CLI::App* s = parent->add_subcommand(name, description);
  s->fallthrough();
  return s;
}

std::optional<std::string> given(const CLI::Option* o, const std::string& value) {
  if (o->count() == 0) return std::nullopt;
  return value;
}

/// All option variables live here so that handlers can read them after parsing.
struct Arguments {
  std::string code, name, file, reason, lab, tz, material, expires, opened, certificate;
  std::string since, entity, id;
  std::string method, instrument, points, note, state, analyte;
  std::vector<std::string> lots;
  bool approve = false, reject = false, this_week = false, csv = false;
  double nominal = 0, response_one = 0, is_response = 0, dilution = 1;
  std::vector<double> responses;
  int replicates = 1;
  std::string kind = "check", curve_id, sample, within;
  long in_use_days = 0;
  int version = 0;
  bool out = false, back = false;
  std::vector<std::string> values;
};

void add_registry_commands(CLI::App& app, Ctx& ctx, Arguments& a, Action& action) {
  {
    CLI::App* init = sub(&app, "init", "Create the store (idempotent; applies pending migrations)");
    auto* lab = init->add_option("--lab", a.lab, "Name of the laboratory");
    auto* tz =
        init->add_option("--tz", a.tz, "IANA time zone of the lab (default: the system zone)");
    init->callback([&, lab, tz] {
      action = [&, lab, tz] { return cmd_init(ctx, {given(lab, a.lab), given(tz, a.tz)}); };
    });
  }
  {
    CLI::App* instrument = sub(&app, "instrument", "Register and list instruments, record service");
    instrument->require_subcommand(1);
    CLI::App* add = sub(instrument, "add", "Register an instrument");
    add->add_option("code", a.code, "Lab code of the instrument, e.g. IC-02")->required();
    auto* name = add->add_option("--name", a.name, "Description, e.g. 'Ion chromatograph, bay 2'");
    add->callback([&, name] {
      action = [&, name] { return cmd_instrument_add(ctx, a.code, given(name, a.name)); };
    });

    CLI::App* list = sub(instrument, "list", "List instruments with their service status");
    list->callback([&] { action = [&] { return cmd_instrument_list(ctx); }; });

    CLI::App* show = sub(instrument, "show", "Show one instrument and its service history");
    show->add_option("code", a.code, "Instrument code")->required();
    show->callback([&] { action = [&] { return cmd_instrument_show(ctx, a.code); }; });

    CLI::App* service =
        sub(instrument, "service", "Take an instrument out of service or return it");
    service->add_option("code", a.code, "Instrument code")->required();
    auto* out = service->add_flag("--out", a.out, "Take it out of service");
    auto* back = service->add_flag("--back", a.back, "Return it to service");
    out->excludes(back);
    service->add_option("--reason", a.reason, "Why (required)")->required();
    service->callback([&] {
      if (!a.out && !a.back)
        throw UsageError("give --out or --back",
                         "e.g. instrument service IC-02 --out --reason 'pump seal'");
      action = [&] {
        return cmd_instrument_service(
            ctx, {a.code, a.out ? ServiceDirection::Out : ServiceDirection::Back, a.reason});
      };
    });
  }
  {
    CLI::App* method = sub(&app, "method", "Register methods and their versions");
    method->require_subcommand(1);
    CLI::App* add = sub(method, "add", "Register a new method from its TOML file (version 1)");
    add->add_option("file", a.file, "Method file (TOML)")->required();
    add->callback([&] { action = [&] { return cmd_method_add(ctx, a.file); }; });

    CLI::App* revise = sub(method, "revise", "Register the next version of a method");
    revise->add_option("file", a.file, "Method file (TOML) with the same code")->required();
    revise->add_option("--reason", a.reason, "Why the method changed (required)")->required();
    revise->callback([&] { action = [&] { return cmd_method_revise(ctx, a.file, a.reason); }; });

    CLI::App* list = sub(method, "list", "List methods with the version in force");
    list->callback([&] { action = [&] { return cmd_method_list(ctx); }; });

    CLI::App* show = sub(method, "show", "Show a method version (default: the one in force)");
    show->add_option("code", a.code, "Method code")->required();
    auto* version =
        show->add_option("--version", a.version, "Version number")->check(CLI::PositiveNumber);
    show->callback([&, version] {
      action = [&, version] {
        return cmd_method_show(ctx, a.code,
                               version->count() ? std::optional<int>(a.version) : std::nullopt);
      };
    });
  }
  {
    CLI::App* lot = sub(&app, "lot", "Reference-material lots");
    lot->require_subcommand(1);
    CLI::App* add = sub(lot, "add", "Register a lot with its certified values");
    add->add_option("code", a.code, "Lot code")->required();
    add->add_option("--material", a.material, "What the material is (required)")->required();
    add->add_option("--expires", a.expires, "Certificate expiry date, YYYY-MM-DD (required)")
        ->required();
    auto* opened = add->add_option("--opened", a.opened, "Date the lot was opened, YYYY-MM-DD");
    auto* days = add->add_option("--in-use-days", a.in_use_days, "Days the opened lot may be used");
    auto* cert = add->add_option("--certificate", a.certificate, "Certificate number or reference");
    add->add_option("--value", a.values,
                    "Certified value ANALYTE=CONC[±U]; repeat for each analyte")
        ->required()
        ->allow_extra_args(false);
    add->callback([&, opened, days, cert] {
      action = [&, opened, days, cert] {
        app::LotRequest r;
        r.code = a.code;
        r.material = a.material;
        r.expires = a.expires;
        r.opened = given(opened, a.opened);
        if (days->count()) r.in_use_days = a.in_use_days;
        r.certificate = given(cert, a.certificate);
        r.values = a.values;
        return cmd_lot_add(ctx, r);
      };
    });

    CLI::App* list = sub(lot, "list", "List lots with their status");
    list->callback([&] { action = [&] { return cmd_lot_list(ctx); }; });

    CLI::App* show = sub(lot, "show", "Show one lot");
    show->add_option("code", a.code, "Lot code")->required();
    show->callback([&] { action = [&] { return cmd_lot_show(ctx, a.code); }; });

    CLI::App* withdraw =
        sub(lot, "withdraw", "Withdraw a lot: curves made with it stop being valid");
    withdraw->add_option("code", a.code, "Lot code")->required();
    withdraw->add_option("--reason", a.reason, "Why (required)")->required();
    withdraw->callback([&] { action = [&] { return cmd_lot_withdraw(ctx, a.code, a.reason); }; });
  }
  {
    CLI::App* audit = sub(&app, "audit", "Read and verify the audit trail");
    audit->require_subcommand(1);
    CLI::App* log = sub(audit, "log", "List audit entries");
    auto* since =
        log->add_option("--since", a.since, "Only entries recorded at or after this time");
    auto* entity = log->add_option(
        "--entity", a.entity,
        "Only this kind: lab, instrument, method, lot, calibration, curve, check, result");
    auto* id = log->add_option("--id", a.id, "Only this entity id (a code or a number)");
    log->callback([&, since, entity, id] {
      action = [&, since, entity, id] {
        return cmd_audit_log(ctx,
                             {given(since, a.since), given(entity, a.entity), given(id, a.id)});
      };
    });
    CLI::App* verify = sub(audit, "verify",
                           "Recompute the hash chain and check every fact row (exit 5 if broken)");
    verify->callback([&] { action = [&] { return cmd_audit_verify(ctx); }; });
  }
}

void add_curve_commands(CLI::App& app, Ctx& ctx, Arguments& a, Action& action) {
  CLI::App* curve = sub(&app, "curve", "Log, list, show, review and retire calibration curves");
  curve->require_subcommand(1);

  CLI::App* log = sub(
      curve, "log",
      "Fit, judge and store one calibration (one curve per analyte); exit 3 if any is rejected");
  log->add_option("--method", a.method, "Method code (the version in force at --at is used)")
      ->required();
  log->add_option("--instrument", a.instrument, "Instrument code")->required();
  log->add_option("--lot", a.lots, "Reference-material lot code(s), comma-separated or repeated")
      ->required()
      ->allow_extra_args(false);
  log->add_option(
         "--points", a.points,
         "Points file (CSV: analyte,level,nominal,response[,replicate][,is_response][,exclude])")
      ->required();
  auto* note = log->add_option("--note", a.note, "Free-text note kept with the calibration");
  log->callback([&, note] {
    action = [&, note] {
      return cmd_curve_log(ctx, {a.method, a.instrument, a.lots, a.points, given(note, a.note)});
    };
  });

  CLI::App* list = sub(curve, "list", "List curves with their state now (or --at)");
  auto* state = list->add_option(
      "--state", a.state, "Only this state: rejected, awaiting-review, active, stale, retired");
  auto* method = list->add_option("--method", a.method, "Only this method");
  auto* instrument = list->add_option("--instrument", a.instrument, "Only this instrument");
  auto* analyte = list->add_option("--analyte", a.analyte, "Only this analyte");
  list->callback([&, state, method, instrument, analyte] {
    action = [&, state, method, instrument, analyte] {
      return cmd_curve_list(ctx, {given(state, a.state), given(method, a.method),
                                  given(instrument, a.instrument), given(analyte, a.analyte)});
    };
  });

  CLI::App* show = sub(curve, "show", "Show a curve: fit report, points, state and reasons");
  show->add_option("id", a.id, "Curve id")->required();
  show->callback([&] { action = [&] { return cmd_curve_show(ctx, a.id); }; });

  CLI::App* review =
      sub(curve, "review", "Second-person review (the reviewer must not be the analyst)");
  review->add_option("id", a.id, "Curve id")->required();
  auto* approve = review->add_flag("--approve", a.approve, "Approve the curve for use");
  auto* reject = review->add_flag("--reject", a.reject, "Reject the curve");
  approve->excludes(reject);
  review->add_option("--reason", a.reason, "Why (required)")->required();
  review->callback([&] {
    if (!a.approve && !a.reject) throw UsageError("give --approve or --reject");
    action = [&] {
      return cmd_curve_review(
          ctx, a.id, a.approve ? ReviewDecision::Approve : ReviewDecision::Reject, a.reason);
    };
  });

  CLI::App* retire = sub(curve, "retire", "Withdraw a curve from use");
  retire->add_option("id", a.id, "Curve id")->required();
  retire->add_option("--reason", a.reason, "Why (required)")->required();
  retire->callback([&] { action = [&] { return cmd_curve_retire(ctx, a.id, a.reason); }; });
}

void add_quantitation_commands(CLI::App& app, Ctx& ctx, Arguments& a, Action& action) {
  {
    CLI::App* check = sub(&app, "check", "Check standards and blanks");
    check->require_subcommand(1);
    CLI::App* log =
        sub(check, "log", "Record a check standard or blank against a curve (exit 3 if it fails)");
    log->add_option("--curve", a.curve_id, "Curve id")->required();
    auto* nominal =
        log->add_option("--nominal", a.nominal, "Nominal concentration of the check standard");
    log->add_option("--response", a.response_one, "Measured response")->required();
    auto* is = log->add_option("--is-response", a.is_response,
                               "Internal-standard response (methods with one)");
    log->add_option("--kind", a.kind, "check (default) or blank")
        ->check(CLI::IsMember({"check", "blank"}));
    log->callback([&, nominal, is] {
      action = [&, nominal, is] {
        app::CheckRequest r;
        r.curve = a.curve_id;
        if (nominal->count()) r.nominal = a.nominal;
        r.response = a.response_one;
        if (is->count()) r.is_response = a.is_response;
        r.kind = *parse_check_kind(a.kind);
        return cmd_check_log(ctx, r);
      };
    });
  }
  {
    CLI::App* q =
        sub(&app, "quantify", "Quantify one sample (95 % CI) or refuse with every reason (exit 3)");
    auto* curve = q->add_option("--curve", a.curve_id,
                                "Curve id (or give --method, --instrument and --analyte)");
    auto* method = q->add_option("--method", a.method, "Method code: the one active curve is used");
    auto* instrument = q->add_option("--instrument", a.instrument, "Instrument code");
    auto* analyte = q->add_option("--analyte", a.analyte, "Analyte name");
    q->add_option("--response", a.responses,
                  "Sample response; repeat for replicate readings (their mean is used)")
        ->required()
        ->allow_extra_args(false);
    auto* is = q->add_option("--is-response", a.is_response,
                             "Internal-standard response (methods with one)");
    q->add_option("--dilution", a.dilution,
                  "Dilution factor applied to the concentration and its interval (default 1)");
    auto* reps = q->add_option("--replicates", a.replicates,
                               "Number of readings the --response value is the mean of");
    q->add_option("--sample", a.sample, "Sample id")->required();
    q->callback([&, curve, method, instrument, analyte, is, reps] {
      action = [&, curve, method, instrument, analyte, is, reps] {
        app::QuantifyRequest r;
        r.curve = given(curve, a.curve_id);
        r.method = given(method, a.method);
        r.instrument = given(instrument, a.instrument);
        r.analyte = given(analyte, a.analyte);
        r.responses = a.responses;
        if (is->count()) r.is_response = a.is_response;
        r.dilution = a.dilution;
        if (reps->count()) r.replicates = a.replicates;
        r.sample = a.sample;
        return cmd_quantify(ctx, r);
      };
    });
  }
  {
    CLI::App* e =
        sub(&app, "expiring", "Active curves whose validity ends in a window, soonest first");
    auto* week = e->add_flag("--this-week", a.this_week,
                             "The lab-local ISO week (Monday to Sunday) holding now");
    auto* within = e->add_option("--within", a.within,
                                 "From now for this long, e.g. '3 days' (default 7 days)");
    week->excludes(within);
    e->callback([&, within] {
      action = [&, within] { return cmd_expiring(ctx, {a.this_week, given(within, a.within)}); };
    });
  }
  {
    CLI::App* st = sub(&app, "status",
                       "One screen per instrument: curves by state, expiring, blocked, failures");
    st->callback([&] { action = [&] { return cmd_status(ctx); }; });
  }
  {
    CLI::App* trace =
        sub(&app, "trace", "Provenance: of a result, of a curve, the impact of a lot");
    trace->require_subcommand(1);
    CLI::App* result =
        sub(trace, "result",
            "The curve, calibration, method version, instrument, lots and checks of a result");
    result->add_option("id", a.id, "Result id")->required();
    result->callback([&] { action = [&] { return cmd_trace_result(ctx, a.id); }; });
    CLI::App* curve = sub(trace, "curve", "Every check and result a curve produced");
    curve->add_option("id", a.id, "Curve id")->required();
    curve->callback([&] { action = [&] { return cmd_trace_curve(ctx, a.id); }; });
    CLI::App* lot =
        sub(trace, "lot", "Every curve made with a lot and every result those curves produced");
    lot->add_option("code", a.code, "Lot code")->required();
    lot->add_flag("--csv", a.csv, "Print the affected results as CSV");
    lot->callback([&] { action = [&] { return cmd_trace_lot(ctx, a.code, a.csv); }; });
  }
}

std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diagonal = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t above = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diagonal + (a[i - 1] == b[j - 1] ? 0 : 1)});
      diagonal = above;
    }
  }
  return row[b.size()];
}

/// When parsing failed because a word is not a command at its level ("curvewarden frobnicate",
/// "curvewarden curve lsit"), an error that names it and suggests the nearest command.
std::optional<UsageError> unknown_command(CLI::App& app, const std::vector<std::string>& args) {
  static const std::vector<std::string> kGlobalsWithValue = {"--db", "--as", "--at"};
  CLI::App* level = &app;
  std::string path = "curvewarden";
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& word = args[i];
    if (word.rfind("-", 0) == 0) {
      if (std::find(kGlobalsWithValue.begin(), kGlobalsWithValue.end(), word) != kGlobalsWithValue.end()) ++i;
      continue;
    }
    const auto subcommands = level->get_subcommands([](CLI::App*) { return true; });
    if (subcommands.empty()) return std::nullopt;  // a positional argument of a leaf command
    CLI::App* next = nullptr;
    std::string names, nearest;
    std::size_t best = 3;  // suggest only near misses
    for (CLI::App* sub : subcommands) {
      if (sub->get_name() == word) next = sub;
      names += (names.empty() ? "" : ", ") + sub->get_name();
      if (const std::size_t d = edit_distance(word, sub->get_name()); d < best) {
        best = d;
        nearest = sub->get_name();
      }
    }
    if (next == nullptr) {
      std::string message = "unknown command '" + word + "' for '" + path + "'";
      if (!nearest.empty()) message += ", did you mean '" + nearest + "'?";
      return UsageError(message, "commands here: " + names);
    }
    level = next;
    path += " " + word;
  }
  const auto subcommands = level->get_subcommands([](CLI::App*) { return true; });
  if (subcommands.empty()) return std::nullopt;
  std::string names;
  for (CLI::App* sub : subcommands) names += (names.empty() ? "" : ", ") + sub->get_name();
  return UsageError("'" + path + "' needs a command", "one of: " + names);
}

}  // namespace

int run_cli(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  const bool json_requested = std::find(args.begin(), args.end(), "--json") != args.end();
  Ctx ctx{{}, out, err};
  Arguments a;
  Action action;
  std::string db, as, at;
  try {
    CLI::App app{"curvewarden: keeps calibration curves, their validity and their provenance",
                 "curvewarden"};
    app.footer(std::string("\n") + kCautionText);
    app.require_subcommand(1);
    auto* db_opt =
        app.add_option("--db", db, "Store file (else $CURVEWARDEN_DB, else ./curvewarden.db)");
    auto* as_opt =
        app.add_option("--as", as, "Person acting (else $CURVEWARDEN_USER, else the login name)");
    auto* at_opt = app.add_option(
        "--at", at, "When it happened / as of when (ISO-8601 with zone; default now)");
    app.add_flag("--json", ctx.global.json, "Print one JSON document on stdout");
    app.set_version_flag("--version", "curvewarden 0.1.0");

    add_registry_commands(app, ctx, a, action);
    add_curve_commands(app, ctx, a, action);
    add_quantitation_commands(app, ctx, a, action);

    std::vector<std::string> reversed(args.rbegin(), args.rend());
    try {
      app.parse(reversed);
    } catch (const CLI::Success& e) {  // --help, --version
      return app.exit(e, out, err);
    } catch (const CLI::ParseError& e) {
      if (auto unknown = unknown_command(app, args)) throw *unknown;
      throw UsageError(e.what(), "run 'curvewarden --help' (or 'curvewarden COMMAND --help')");
    }
    if (*db_opt) ctx.global.db = db;
    if (*as_opt) ctx.global.as = as;
    if (*at_opt) ctx.global.at = at;
    if (!action) throw UsageError("no command given", "run 'curvewarden --help'");
    return action();
  } catch (const Error& e) {
    return report_error(e, json_requested || ctx.global.json, out, err);
  } catch (const std::exception& e) {
    return report_internal_error(e.what(), json_requested || ctx.global.json, out, err);
  }
}

}  // namespace cw::cli
