// SPDX-License-Identifier: Apache-2.0
// The links and hashes of an audit trail checked on a thread of their own: `audit verify` reads
// the trail in seq order and hands each entry over once it has checked the entry's rows, so
// that hashing and reading the fact tables run side by side.
#pragma once

#include <condition_variable>
#include <cstdint>
#include <exception>
#include <mutex>
#include <optional>
#include <string>
#include <thread>
#include <vector>

#include "audit/audit_entry.h"

namespace cw::audit {

class ChainCheck {
 public:
  /// The first entry that does not link to the one before it or whose hash does not match, or
  /// whose hash could not be computed at all (`error`, rethrown by the caller).
  struct Break {
    enum class Kind { Link, Hash, Error };
    Kind kind;
    AuditEntry entry;
    std::exception_ptr error;
  };

  ChainCheck();
  ~ChainCheck();
  ChainCheck(const ChainCheck&) = delete;
  ChainCheck& operator=(const ChainCheck&) = delete;

  /// Hands over the next entry of the trail (its seq is the caller's to check).
  void add(AuditEntry&& entry);
  /// Whether a break was found already (the reader may stop: nothing after it counts).
  bool broken() const;
  /// Waits until every entry handed over is checked: the first break, if any.
  std::optional<Break> finish();
  /// The hash of the last entry checked (the genesis hash before any), once finished.
  const std::string& head_hash() const { return head_hash_; }

 private:
  void run();
  void flush();

  std::vector<AuditEntry> batch_;  // the reader's, not yet handed over
  std::size_t batch_bytes_ = 0;

  mutable std::mutex mutex_;
  std::condition_variable changed_;
  std::vector<std::vector<AuditEntry>> queue_;
  bool closed_ = false;
  bool finished_ = false;
  std::optional<Break> break_;

  std::string head_hash_ = kGenesisHash;  // the checking thread's until finished
  std::thread thread_;
};

}  // namespace cw::audit
