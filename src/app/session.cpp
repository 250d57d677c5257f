// SPDX-License-Identifier: Apache-2.0
// Opening a session: store, clock, actor, lab zone and --at.
#include "app/session.h"

#include <pwd.h>
#include <unistd.h>

#include <cstdlib>

#include "core/error.h"
#include "core/text.h"
#include "import/text_file.h"
#include "store/registry_repository.h"

namespace cw::app {

const char* tool_version() {
  return "curvewarden 0.1.0";
}

std::string resolve_db_path(const GlobalOptions& options) {
  if (options.db && !options.db->empty()) return *options.db;
  if (const char* env = std::getenv("CURVEWARDEN_DB"); env != nullptr && *env != '\0') return env;
  return "curvewarden.db";
}

std::string resolve_actor(const GlobalOptions& options) {
  std::string name;
  if (options.as) {
    name = trim(*options.as);
    if (name.empty()) throw UsageError("--as is empty", "give the name of the person acting");
  } else if (const char* env = std::getenv("CURVEWARDEN_USER"); env != nullptr && *env != '\0') {
    name = trim(env);
  } else if (const passwd* pw = getpwuid(geteuid()); pw != nullptr && pw->pw_name != nullptr) {
    name = pw->pw_name;
  } else if (const char* user = std::getenv("USER"); user != nullptr) {
    name = user;
  }
  if (name.empty()) {
    throw UsageError("cannot tell who is acting", "give --as NAME or set CURVEWARDEN_USER");
  }
  if (name.size() > 100 || !import::is_valid_utf8(name)) {
    throw UsageError("the acting person's name " + quote(name) + " is not usable",
                     "use at most 100 characters of UTF-8 text");
  }
  for (char c : name) {
    if (static_cast<unsigned char>(c) < 0x20) {
      throw UsageError("the acting person's name contains a control character");
    }
  }
  return name;
}

Session::Session(store::Connection db, std::unique_ptr<Clock> clock, store::Actor actor,
                 LabZone zone, Instant at, bool at_given)
    : db_(std::move(db)),
      clock_(std::move(clock)),
      actor_(std::move(actor)),
      zone_(std::move(zone)),
      at_(at),
      at_given_(at_given) {
  actor_.clock = clock_.get();
}

Session Session::open(const GlobalOptions& options, bool create) {
  // Everything the user typed is checked before the store is touched.
  auto clock = clock_from_environment();
  const std::string actor_name = resolve_actor(options);
  const bool at_given = options.at.has_value();
  const Instant at = at_given ? parse_instant(*options.at, "--at") : clock->now();
  store::OpenOptions open;
  open.path = resolve_db_path(options);
  open.create = create;
  store::Connection db = store::Connection::open(open);
  LabZone zone = LabZone::system_default();
  if (auto settings = store::load_settings(db)) zone = LabZone::named(settings->time_zone);
  store::Actor actor{actor_name, nullptr, tool_version()};
  return Session(std::move(db), std::move(clock), std::move(actor), std::move(zone), at, at_given);
}

}  // namespace cw::app
