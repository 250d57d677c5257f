// SPDX-License-Identifier: Apache-2.0
// Handlers of the audit commands.
#include <unistd.h>

#include <algorithm>
#include <filesystem>
#include <fstream>

#include "app/anchors.h"
#include "app/audit.h"
#include "app/store_copy.h"
#include "audit/audit_entry.h"
#include "cli/handlers.h"
#include "core/clean_text.h"
#include "core/error.h"
#include "core/text.h"
#include "import/input_file.h"
#include "report/registry_views.h"
#include "store/store.h"
#include "store/store_file.h"

namespace cw::cli::handlers {
namespace {

/// Writes `text` to `path` (replaced if it exists); ValidationError naming --out otherwise.
void write_text_file(const std::string& path, const std::string& text) {
  std::ofstream f(path, std::ios::binary | std::ios::trunc);
  f << text;
  f.close();
  if (!f) {
    throw option_error("--out", "cannot write '" + path + "'",
                       "check that the folder exists and can be written");
  }
}

}  // namespace

int audit_log(Invocation& in) {
  store::AuditFilter filter;
  filter.since = in.optional_instant("--since");
  filter.entity_kind = in.optional_text("--entity", kMaxLabelChars);
  if (filter.entity_kind && std::find(audit::kEntityKinds.begin(), audit::kEntityKinds.end(),
                                      *filter.entity_kind) == audit::kEntityKinds.end()) {
    std::string kinds;
    for (const auto kind : audit::kEntityKinds)
      kinds += (kinds.empty() ? "" : ", ") + std::string(kind);
    UsageError e("--entity " + quote(*filter.entity_kind) + " is not a kind of entity",
                 "one of: " + kinds);
    e.set_option("--entity");
    throw e;
  }
  filter.entity_id = in.optional_text("--id", kMaxNameChars);
  auto s = in.open_session();
  const auto entries = app::audit_log(s, filter);
  if (in.json()) {
    report::Json items = report::Json::array();
    for (const auto& e : entries) items.push_back(report::audit_entry_json(e));
    in.emit(report::Json{{"entries", items}});
  } else {
    report::print_audit_log(in.out(), entries, s.zone());
  }
  return 0;
}

int audit_verify(Invocation& in) {
  // Anchor files are read and parsed before the store is opened: bad input names the file.
  std::vector<std::pair<std::string, std::string>> anchors;
  for (const auto& file : in.values("--anchor")) {
    anchors.emplace_back(file, import::read_text_file(file, 64 * 1024, "--anchor"));
    app::parse_anchor(anchors.back().second, file);
  }
  const std::optional<std::string> key = in.lab_key_if_any();
  auto s = in.open_session();
  const auto r = app::verify_audit(s);
  std::vector<app::AnchorCheck> checks;
  if (!anchors.empty()) {
    // Without the lab key the anchors' own keys are used (and said so): a forged anchor with a
    // key of its own would then pass the signature, never the comparison with the trail.
    std::optional<std::string> key_path;
    if (key && (::access(key->c_str(), F_OK) == 0 || in.has("--key"))) key_path = key;
    checks = app::check_anchors(s, anchors, key_path);
    if (!key_path) {
      in.warn((key ? "no lab key at '" + *key + "'" : std::string("no lab key given")) +
              ": each anchor's signature was checked with the key it "
              "names; compare that key with the lab's");
    }
  }
  if (in.json()) {
    report::Json doc = report::verify_json(r);
    report::Json list = report::Json::array();
    for (const auto& c : checks) {
      list.push_back(
          {{"file", c.file},
           {"entries", c.anchor.entries},
           {"head_hash", c.anchor.head_hash},
           {"at", format_utc(c.anchor.at)},
           {"signature_ok", c.signature_ok},
           {"contained", c.contained},
           {"problem", c.problem.empty() ? report::Json(nullptr) : report::Json(c.problem)}});
    }
    doc["anchors"] = list;
    if (!checks.empty()) {
      doc["ok"] = doc["ok"].get<bool>() && std::all_of(checks.begin(), checks.end(),
                                                       [](const auto& c) { return c.contained; });
    }
    in.emit(doc);
  } else {
    report::print_verify(in.out(), r);
    for (const auto& c : checks) {
      if (c.contained) {
        in.out() << "Checkpoint '" << c.file << "' (entry " << c.anchor.entries << ", "
                 << s.zone().format_local(c.anchor.at) << ") is in the trail, signature valid.\n";
      } else {
        in.out() << "CHECKPOINT NOT IN THE TRAIL: " << c.problem << "\n";
      }
    }
  }
  if (!r.chain.ok) {
    return in.fail(
        AuditBrokenError("audit trail broken at entry " +
                             (r.chain.first_broken ? std::to_string(*r.chain.first_broken) : "?") +
                             ": " + r.chain.problem,
                         "restore the store from a backup and compare; the entry named is the "
                         "first that no longer holds"));
  }
  for (const auto& c : checks) {
    if (!c.contained) {
      return in.fail(AuditBrokenError(c.problem,
                                      "the store is not the one that was anchored: restore it "
                                      "from a backup made before, and compare"));
    }
  }
  if (r.derived_problem) {
    return in.fail(StoreError(
        "the derived counts of settled curves disagree with the stored facts: " +
            *r.derived_problem,
        "the facts and their trail are intact; 'curvewarden store copy' builds the counts again "
        "from the facts on the copy (use the copy), or restore the store from a backup"));
  }
  if (!r.missing_guards.empty()) {
    std::string list;
    for (const auto& g : r.missing_guards) list += (list.empty() ? "" : ", ") + g;
    return in.fail(StoreError("the store's append-only guards are missing: " + list,
                              "the store was altered outside curvewarden; restore it from a "
                              "backup"));
  }
  return 0;
}

int audit_anchor(Invocation& in) {
  const auto out = in.optional_output_path("--out", Invocation::Replaces::Nothing);
  if (!out) throw UsageError("--out is required");
  const std::string key = in.key_path();
  auto s = in.open_session();
  const app::Anchor a = app::make_anchor(s, key);
  write_text_file(*out, app::anchor_text(a));
  if (in.json()) {
    in.emit(report::Json{{"file", *out},
                         {"entries", a.entries},
                         {"head_hash", a.head_hash},
                         {"at", format_utc(a.at)},
                         {"key", a.public_key},
                         {"signature", a.signature}});
  } else {
    in.out() << "Wrote checkpoint " << *out << ": entry " << a.entries << ", head " << a.head_hash
             << ", signed with the lab key.\n"
             << "Keep it off this machine (print it, mail it, copy it to a second medium); "
                "'curvewarden audit verify --anchor "
             << *out << "' checks the trail still contains it.\n";
  }
  return 0;
}

int backup(Invocation& in) {
  const auto destination = in.optional_output_path("file");
  if (!destination) throw UsageError("give the file to copy the store to");
  if (::access(destination->c_str(), F_OK) == 0) {
    throw UsageError("'" + *destination + "' exists; a backup never replaces a file",
                     "give the path of a new file");
  }
  const std::string folder = std::filesystem::path(*destination).parent_path().string();
  if (!folder.empty() && !std::filesystem::is_directory(folder)) {
    throw UsageError("there is no folder '" + folder + "' for the backup '" + *destination + "'",
                     "create the folder first");
  }
  if (store::is_server_location(in.location())) {
    throw option_error("file",
                       "backup copies a store file; a store on a PostgreSQL server is backed up "
                       "with the server's own tools",
                       "use pg_dump, or the server's base backups and WAL archiving for "
                       "point-in-time recovery; 'curvewarden audit verify' checks a restored "
                       "store");
  }
  auto s = in.open_session();
  const auto r = app::backup(s, *destination);
  if (in.json()) {
    report::Json doc = report::verify_json(r);
    doc["file"] = *destination;
    in.emit(doc);
  } else {
    in.out() << "Copied " << s.location() << " to " << *destination
             << " and verified the copy: " << r.chain.entries << " entries, head hash "
             << r.chain.head_hash << ".\n";
  }
  return 0;
}

int store_copy(Invocation& in) {
  app::StoreCopyRequest r;
  r.from = in.path("--from");
  r.to = in.path("--to");
  r.os_login = Invocation::os_login();
  const auto is_server = [](const std::string& where) { return where.rfind("postgres", 0) == 0; };
  for (const auto& [option, where] : {std::pair{"--from", r.from}, std::pair{"--to", r.to}}) {
    if (!is_server(where) && store::is_symlink(where) && !in.has("--follow-symlink")) {
      throw option_error(option, "the store path '" + where + "' is a symbolic link",
                         "give the real path of the store, or --follow-symlink if the link is "
                         "meant");
    }
  }
  std::error_code ec;
  if (r.from == r.to ||
      (!is_server(r.from) && !is_server(r.to) && std::filesystem::equivalent(r.from, r.to, ec))) {
    throw option_error("--to", "--from and --to name the same store",
                       "give the path of a new file, or an empty database");
  }
  if (!is_server(r.from) && ::access(r.from.c_str(), F_OK) != 0) {
    throw option_error("--from", "there is no store '" + r.from + "'",
                       "give the path of an existing store file");
  }
  if (!is_server(r.to)) {
    const std::string folder = std::filesystem::path(r.to).parent_path().string();
    if (!folder.empty() && !std::filesystem::is_directory(folder)) {
      throw option_error("--to", "there is no folder '" + folder + "' for the store '" + r.to + "'",
                         "create the folder first");
    }
  }
  // A new file is created private (mode 0600) before the store is written into it, and removed
  // when the copy fails; an existing one is used only when it holds no entry and no fact.
  const bool created = !is_server(r.to) && store::create_store_file(r.to, std::nullopt);
  try {
    const auto outcome = [&] {
      try {
        return app::copy_store(r);
      } catch (const LocationError& e) {
        throw Invocation::named_location_error(e, e.location() == r.from ? "--from" : "--to");
      }
    }();
    if (in.json()) {
      in.emit(report::store_copy_json(outcome));
    } else {
      report::print_store_copy(in.out(), outcome);
    }
    return 0;
  } catch (...) {
    if (created) store::remove_new_store_files(r.to);
    throw;
  }
}

}  // namespace cw::cli::handlers
