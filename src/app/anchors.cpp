// SPDX-License-Identifier: Apache-2.0
// Signed checkpoints of the audit trail.
#include "app/anchors.h"

#include <sys/stat.h>

#include <sstream>
#include <stdexcept>

#include "core/error.h"
#include "core/number.h"
#include "crypto/lab_key.h"

namespace cw::app {
namespace {

constexpr const char* kFirstLine = "curvewarden anchor 1";

crypto::LabKey load_key(const std::string& key_path) {
  try {
    return crypto::read_lab_key(key_path);
  } catch (const std::runtime_error& e) {
    throw StoreError(e.what(),
                     "give the lab key with --key FILE or CURVEWARDEN_KEY (init "
                     "created it next to the store as STORE.key)");
  }
}

}  // namespace

std::string anchor_message(const Anchor& a) {
  return std::string(kFirstLine) + "\nlab: " + a.lab + "\nentries: " + std::to_string(a.entries) +
         "\nhead: " + a.head_hash + "\nat: " + format_utc(a.at) + "\n";
}

std::string anchor_text(const Anchor& a) {
  return anchor_message(a) + "key: " + a.public_key + "\nsignature: " + a.signature + "\n";
}

Anchor parse_anchor(const std::string& text, const std::string& file) {
  std::istringstream in(text);
  std::string line;
  int number = 0;
  Anchor a;
  const auto bad = [&](const std::string& what) {
    return ValidationError(SourceLocation{file, number, std::nullopt, {}},
                           "'" + file + "' line " + std::to_string(number) + ": " + what +
                               " (not an anchor written by 'curvewarden audit anchor'?)");
  };
  const auto field = [&](const std::string& name) {
    if (!std::getline(in, line)) {
      ++number;
      throw bad("the file ends before '" + name + ":'");
    }
    ++number;
    const std::string prefix = name + ": ";
    if (line.rfind(prefix, 0) != 0) throw bad("expected '" + prefix + "...'");
    return line.substr(prefix.size());
  };
  const auto hex = [&](const std::string& value, std::size_t size, const std::string& name) {
    if (value.size() != size || value.find_first_not_of("0123456789abcdef") != std::string::npos) {
      throw bad(name + " is not " + std::to_string(size) + " lowercase hex digits");
    }
    return value;
  };
  if (!std::getline(in, line) || (++number, line != kFirstLine)) {
    number = 1;
    throw bad("expected '" + std::string(kFirstLine) + "'");
  }
  a.lab = field("lab");
  const std::string entries = field("entries");
  try {
    a.entries = whole_or_throw(entries, "entries", 1, INT64_MAX);
  } catch (const Error&) {
    throw bad("entries is not a whole number of 1 or more");
  }
  a.head_hash = hex(field("head"), 64, "head");
  try {
    a.at = parse_instant(field("at"), "at");
  } catch (const Error&) {
    throw bad("at is not a UTC time");
  }
  a.public_key = hex(field("key"), 64, "key");
  a.signature = hex(field("signature"), 128, "signature");
  return a;
}

bool ensure_lab_key(const std::string& key_path) {
  struct stat st {};
  if (::lstat(key_path.c_str(), &st) == 0) return false;
  try {
    crypto::write_lab_key(key_path, crypto::generate_lab_key());
  } catch (const std::runtime_error& e) {
    throw StoreError(e.what(), "check the folder's permissions, or give another path with --key");
  }
  return true;
}

Anchor make_anchor(Session& s, const std::string& key_path) {
  const crypto::LabKey key = load_key(key_path);
  Anchor a;
  {
    auto unit = s.read();
    const auto head = unit->audit().head();
    if (!head) throw UsageError("the audit trail is empty: there is nothing to anchor");
    a.entries = head->seq;
    a.head_hash = head->hash;
    if (auto settings = unit->registry().settings()) a.lab = settings->lab_name;
  }
  a.at = s.now();
  a.public_key = key.public_hex;
  a.signature = crypto::sign(key, anchor_message(a));
  return a;
}

std::vector<AnchorCheck> check_anchors(
    Session& s, const std::vector<std::pair<std::string, std::string>>& files,
    const std::optional<std::string>& key_path) {
  std::optional<crypto::LabKey> key;
  if (key_path) key = load_key(*key_path);
  std::vector<AnchorCheck> out;
  auto unit = s.read();
  const auto head = unit->audit().head();
  for (const auto& [file, text] : files) {
    AnchorCheck c;
    c.file = file;
    c.anchor = parse_anchor(text, file);
    const Anchor& a = c.anchor;
    c.key_matches = !key || key->public_hex == a.public_key;
    c.signature_ok =
        c.key_matches && crypto::signature_valid(a.public_key, anchor_message(a), a.signature);
    const std::string name = "checkpoint '" + file + "' (entry " + std::to_string(a.entries) +
                             ", " + format_utc(a.at) + ")";
    if (!c.key_matches) {
      c.problem = name + " was not signed with this lab's key";
    } else if (!c.signature_ok) {
      c.problem = name + " has a signature that does not match its content (it was edited)";
    } else if (!head || head->seq < a.entries) {
      c.problem = name + ": the trail has only " + std::to_string(head ? head->seq : 0) +
                  " entries; its tail was lost";
    } else if (unit->audit().hash_at(a.entries) != a.head_hash) {
      c.problem = name + ": entry " + std::to_string(a.entries) +
                  " no longer has the anchored hash; the trail up to it was rewritten";
    } else {
      c.contained = true;
    }
    out.push_back(std::move(c));
  }
  return out;
}

}  // namespace cw::app
