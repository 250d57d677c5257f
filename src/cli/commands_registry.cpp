// SPDX-License-Identifier: Apache-2.0
// Handlers of init, instrument, method, lot and audit commands.
#include "cli/commands.h"

#include "app/audit.h"
#include "core/error.h"
#include "core/text.h"
#include "report/registry_views.h"

namespace cw::cli {
namespace {

void emit(Ctx& ctx, const report::Json& j) {
  ctx.out << j.dump(2) << '\n';
}

}  // namespace

int cmd_init(Ctx& ctx, const app::InitRequest& request) {
  const auto outcome = app::init_store(ctx.global, request);
  const std::string path = app::resolve_db_path(ctx.global);
  if (ctx.global.json) {
    emit(ctx, report::init_json(outcome, path));
  } else {
    report::print_init(ctx.out, outcome, path);
  }
  return 0;
}

int cmd_instrument_add(Ctx& ctx, const std::string& code, const std::optional<std::string>& name) {
  auto s = app::Session::open(ctx.global);
  const Instrument i = app::add_instrument(s, code, name);
  if (ctx.global.json) {
    emit(ctx, report::instrument_json(i, s.at()));
  } else {
    ctx.out << "Registered instrument " << i.code << (i.name ? " (" + *i.name + ")" : "") << ".\n";
  }
  return 0;
}

int cmd_instrument_list(Ctx& ctx) {
  auto s = app::Session::open(ctx.global);
  const auto list = app::list_instruments(s);
  if (ctx.global.json) {
    report::Json items = report::Json::array();
    for (const auto& i : list) items.push_back(report::instrument_json(i, s.at()));
    emit(ctx, report::Json{{"instruments", items}});
  } else {
    report::print_instrument_list(ctx.out, list, s.zone(), s.at());
  }
  return 0;
}

int cmd_instrument_show(Ctx& ctx, const std::string& code) {
  auto s = app::Session::open(ctx.global);
  const Instrument i = app::get_instrument(s, code);
  if (ctx.global.json) {
    emit(ctx, report::instrument_json(i, s.at()));
  } else {
    report::print_instrument(ctx.out, i, s.zone(), s.at());
  }
  return 0;
}

int cmd_instrument_service(Ctx& ctx, const app::ServiceRequest& request) {
  auto s = app::Session::open(ctx.global);
  const Instrument i = app::record_service(s, request);
  if (ctx.global.json) {
    emit(ctx, report::instrument_json(i, s.at()));
  } else if (request.direction == ServiceDirection::Out) {
    ctx.out << "Instrument " << i.code << " is out of service from "
            << s.zone().format_local(s.at())
            << ". Curves acquired on it before then are no longer valid (instrument-serviced).\n";
  } else {
    ctx.out << "Instrument " << i.code << " is back in service from "
            << s.zone().format_local(s.at()) << ". Log a new calibration before quantifying.\n";
  }
  return 0;
}

int cmd_method_add(Ctx& ctx, const std::string& file) {
  auto s = app::Session::open(ctx.global);
  const MethodVersion v = app::add_method(s, file);
  const Method m = app::get_method(s, v.definition.code);
  if (ctx.global.json) {
    emit(ctx, report::method_version_json(m, v, false));
  } else {
    ctx.out << "Registered method " << m.code << " version 1 (" << v.definition.title << ").\n";
  }
  return 0;
}

int cmd_method_revise(Ctx& ctx, const std::string& file, const std::string& reason) {
  auto s = app::Session::open(ctx.global);
  const MethodVersion v = app::revise_method(s, file, reason);
  const Method m = app::get_method(s, v.definition.code);
  if (ctx.global.json) {
    emit(ctx, report::method_version_json(m, v, false));
  } else {
    ctx.out << "Registered method " << m.code << " version " << v.version << ", in force from "
            << s.zone().format_local(v.effective_at) << ".\n"
            << "Curves made under earlier versions are no longer valid from then on "
               "(method-revised).\n";
  }
  return 0;
}

int cmd_method_list(Ctx& ctx) {
  auto s = app::Session::open(ctx.global);
  const auto list = app::list_methods(s);
  if (ctx.global.json) {
    report::Json items = report::Json::array();
    for (const auto& m : list) items.push_back(report::method_json(m, s.at()));
    emit(ctx, report::Json{{"methods", items}});
  } else {
    report::print_method_list(ctx.out, list, s.zone(), s.at());
  }
  return 0;
}

int cmd_method_show(Ctx& ctx, const std::string& code, std::optional<int> version) {
  auto s = app::Session::open(ctx.global);
  const Method m = app::get_method(s, code);
  const MethodVersion* v = nullptr;
  if (version) {
    v = m.version_number(*version);
    if (!v) {
      throw NotFoundError("method " + quote(code) + " has no version " + std::to_string(*version),
                          "it has versions 1 to " + std::to_string(m.latest().version));
    }
  } else {
    v = m.version_at(s.at());
    if (!v) v = &m.latest();
  }
  if (ctx.global.json) {
    report::Json j = report::method_version_json(m, *v, true);
    j["versions"] = report::method_json(m, s.at())["versions"];
    emit(ctx, j);
  } else {
    report::print_method_version(ctx.out, m, *v, s.zone(), s.at());
  }
  return 0;
}

int cmd_lot_add(Ctx& ctx, const app::LotRequest& request) {
  auto s = app::Session::open(ctx.global);
  const Lot lot = app::add_lot(s, request);
  if (ctx.global.json) {
    emit(ctx, report::lot_json(lot, s.zone(), s.at()));
  } else {
    ctx.out << "Registered lot " << lot.code << " (" << lot.material << "), usable through "
            << format_date(lot.effective_expires_on()) << " (until "
            << s.zone().format_local(lot.expiry_instant(s.zone())) << ").\n";
    if (lot.is_expired_at(s.at(), s.zone())) {
      ctx.err << "curvewarden: warning: lot " << lot.code << " is already expired\n";
    }
  }
  return 0;
}

int cmd_lot_list(Ctx& ctx) {
  auto s = app::Session::open(ctx.global);
  const auto list = app::list_lots(s);
  if (ctx.global.json) {
    report::Json items = report::Json::array();
    for (const auto& l : list) items.push_back(report::lot_json(l, s.zone(), s.at()));
    emit(ctx, report::Json{{"lots", items}});
  } else {
    report::print_lot_list(ctx.out, list, s.zone(), s.at());
  }
  return 0;
}

int cmd_lot_show(Ctx& ctx, const std::string& code) {
  auto s = app::Session::open(ctx.global);
  const Lot lot = app::get_lot(s, code);
  if (ctx.global.json) {
    emit(ctx, report::lot_json(lot, s.zone(), s.at()));
  } else {
    report::print_lot(ctx.out, lot, s.zone(), s.at());
  }
  return 0;
}

int cmd_lot_withdraw(Ctx& ctx, const std::string& code, const std::string& reason) {
  auto s = app::Session::open(ctx.global);
  const Lot lot = app::withdraw_lot(s, code, reason);
  if (ctx.global.json) {
    emit(ctx, report::lot_json(lot, s.zone(), s.at()));
  } else {
    ctx.out << "Withdrew lot " << lot.code << " from "
            << s.zone().format_local(lot.withdrawal->occurred_at)
            << ". Curves made with it are no longer valid (lot-withdrawn); 'curvewarden trace lot "
            << lot.code << "' lists them and their results.\n";
  }
  return 0;
}

int cmd_audit_log(Ctx& ctx, const AuditLogArgs& args) {
  store::AuditFilter filter;
  if (args.since) filter.since = parse_instant(*args.since, "--since");
  filter.entity_kind = args.entity;
  filter.entity_id = args.id;
  auto s = app::Session::open(ctx.global);
  const auto entries = app::audit_log(s, filter);
  if (ctx.global.json) {
    report::Json items = report::Json::array();
    for (const auto& e : entries) items.push_back(report::audit_entry_json(e));
    emit(ctx, report::Json{{"entries", items}});
  } else {
    report::print_audit_log(ctx.out, entries, s.zone());
  }
  return 0;
}

int cmd_audit_verify(Ctx& ctx) {
  auto s = app::Session::open(ctx.global);
  const auto r = app::verify_audit(s);
  if (ctx.global.json) {
    emit(ctx, report::verify_json(r));
  } else {
    report::print_verify(ctx.out, r);
  }
  if (!r.ok) {
    ctx.err << "curvewarden: error: audit trail broken at entry "
            << (r.first_broken ? std::to_string(*r.first_broken) : "?") << ": " << r.problem
            << "\n";
    return static_cast<int>(ExitCode::AuditBroken);
  }
  return 0;
}

}  // namespace cw::cli
