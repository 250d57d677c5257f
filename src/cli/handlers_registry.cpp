// SPDX-License-Identifier: Apache-2.0
// Handlers of init, instrument, method and lot commands.
#include <grp.h>

#include <optional>
#include <set>

#include "app/anchors.h"
#include "app/registry.h"
#include "cli/handlers.h"
#include "core/clean_text.h"
#include "core/error.h"
#include "core/text.h"
#include "import/column_map.h"
#include "report/registry_views.h"
#include "store/store.h"
#include "store/store_file.h"

namespace cw::cli::handlers {

int init(Invocation& in) {
  app::InitRequest r;
  r.lab = in.optional_text("--lab", kMaxNameChars);
  r.zone = in.optional_zone("--tz");
  r.reason = in.optional_text("--reason", kMaxReasonChars);
  r.admin_name = in.optional_text("--name", kMaxNameChars);
  const std::string key = in.key_path();
  std::optional<gid_t> group;
  if (auto name = in.optional_text("--group", kMaxLabelChars)) {
    const ::group* g = ::getgrnam(name->c_str());
    if (g == nullptr) {
      throw option_error("--group", "--group '" + *name + "' is not a group of this system",
                         "see /etc/group or the 'id' command");
    }
    group = g->gr_gid;
  }
  const std::string where = in.location();
  if (group && store::is_server_location(where)) {
    throw option_error("--group",
                       "--group sets the group of a store file; a store on a "
                       "PostgreSQL server is shared through its roles",
                       "leave out --group; see README, \"Choosing a backend\", for the grants");
  }
  // Inits that make a store file in this folder take turns: one that fails removes only a file
  // nobody else has written meanwhile.
  std::optional<store::FolderLock> making;
  if (!store::is_server_location(where))
    making.emplace(where, store::OpenOptions{}.busy_timeout_ms);
  const bool created = !store::is_server_location(where) && store::create_store_file(where, group);
  try {
    auto s = in.open_session(/*create=*/true);
    auto outcome = app::init_store(s, r);
    outcome.lab_key = key;
    outcome.lab_key_created = app::ensure_lab_key(key);
    if (in.json()) {
      in.emit(report::init_json(outcome, s.location()));
    } else {
      report::print_init(in.out(), outcome, s.location());
    }
    return 0;
  } catch (...) {
    // A new store whose init failed (no passphrase, a bad one, ...) is not left half made: the
    // session is closed by now, so its files can go.
    if (created) store::remove_new_store_files(where);
    throw;
  }
}

int instrument_add(Invocation& in) {
  const std::string code = in.code("code", "instrument code");
  const auto name = in.optional_text("--name", kMaxNameChars);
  auto s = in.open_session();
  const Instrument i = app::add_instrument(s, code, name);
  if (in.json()) {
    in.emit(report::instrument_json(i, s.at()));
  } else {
    in.out() << "Registered instrument " << i.code << (i.name ? " (" + *i.name + ")" : "") << ".\n";
  }
  return 0;
}

int instrument_list(Invocation& in) {
  auto s = in.open_session();
  const auto list = app::list_instruments(s);
  if (in.json()) {
    report::Json items = report::Json::array();
    for (const auto& i : list) items.push_back(report::instrument_json(i, s.at()));
    in.emit(report::Json{{"instruments", items}});
  } else {
    report::print_instrument_list(in.out(), list, s.zone(), s.at());
  }
  return 0;
}

int instrument_show(Invocation& in) {
  const std::string code = in.code("code", "instrument code");
  auto s = in.open_session();
  const Instrument i = app::show_instrument(s, code);
  if (in.json()) {
    in.emit(report::instrument_json(i, s.at()));
  } else {
    report::print_instrument(in.out(), i, s.zone(), s.at());
  }
  return 0;
}

int instrument_columns(Invocation& in) {
  const std::string code = in.code("code", "instrument code");
  if (in.has("--set") && in.flag("--clear")) throw UsageError("give --set or --clear, not both");
  const auto columns = in.optional_columns("--set", import::all_mappable_columns());
  const bool clear = in.flag("--clear");
  const auto reason = in.optional_text("--reason", kMaxReasonChars);
  if (reason && !columns && !clear) {
    throw UsageError("--reason goes with --set or --clear",
                     "without them the saved columns are shown");
  }
  auto s = in.open_session();
  const Instrument i = columns || clear ? app::save_instrument_columns(
                                              s, code, columns.value_or(ColumnMapping{}), reason)
                                        : app::show_instrument(s, code);
  if (in.json()) {
    in.emit(report::instrument_json(i, s.at()));
  } else if (const SavedColumns* saved = i.columns_at(s.at())) {
    in.out() << "Instrument " << i.code << " exports are read with the columns "
             << column_mapping_text(saved->columns) << " (saved "
             << s.zone().format_local(saved->occurred_at) << " by " << saved->saved_by
             << "); --columns on a command replaces them for that file.\n";
  } else {
    in.out() << "Instrument " << i.code
             << " has no saved columns: its files must use the column names of the README, or "
                "give --columns.\n";
  }
  return 0;
}

int instrument_service(Invocation& in) {
  app::ServiceRequest r;
  r.code = in.code("code", "instrument code");
  r.direction = in.either("--out", "--back") ? ServiceDirection::Out : ServiceDirection::Back;
  r.reason = in.text("--reason", kMaxReasonChars);
  auto s = in.open_session();
  const Instrument i = app::record_service(s, r);
  if (in.json()) {
    in.emit(report::instrument_json(i, s.at()));
  } else if (r.direction == ServiceDirection::Out) {
    in.out() << "Instrument " << i.code << " is out of service from "
             << s.zone().format_local(s.at())
             << ". Curves acquired on it before then are no longer valid (instrument-serviced).\n";
  } else {
    in.out() << "Instrument " << i.code << " is back in service from "
             << s.zone().format_local(s.at()) << ". Log a new calibration before quantifying.\n";
  }
  return 0;
}

int method_add(Invocation& in) {
  const std::string file = in.path("file");
  auto s = in.open_session();
  const MethodVersion v = app::add_method(s, file);
  const Method m = app::show_method(s, v.definition.code);
  if (in.json()) {
    in.emit(report::method_version_json(m, v, false));
  } else {
    in.out() << "Registered method " << m.code << " version 1 (" << v.definition.title << ").\n";
  }
  return 0;
}

int method_revise(Invocation& in) {
  const std::string file = in.path("file");
  const std::string reason = in.text("--reason", kMaxReasonChars);
  auto s = in.open_session();
  const MethodVersion v = app::revise_method(s, file, reason);
  const Method m = app::show_method(s, v.definition.code);
  if (in.json()) {
    in.emit(report::method_version_json(m, v, false));
  } else {
    in.out() << "Registered method " << m.code << " version " << v.version << ", in force from "
             << s.zone().format_local(v.effective_at) << ".\n"
             << "Curves made under earlier versions are no longer valid from then on "
                "(method-revised).\n";
  }
  return 0;
}

int method_list(Invocation& in) {
  auto s = in.open_session();
  const auto list = app::list_methods(s);
  if (in.json()) {
    report::Json items = report::Json::array();
    for (const auto& m : list) items.push_back(report::method_json(m, s.at()));
    in.emit(report::Json{{"methods", items}});
  } else {
    report::print_method_list(in.out(), list, s.zone(), s.at());
  }
  return 0;
}

int method_show(Invocation& in) {
  const std::string code = in.code("code", "method code");
  const auto version = in.optional_whole("--version", 1, 1000000);
  auto s = in.open_session();
  const Method m = app::show_method(s, code);
  const MethodVersion* v = nullptr;
  if (version) {
    v = m.version_number(static_cast<int>(*version));
    if (!v) {
      throw NotFoundError("method " + quote(code) + " has no version " + std::to_string(*version),
                          "it has versions 1 to " + std::to_string(m.latest().version));
    }
  } else {
    v = m.version_at(s.at());
    if (!v) v = &m.latest();
  }
  if (in.json()) {
    report::Json j = report::method_version_json(m, *v, true);
    j["versions"] = report::method_json(m, s.at())["versions"];
    in.emit(j);
  } else {
    report::print_method_version(in.out(), m, *v, s.zone(), s.at());
  }
  return 0;
}

int lot_add(Invocation& in) {
  Lot lot;
  lot.code = in.code("code", "lot code");
  lot.material = in.text("--material", kMaxNameChars);
  lot.expires_on = in.date("--expires");
  lot.opened_on = in.optional_date("--opened");
  if (auto days = in.optional_whole("--in-use-days", 1, 36500)) {
    if (!lot.opened_on) {
      throw UsageError("--in-use-days needs --opened DATE",
                       "the in-use period counts from the day the lot was opened");
    }
    lot.in_use_days = static_cast<int>(*days);
  }
  lot.certificate = in.optional_text("--certificate", kMaxNameChars);
  if (auto k = in.optional_number("--coverage-factor")) {
    if (!(*k >= 1 && *k <= 10)) {
      throw option_error("--coverage-factor",
                         "--coverage-factor must lie between 1 and 10, got " + format_shortest(*k),
                         "certificates usually state k = 2 (about 95 %)");
    }
    lot.coverage_factor = *k;
  }
  std::set<std::string> seen;
  for (const auto& text : in.values("--value")) {
    CertifiedValue v;
    try {
      v = parse_certified_value(text, "--value");
    } catch (Error& e) {
      e.set_option("--value");
      throw;
    }
    if (!seen.insert(v.analyte).second) {
      throw UsageError("--value names analyte " + quote(v.analyte) + " twice");
    }
    lot.values.push_back(std::move(v));
  }
  if (lot.values.empty()) {
    throw UsageError("a lot needs at least one --value ANALYTE=CONC",
                     "e.g. --value nitrate=1000±5");
  }
  auto s = in.open_session();
  const Lot added = app::add_lot(s, lot);
  if (in.json()) {
    in.emit(report::lot_json(added, s.zone(), s.at()));
  } else {
    in.out() << "Registered lot " << added.code << " (" << added.material << "), usable through "
             << format_date(added.effective_expires_on()) << " (until "
             << report::usable_until_text(added, s.zone()) << ").\n";
  }
  if (added.is_expired_at(s.at(), s.zone())) in.warn("lot " + added.code + " is already expired");
  return 0;
}

int lot_list(Invocation& in) {
  auto s = in.open_session();
  const auto list = app::list_lots(s);
  if (in.json()) {
    report::Json items = report::Json::array();
    for (const auto& l : list) items.push_back(report::lot_json(l, s.zone(), s.at()));
    in.emit(report::Json{{"lots", items}});
  } else {
    report::print_lot_list(in.out(), list, s.zone(), s.at());
  }
  return 0;
}

int lot_show(Invocation& in) {
  const std::string code = in.code("code", "lot code");
  auto s = in.open_session();
  const Lot lot = app::show_lot(s, code);
  if (in.json()) {
    in.emit(report::lot_json(lot, s.zone(), s.at()));
  } else {
    report::print_lot(in.out(), lot, s.zone(), s.at());
  }
  return 0;
}

int lot_withdraw(Invocation& in) {
  const std::string code = in.code("code", "lot code");
  const std::string reason = in.text("--reason", kMaxReasonChars);
  auto s = in.open_session();
  const Lot lot = app::withdraw_lot(s, code, reason);
  if (in.json()) {
    in.emit(report::lot_json(lot, s.zone(), s.at()));
  } else {
    in.out() << "Withdrew lot " << lot.code << " from "
             << s.zone().format_local(lot.withdrawal->occurred_at)
             << ". Curves made with it are no longer valid (lot-withdrawn); 'curvewarden trace "
                "lot "
             << lot.code << "' lists them and their results.\n";
  }
  return 0;
}

}  // namespace cw::cli::handlers
