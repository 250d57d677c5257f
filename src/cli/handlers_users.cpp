// SPDX-License-Identifier: Apache-2.0
// Handlers of the user registry.
#include "app/users.h"
#include "cli/handlers.h"
#include "core/clean_text.h"
#include "core/text.h"
#include "report/registry_views.h"

namespace cw::cli::handlers {
namespace {

Role role_option(const Invocation& in, std::string_view option) {
  const std::string text = in.code(option, "role");
  if (auto r = parse_role(text)) return *r;
  throw option_error(std::string(option),
                     std::string(option) + " " + quote(text) + " is not a role",
                     "roles: analyst, reviewer, quality, admin");
}

int done(Invocation& in, const User& u, const std::string& line) {
  if (in.json()) {
    in.emit(report::user_json(u));
  } else {
    in.out() << line << "\n";
  }
  return 0;
}

}  // namespace

int user_add(Invocation& in) {
  app::AddUserRequest r;
  r.code = in.code("code", "user code");
  r.name = in.text("--name", kMaxNameChars);
  r.role = role_option(in, "--role");
  auto s = in.open_session();
  const User u = app::add_user(s, r);
  return done(in, u,
              "Registered user " + u.code + " (" + u.name + "), role " +
                  std::string(to_string(u.role())) + ".");
}

int user_list(Invocation& in) {
  auto s = in.open_session();
  const auto list = app::list_users(s);
  if (in.json()) {
    report::Json items = report::Json::array();
    for (const auto& u : list) items.push_back(report::user_json(u));
    in.emit(report::Json{{"users", items}});
  } else {
    report::print_user_list(in.out(), list, s.zone());
  }
  return 0;
}

int user_show(Invocation& in) {
  const std::string code = in.text("code", kMaxNameChars);
  auto s = in.open_session();
  const User u = app::show_user(s, code);
  if (in.json()) {
    in.emit(report::user_json(u));
  } else {
    report::print_user(in.out(), u, s.zone());
  }
  return 0;
}

int user_disable(Invocation& in) {
  const std::string code = in.text("code", kMaxNameChars);
  const std::string reason = in.text("--reason", kMaxReasonChars);
  auto s = in.open_session();
  const User u = app::disable_user(s, code, reason);
  return done(in, u, "Disabled user " + u.code + ": it can no longer act.");
}

int user_enable(Invocation& in) {
  const std::string code = in.text("code", kMaxNameChars);
  const std::string reason = in.text("--reason", kMaxReasonChars);
  std::optional<Role> role;
  if (in.has("--role")) role = role_option(in, "--role");
  auto s = in.open_session();
  const User u = app::enable_user(s, code, role, reason);
  return done(in, u, "Enabled user " + u.code + ", role " + std::string(to_string(u.role())) + ".");
}

int user_unlock(Invocation& in) {
  const std::string code = in.text("code", kMaxNameChars);
  const std::string reason = in.text("--reason", kMaxReasonChars);
  auto s = in.open_session();
  const User u = app::unlock_user(s, code, reason);
  return done(in, u, "Unlocked user " + u.code + ".");
}

int user_passphrase(Invocation& in) {
  const auto code = in.optional_text("code", kMaxNameChars);
  auto s = in.open_session();
  const User u = app::set_passphrase(s, code);
  return done(in, u, "Set the passphrase of " + u.code + " (only its Argon2id hash is kept).");
}

}  // namespace cw::cli::handlers
