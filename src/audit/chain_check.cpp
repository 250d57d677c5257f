// SPDX-License-Identifier: Apache-2.0
// Links and hashes of an audit trail, checked on a thread of their own.
#include "audit/chain_check.h"

#include <utility>

namespace cw::audit {
namespace {

// Entries are handed over in batches (one lock per batch), at most this many batches waiting:
// the memory held stays small whatever the size of the trail.
constexpr std::size_t kBatchEntries = 64;
constexpr std::size_t kBatchBytes = 1 << 20;
constexpr std::size_t kQueuedBatches = 4;

}  // namespace

ChainCheck::ChainCheck() : thread_([this] { run(); }) {}

ChainCheck::~ChainCheck() {
  {
    std::lock_guard lock(mutex_);
    closed_ = true;
    queue_.clear();
  }
  changed_.notify_all();
  if (thread_.joinable()) thread_.join();
}

void ChainCheck::add(AuditEntry&& entry) {
  batch_bytes_ += entry.payload.size();
  batch_.push_back(std::move(entry));
  if (batch_.size() >= kBatchEntries || batch_bytes_ >= kBatchBytes) flush();
}

void ChainCheck::flush() {
  if (batch_.empty()) return;
  {
    std::unique_lock lock(mutex_);
    changed_.wait(lock, [&] { return queue_.size() < kQueuedBatches || break_; });
    if (!break_) queue_.push_back(std::move(batch_));
  }
  changed_.notify_all();
  batch_.clear();
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
  std::vector<AuditEntry> batch;
  for (;;) {
    {
      std::unique_lock lock(mutex_);
      changed_.wait(lock, [&] { return !queue_.empty() || closed_; });
      if (queue_.empty()) break;
      batch = std::move(queue_.front());
      queue_.erase(queue_.begin());
    }
    changed_.notify_all();
    std::optional<Break> found;
    for (AuditEntry& e : batch) {
      if (e.prev_hash != prev_hash) {
        found = Break{Break::Kind::Link, std::move(e), nullptr};
        break;
      }
      try {
        if (hasher.hash(e) != e.hash) {
          found = Break{Break::Kind::Hash, std::move(e), nullptr};
          break;
        }
      } catch (...) {
        found = Break{Break::Kind::Error, std::move(e), std::current_exception()};
        break;
      }
      prev_hash = std::move(e.hash);
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
