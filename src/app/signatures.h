// SPDX-License-Identifier: Apache-2.0
// Electronic signatures inside a unit of work: the passphrase is asked for before the write lock
// is taken, and checked, counted and recorded inside the transaction that does the signed act.
#pragma once

#include <string>

#include "app/session.h"
#include "domain/signature.h"
#include "store/store.h"

namespace cw::app {

/// What a signed act signs: its meaning and the record it is about.
struct SignedAct {
  std::string action;   ///< the audit action ("curve.review"), for refusals
  std::string meaning;  ///< "approved", "rejected", "retired", ...
  std::string entity_kind;
  std::string entity_id;
};

/// The acting user's passphrase, asked through the session (call it before s.write()).
std::string ask_signature(Session& s, const std::string& meaning);

/// A new passphrase for `code`, asked through the session and checked: 10 to 1024 bytes
/// (ValidationError otherwise); returns its Argon2id hash (the passphrase itself is wiped).
std::string ask_new_passphrase(Session& s, const std::string& code);

/// Inside `unit`, for `user`: a locked user is refused (recorded, exit 3) without looking at the
/// passphrase; a user without a passphrase gets UsageError (exit 2); a wrong passphrase is
/// recorded (signature_failures) and refused (exit 3), locking the user after
/// kMaxFailedSignatures in a row; a right one appends the signature row, which joins the unit's
/// next entry (the entry of the signed act). The passphrase is wiped either way.
Signature sign(Session& s, store::WriteUnit& unit, const User& user, std::string& passphrase,
               const SignedAct& act);

/// Checks `passphrase` as sign() does (lockout, failures recorded) without a signature row: for
/// proving the current passphrase before it is changed.
void prove_passphrase(Session& s, store::WriteUnit& unit, const User& user, std::string& passphrase,
                      const std::string& action);

}  // namespace cw::app
