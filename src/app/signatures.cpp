// SPDX-License-Identifier: Apache-2.0
// Checking and recording electronic signatures.
#include "app/signatures.h"

#include "app/refusal.h"
#include "core/error.h"
#include "crypto/passphrase.h"

namespace cw::app {

std::string ask_signature(Session& s, const std::string& meaning) {
  return s.passphrase("Passphrase of " + s.actor().name + " to sign (" + meaning + "): ");
}

std::string ask_new_passphrase(Session& s, const std::string& code) {
  std::string passphrase = s.passphrase("New passphrase for " + code + ": ", true);
  const std::size_t size = passphrase.size();
  if (size < crypto::kMinPassphraseBytes || size > crypto::kMaxPassphraseBytes) {
    crypto::wipe(passphrase);
    throw ValidationError("the new passphrase of " + code + " has " + std::to_string(size) +
                              " bytes; it needs " + std::to_string(crypto::kMinPassphraseBytes) +
                              " to " + std::to_string(crypto::kMaxPassphraseBytes),
                          "a few words that only its owner knows make a good passphrase");
  }
  std::string hash = crypto::hash_passphrase(passphrase);
  crypto::wipe(passphrase);
  return hash;
}

void prove_passphrase(Session& s, store::WriteUnit& unit, const User& user, std::string& passphrase,
                      const std::string& action) {
  const int failures = unit.registry().failed_signatures_in_a_row(user.id);
  if (signature_locked(failures)) {
    crypto::wipe(passphrase);
    refuse(unit, action, "user", user.code, {Reason::UserLocked},
           "user " + user.code + " is locked after " + std::to_string(failures) +
               " wrong passphrases in a row",
           s.at(),
           "an admin unlocks it with 'curvewarden user unlock " + user.code + " --reason TEXT'");
  }
  const auto hash = unit.registry().passphrase_hash(user.id);
  if (!hash) {
    crypto::wipe(passphrase);
    throw UsageError(
        "user " + user.code + " has no passphrase, so it cannot sign",
        "an admin sets a first passphrase with 'curvewarden user passphrase " + user.code + "'");
  }
  const bool ok = crypto::passphrase_matches(*hash, passphrase);
  crypto::wipe(passphrase);
  if (!ok) {
    unit.registry_writer().add_signature_failure(user.id, action, s.now());
    const int now_failed = failures + 1;
    std::string message =
        "wrong passphrase for user " + user.code + " (" + std::to_string(now_failed) + " in a row)";
    if (signature_locked(now_failed)) message += "; the user is now locked";
    refuse(unit, action, "user", user.code, {Reason::WrongPassphrase}, message, s.at(),
           signature_locked(now_failed) ? "an admin unlocks it with 'curvewarden user unlock " +
                                              user.code + " --reason TEXT'"
                                        : "after " + std::to_string(kMaxFailedSignatures) +
                                              " wrong passphrases in a row the user is locked");
  }
}

Signature sign(Session& s, store::WriteUnit& unit, const User& user, std::string& passphrase,
               const SignedAct& act) {
  prove_passphrase(s, unit, user, passphrase, act.action);
  Signature g{user.id, user.code, user.name, act.meaning, act.entity_kind, act.entity_id, s.now()};
  unit.registry_writer().add_signature(g);
  return g;
}

}  // namespace cw::app
