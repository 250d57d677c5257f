// SPDX-License-Identifier: Apache-2.0
// An audit trail checked on a thread of its own.
#include "audit/chain_check.h"

#include <utility>

namespace cw::audit {
namespace {

// Entries are handed over in batches (one lock per batch), at most this many batches waiting:
// the memory held stays small whatever the size of the trail, and what the reader copied is
// still in cache when it is checked.
constexpr std::size_t kBatchEntries = 64;
constexpr std::size_t kBatchBytes = 1 << 18;
constexpr std::size_t kQueuedBatches = 4;

}  // namespace

ChainCheck::ChainCheck(RowsCheck check_rows)
    : check_rows_(std::move(check_rows)), thread_([this] { run(); }) {}

ChainCheck::~ChainCheck() {
  {
    std::lock_guard lock(mutex_);
    closed_ = true;
    queue_.clear();
  }
  changed_.notify_all();
  if (thread_.joinable()) thread_.join();
}

ChainCheck::Item& ChainCheck::next() {
  if (batch_.size == batch_.items.size()) batch_.items.emplace_back();
  Item& item = batch_.items[batch_.size];
  item.rows.clear();
  item.rows_complete = true;
  return item;
}

void ChainCheck::add() {
  const Item& item = batch_.items[batch_.size++];
  batch_bytes_ += item.entry.payload.size() + item.rows.size();
  if (batch_.size >= kBatchEntries || batch_bytes_ >= kBatchBytes) flush();
}

void ChainCheck::flush() {
  if (batch_.size == 0) return;
  Batch spare;
  {
    std::unique_lock lock(mutex_);
    changed_.wait(lock, [&] { return queue_.size() < kQueuedBatches || break_; });
    if (!break_) queue_.push_back(std::move(batch_));
    if (!spare_.empty()) {
      spare = std::move(spare_.back());
      spare_.pop_back();
    }
  }
  changed_.notify_all();
  batch_ = std::move(spare);
  batch_.size = 0;
  batch_bytes_ = 0;
}

bool ChainCheck::broken() const {
  std::lock_guard lock(mutex_);
  return break_.has_value();
}

std::optional<ChainCheck::Break> ChainCheck::finish() {
  flush();
  {
    std::unique_lock lock(mutex_);
    closed_ = true;
    changed_.notify_all();
    changed_.wait(lock, [&] { return finished_; });
  }
  thread_.join();
  return std::move(break_);
}

void ChainCheck::run() {
  EntryHasher hasher;
  std::string prev_hash = kGenesisHash;
  Batch batch;
  for (;;) {
    {
      std::unique_lock lock(mutex_);
      if (!batch.items.empty()) spare_.push_back(std::move(batch));
      changed_.wait(lock, [&] { return !queue_.empty() || closed_; });
      if (queue_.empty()) break;
      batch = std::move(queue_.front());
      queue_.erase(queue_.begin());
    }
    changed_.notify_all();
    std::optional<Break> found;
    for (std::size_t i = 0; i < batch.size && !found; ++i) {
      Item& item = batch.items[i];
      AuditEntry& e = item.entry;
      try {
        if (e.prev_hash != prev_hash) {
          found = Break{Break::Kind::Link, std::move(e), {}, nullptr};
        } else if (hasher.hash(e) != e.hash) {
          found = Break{Break::Kind::Hash, std::move(e), {}, nullptr};
        } else if (auto problem = check_rows_(item)) {
          found = Break{Break::Kind::Rows, std::move(e), std::move(*problem), nullptr};
        }
      } catch (...) {
        found = Break{Break::Kind::Error, std::move(e), {}, std::current_exception()};
      }
      if (!found) prev_hash = e.hash;
    }
    if (found) {
      std::lock_guard lock(mutex_);
      break_ = std::move(found);
      queue_.clear();
      break;
    }
  }
  std::lock_guard lock(mutex_);
  head_hash_ = std::move(prev_hash);
  finished_ = true;
  changed_.notify_all();
}

}  // namespace cw::audit
