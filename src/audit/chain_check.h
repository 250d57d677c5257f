// SPDX-License-Identifier: Apache-2.0
// An audit trail checked on a thread of its own: `audit verify` reads the trail in seq order,
// with the rows each entry names copied as they are stored, and hands each entry over; this
// thread checks its link, its hash and then (through the caller's rows check) its rows, so that
// reading the store and checking what was read run side by side.
#pragma once

#include <condition_variable>
#include <cstdint>
#include <exception>
#include <functional>
#include <mutex>
#include <optional>
#include <string>
#include <string_view>
#include <thread>
#include <vector>

#include "audit/audit_entry.h"

namespace cw::audit {

class ChainCheck {
 public:
  /// One entry handed over, with what the reader copied of the rows it names (in a form of the
  /// reader's own, read back only by the rows check).
  struct Item {
    AuditEntry entry;
    std::string rows;
    /// False when the reader stopped copying this entry's rows at a problem of its own (or an
    /// error), to report after the entry's link and hash: `rows` holds the rows copied before.
    bool rows_complete = true;
  };

  /// The problem with an entry's rows, in plain words (nullopt: they are as recorded). Runs on
  /// the checking thread, after the entry's link and hash held; an exception stops the check
  /// (Break::Kind::Error).
  using RowsCheck = std::function<std::optional<std::string>(const Item&)>;

  /// The first entry that does not link to the one before it, whose hash does not match, whose
  /// rows differ from its payload (`problem`), or whose check failed (`error`, rethrown by the
  /// caller).
  struct Break {
    enum class Kind { Link, Hash, Rows, Error };
    Kind kind;
    AuditEntry entry;
    std::string problem;
    std::exception_ptr error;
  };

  explicit ChainCheck(RowsCheck check_rows);
  ~ChainCheck();
  ChainCheck(const ChainCheck&) = delete;
  ChainCheck& operator=(const ChainCheck&) = delete;

  /// The slot of the next entry, for the reader to fill (its strings keep the room of an entry
  /// checked before: reading the trail allocates next to nothing). Handed over by add(); filled
  /// again by the next call otherwise.
  Item& next();
  /// Hands over the entry filled in the slot next() gave (its seq is the caller's to check).
  void add();
  /// Whether a break was found already (the reader may stop: nothing after it counts).
  bool broken() const;
  /// Waits until every entry handed over is checked: the first break, if any.
  std::optional<Break> finish();
  /// The hash of the last entry checked (the genesis hash before any), once finished.
  const std::string& head_hash() const { return head_hash_; }

 private:
  struct Batch {
    std::vector<Item> items;  // items[0, size) are in use; the rest keep their room
    std::size_t size = 0;
  };

  void run();
  void flush();

  RowsCheck check_rows_;
  Batch batch_;  // the reader's, not yet handed over
  std::size_t batch_bytes_ = 0;

  mutable std::mutex mutex_;
  std::condition_variable changed_;
  std::vector<Batch> queue_;
  std::vector<Batch> spare_;  // checked batches, back to the reader for their room
  bool closed_ = false;
  bool finished_ = false;
  std::optional<Break> break_;

  std::string head_hash_ = kGenesisHash;  // the checking thread's until finished
  std::thread thread_;
};

}  // namespace cw::audit
