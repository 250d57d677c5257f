// SPDX-License-Identifier: Apache-2.0
// The table of commands (product.md §4).
#include "cli/command_table.h"

#include "cli/handlers.h"

namespace cw::cli {

const char* const kCautionText =
    "Curvewarden records calibration data and applies the rules your laboratory has configured. "
    "It supports your quality system and never replaces it: your SOPs and method validation, your "
    "accreditation body and the regulations that apply to you decide acceptance criteria, "
    "intervals and reporting. Limits in the examples come from published documents and common "
    "practice and may not suit your method. A qualified, authorised person reviews every result "
    "before it is released.";

namespace {

using K = OptionKind;
namespace h = handlers;

OptionSpec flag(std::string_view name, std::string_view help) {
  return {name, "", help, K::Flag, false};
}
OptionSpec value(std::string_view name, std::string_view value_name, std::string_view help,
                 bool required = false) {
  return {name, value_name, help, K::Value, required};
}
OptionSpec repeated(std::string_view name, std::string_view value_name, std::string_view help,
                    bool required = false) {
  return {name, value_name, help, K::Repeated, required};
}
OptionSpec positional(std::string_view name, std::string_view help) {
  return {name, "", help, K::Positional, true};
}

const OptionSpec kCsv = flag("--csv",
                             "Print the rows as CSV (RFC 4180, UTC times, full-precision numbers; "
                             "the README lists the columns)");
const OptionSpec kKey = value("--key", "FILE",
                              "The lab's Ed25519 key file (else $CURVEWARDEN_KEY, else the store "
                              "file's path with .key added; a PostgreSQL store has no default)");
const OptionSpec kReason = value("--reason", "TEXT", "Why (required; up to 2000 characters)", true);

}  // namespace

const std::vector<OptionSpec>& global_options() {
  static const std::vector<OptionSpec> options = {
      value("--db", "PATH|URI",
            "Store file, or a postgresql:// URI (else $CURVEWARDEN_DB, else ./curvewarden.db)"),
      value("--as", "CODE",
            "Registered user acting (else $CURVEWARDEN_USER, else the login name); commands "
            "that record need an enabled user"),
      value("--at", "TIME",
            "When it happened / as of when (ISO-8601 with zone; default now; an event may not "
            "be dated more than 5 minutes ahead)"),
      flag("--json", "Print one JSON document on stdout"),
      flag("--follow-symlink", "Open a store whose path is a symbolic link (refused otherwise)"),
      value("--passphrase-fd", "N",
            "Read passphrases of signed acts from this file descriptor, one per line (else they "
            "are asked on the terminal, without echo)"),
  };
  return options;
}

const std::vector<CommandSpec>& command_table() {
  static const std::vector<CommandSpec> table = {
      {"init",
       "Create the store (idempotent; applies pending migrations; on PostgreSQL prints the grants)",
       {value("--lab", "NAME", "Name of the laboratory; renaming an existing lab needs --reason"),
        value("--tz", "ZONE",
              "IANA time zone of the lab (default: the system zone); fixed once the store holds "
              "records"),
        value("--reason", "TEXT", "Why the lab is renamed (required for a rename)"),
        value("--admin", "CODE",
              "Code of the store's first admin, registered now (default: the acting user); "
              "only while the store has no enabled admin"),
        value("--name", "TEXT", "Full name of the first admin (default: its code)"), kKey,
        value("--group", "NAME",
              "Create the store (and its -wal and -shm files) with mode 0660 for this group, for a "
              "workstation shared by its members (default: 0600, the owner only; files only)")},
       true,
       h::init},

      {"instrument", "Register and list instruments, record service", {}, false, nullptr},
      {"instrument add",
       "Register an instrument",
       {positional("code", "Lab code of the instrument, e.g. IC-02"),
        value("--name", "TEXT", "Description, e.g. 'Ion chromatograph, bay 2'")},
       true,
       h::instrument_add},
      {"instrument list",
       "List instruments with their service status",
       {kCsv},
       false,
       h::instrument_list},
      {"instrument show",
       "Show one instrument and its service history",
       {positional("code", "Instrument code")},
       false,
       h::instrument_show},
      {"instrument service",
       "Take an instrument out of service or return it",
       {positional("code", "Instrument code"), flag("--out", "Take it out of service"),
        flag("--back", "Return it to service"), kReason},
       true,
       h::instrument_service},
      {"instrument columns",
       "Save (or show) the headers an instrument's exports use, for run import and curve log",
       {positional("code", "Instrument code"),
        value("--set", "NAME=HEADER,...",
              "Map columns to the export's headers, e.g. 'position=Seq,sample=Sample "
              "Name,response=Area' (names: position, kind, sample, analyte, response, "
              "is_response, dilution, nominal, level, replicate, exclude, unit)"),
        flag("--clear", "Remove the saved mapping (files must then use the column names)"),
        value("--reason", "TEXT", "Why the mapping is saved or cleared (kept with it)")},
       true,
       h::instrument_columns},

      {"method", "Register methods and their versions", {}, false, nullptr},
      {"method add",
       "Register a new method from its TOML file (version 1)",
       {positional("file", "Method file (TOML, at most 1 MiB)")},
       true,
       h::method_add},
      {"method revise",
       "Register the next version of a method",
       {positional("file", "Method file (TOML) with the same code"),
        value("--reason", "TEXT", "Why the method changed (required)", true)},
       true,
       h::method_revise},
      {"method list", "List methods with the version in force", {kCsv}, false, h::method_list},
      {"method show",
       "Show a method version (default: the one in force)",
       {positional("code", "Method code"), value("--version", "N", "Version number")},
       false,
       h::method_show},

      {"lot", "Reference-material lots", {}, false, nullptr},
      {"lot add",
       "Register a lot with its certified values",
       {positional("code", "Lot code"),
        value("--material", "TEXT", "What the material is (required)", true),
        value("--expires", "DATE", "Certificate expiry date, YYYY-MM-DD (required)", true),
        value("--opened", "DATE", "Date the lot was opened, YYYY-MM-DD"),
        value("--in-use-days", "N", "Days the opened lot may be used (1 to 36500)"),
        value("--certificate", "TEXT", "Certificate number or reference"),
        value("--coverage-factor", "K",
              "Coverage factor of the certified uncertainties (U = k·u; default 2)"),
        repeated("--value", "ANALYTE=CONC[±U]",
                 "Certified value, e.g. nitrate=1000±5; repeat for each analyte", true)},
       true,
       h::lot_add},
      {"lot list", "List lots with their status", {kCsv}, false, h::lot_list},
      {"lot show", "Show one lot", {positional("code", "Lot code")}, false, h::lot_show},
      {"lot withdraw",
       "Withdraw a lot: curves made with it stop being valid",
       {positional("code", "Lot code"), kReason},
       true,
       h::lot_withdraw},

      {"curve", "Log, list, show, review and retire calibration curves", {}, false, nullptr},
      {"curve log",
       "Fit, judge and store one calibration (one curve per analyte); exit 3 if any is rejected",
       {value("--method", "CODE", "Method code (the version in force at --at is used)", true),
        value("--instrument", "CODE", "Instrument code", true),
        repeated("--lot", "CODE[,CODE]",
                 "Reference-material lot code(s), comma-separated or repeated", true),
        value("--points", "FILE",
              "Points file (CSV: analyte,level,nominal,response[,replicate][,is_response]"
              "[,exclude]; at most 16 MiB)",
              true),
        value("--note", "TEXT", "Free-text note kept with the calibration"),
        value("--columns", "NAME=HEADER,...",
              "Read the points file's own headers, e.g. 'nominal=Conc,response=Area' (default: "
              "the instrument's saved columns; other headers are then ignored)")},
       true,
       h::curve_log},
      {"curve list",
       "List curves with their state now (or --at)",
       {value("--state", "STATE",
              "Only this state: rejected, awaiting-review, active, stale, retired"),
        value("--method", "CODE", "Only this method"),
        value("--instrument", "CODE", "Only this instrument"),
        value("--analyte", "NAME", "Only this analyte"), kCsv},
       false,
       h::curve_list},
      {"curve show",
       "Show a curve: fit report, points, state and reasons",
       {positional("id", "Curve id"),
        value("--plot", "FILE",
              "Also draw the curve, its band, limits and %RE panel to FILE (.svg, .png or .pdf)")},
       false,
       h::curve_show},
      {"curve review",
       "Second-person review (the reviewer must not be the analyst)",
       {positional("id", "Curve id"), flag("--approve", "Approve the curve for use"),
        flag("--reject", "Reject the curve"), kReason},
       true,
       h::curve_review},
      {"curve retire",
       "Withdraw a curve from use",
       {positional("id", "Curve id"), kReason},
       true,
       h::curve_retire},

      {"check", "Check standards and blanks", {}, false, nullptr},
      {"check list",
       "List checks and blanks (at or before --at), oldest first",
       {value("--curve", "ID", "Only the checks of this curve"),
        value("--since", "TIME", "Only checks at or after this time"), kCsv},
       false,
       h::check_list},
      {"check log",
       "Record a check standard or blank against a curve (exit 3 if it fails)",
       {value("--curve", "ID", "Curve id", true),
        value("--nominal", "CONC", "Nominal concentration of the check standard"),
        value("--response", "R", "Measured response", true),
        value("--is-response", "R", "Internal-standard response (methods with one)"),
        value("--kind", "KIND", "check (default) or blank")},
       true,
       h::check_log},

      {"quantify",
       "Quantify one sample (95 % CI) or refuse with every reason (exit 3)",
       {value("--curve", "ID", "Curve id (or give --method, --instrument and --analyte)"),
        value("--method", "CODE", "Method code: the one active curve is used"),
        value("--instrument", "CODE", "Instrument code"),
        value("--analyte", "NAME", "Analyte name"),
        repeated("--response", "R",
                 "Sample response; repeat for replicate readings (their mean is used)", true),
        value("--is-response", "R", "Internal-standard response (methods with one)"),
        value("--dilution", "F",
              "Dilution factor applied to the concentration and its interval (default 1)"),
        value("--replicates", "M", "Number of readings the --response value is the mean of"),
        value("--sample", "ID", "Sample id (required)", true)},
       true,
       h::quantify},

      {"run", "Import instrument sequences (runs) and show them", {}, false, nullptr},
      {"run import",
       "Import a sequence in injection order: quantify samples, judge checks and blanks, apply "
       "bracketing (exit 3 if a result was refused or must be re-run, or a check failed)",
       {positional("file",
                   "Run file (CSV: position,kind,sample,analyte,response[,is_response]"
                   "[,dilution][,nominal]; at most 256 MiB)"),
        value("--method", "CODE", "Method code (the version in force at --at is used)", true),
        value("--instrument", "CODE", "Instrument code", true),
        flag("--again", "Import a file that was imported before (needs --reason)"),
        value("--reason", "TEXT", "Why the same file is imported again (with --again)"),
        value("--columns", "NAME=HEADER,...",
              "Read the export's own headers, e.g. 'position=Seq,sample=Sample Name,"
              "response=Area' (default: the instrument's saved columns; other headers are then "
              "ignored)")},
       true,
       h::run_import},
      {"run list", "List imported runs with their counts", {kCsv}, false, h::run_list},
      {"run show",
       "Show a run: counts per analyte, every sample row and every check and blank row",
       {positional("id", "Run id")},
       false,
       h::run_show},

      {"result", "List and show results", {}, false, nullptr},
      {"result list",
       "List results (at or before --at) with their current status, oldest first",
       {value("--sample", "ID", "Only this sample"),
        value("--status", "STATUS", "Only this current status: reported, refused, rerun-required"),
        value("--since", "TIME", "Only results quantified at or after this time"),
        value("--run", "ID", "Only the results of this run"), kCsv},
       false,
       h::result_list},
      {"result show",
       "Show a result with its current status and status history",
       {positional("id", "Result id")},
       false,
       h::result_show},

      {"trend",
       "Check-standard recoveries over time: control limits, Westgard violations, a text chart",
       {value("--method", "CODE", "Method code", true),
        value("--instrument", "CODE", "Instrument code", true),
        value("--analyte", "NAME", "Analyte name", true),
        value("--last", "N", "Show only the last N checks (the rules still see every check)"),
        value("--plot", "FILE",
              "Also draw the control chart: recoveries, mean, ±2s and ±3s, violations marked "
              "(.svg, .png or .pdf)"),
        kCsv},
       false,
       h::trend},

      {"expiring",
       "Active curves whose validity ends in a window, soonest first",
       {flag("--this-week", "The lab-local ISO week (Monday to Sunday) holding now"),
        value("--within", "DURATION", "From now for this long, e.g. '3 days' (default 7 days)"),
        kCsv},
       false,
       h::expiring},
      {"status",
       "One screen per instrument: curves by state, expiring, blocked, failures",
       {kCsv},
       false,
       h::status},

      {"trace", "Provenance: of a result, of a curve, the impact of a lot", {}, false, nullptr},
      {"trace result",
       "The curve, calibration, method version, instrument, lots and checks of a result",
       {positional("id", "Result id")},
       false,
       h::trace_result},
      {"trace curve",
       "Every check and result a curve produced",
       {positional("id", "Curve id"), kCsv},
       false,
       h::trace_curve},
      {"trace lot",
       "Every curve made with a lot and every result those curves produced",
       {positional("code", "Lot code"), kCsv},
       false,
       h::trace_lot},

      {"report", "Printable reports (A4 PDF) to review and sign", {}, false, nullptr},
      {"report curve",
       "The calibration report of a curve: identification, plot, fit, points, every criterion, "
       "the state now, the audit entries and fields to sign",
       {positional("id", "Curve id"),
        {"--out", "FILE.pdf", "Write the report to this PDF file (replaced if it exists)",
         OptionKind::Value, true}},
       false,
       h::report_curve},
      {"report run",
       "The report of an imported run: every sample with its released value, uncertainty, flags "
       "and reasons, every check and blank, the bracketing outcome per analyte, the audit entries",
       {positional("id", "Run id"),
        {"--out", "FILE.pdf", "Write the report to this PDF file (replaced if it exists)",
         OptionKind::Value, true}},
       false,
       h::report_run},

      {"user", "Registered users and their roles", {}, false, nullptr},
      {"user add",
       "Register a user (admin only); codes ignore case and are never reused",
       {positional("code", "User code, e.g. r.okafor (letters, digits, . _ - /)"),
        value("--name", "TEXT", "Full name, shown with every signature (required)", true),
        value("--role", "ROLE",
              "analyst (log), reviewer (also review and retire curves), quality (also methods, "
              "lot withdrawal, instruments) or admin (everything, and users) (required)",
              true)},
       true,
       h::user_add},
      {"user list", "List users with their role and status", {kCsv}, false, h::user_list},
      {"user show",
       "Show a user: role, status, what the role allows, history",
       {positional("code", "User code")},
       false,
       h::user_show},
      {"user disable",
       "Disable a user (admin only): it can no longer act; its records stay",
       {positional("code", "User code"), kReason},
       true,
       h::user_disable},
      {"user enable",
       "Enable a user again, or change its role (admin only)",
       {positional("code", "User code"),
        value("--role", "ROLE", "New role: analyst, reviewer, quality or admin"), kReason},
       true,
       h::user_enable},
      {"user unlock",
       "End a user's lockout after repeated wrong passphrases (admin only, signed)",
       {positional("code", "User code"), kReason},
       true,
       h::user_unlock},
      {"user passphrase",
       "Set your passphrase (the current one first), or as an admin another user's (signed); "
       "only its Argon2id hash is kept",
       {{"code", "", "User code (default: yourself)", OptionKind::Positional, false}},
       true,
       h::user_passphrase},

      {"audit", "Read and verify the audit trail", {}, false, nullptr},
      {"audit log",
       "List audit entries",
       {value("--since", "TIME", "Only entries recorded at or after this time"),
        value("--entity", "KIND",
              "Only this kind: lab, user, instrument, method, lot, calibration, curve, check, "
              "result, run, sample"),
        value("--id", "ID", "Only this entity id (a code or a number)"), kCsv},
       false,
       h::audit_log},
      {"audit verify",
       "Recompute the hash chain, check every fact row, the append-only guards and the derived "
       "counts of expired curves (exit 5 if broken, 4 if guards or counts are wrong)",
       {repeated("--anchor", "FILE",
                 "Also check that the trail still contains this signed checkpoint (repeat for "
                 "several); exit 5 naming the first it does not"),
        kKey},
       false,
       h::audit_verify},
      {"audit anchor",
       "Write a checkpoint of the trail (entry count, head hash, time) signed with the lab key, "
       "to keep off this machine",
       {{"--out", "FILE", "Write the checkpoint to this file (replaced if it exists)",
         OptionKind::Value, true},
        kKey},
       false,
       h::audit_anchor},

      {"backup",
       "Copy the store to a new file while others may write (one consistent snapshot), and verify "
       "the copy before reporting success",
       {positional("file", "The new file (never replaced; created with mode 0600)")},
       false,
       h::backup},

      {"store", "Move a whole store to another file or backend", {}, false, nullptr},
      {"store copy",
       "Copy a whole store (every fact and the audit trail, verbatim) into an empty store, "
       "verifying the source first and the copy after: both have the same head hash (the derived "
       "counts of expired curves are built afresh from the copied facts)",
       {value("--from", "STORE",
              "The store to copy (a file path or a postgresql:// URI); it is only read, and "
              "refused when it needs an upgrade to the latest schema",
              true),
        value("--to", "STORE",
              "The destination: a new file (created with mode 0600, removed if the copy fails) "
              "or a store that holds nothing yet",
              true)},
       false,
       h::store_copy},

      {"help", "Show the help of a command: curvewarden help curve log", {}, false, nullptr},
  };
  return table;
}

const CommandSpec* find_command(std::string_view path) {
  for (const auto& c : command_table()) {
    if (c.path == path) return &c;
  }
  return nullptr;
}

}  // namespace cw::cli
