// SPDX-License-Identifier: Apache-2.0
// Internal to the PostgreSQL backend: giving up on a server that stops answering.
//
// libpq waits for a reply without a deadline, and a server whose processes are stopped (or a host
// that hangs with its network stack alive) still has its kernel acknowledge TCP and answer
// keepalives, so nothing else notices: a command would wait for ever. While a request waits for
// its reply, a second thread watches the clock; once the wait passes the limit, it shuts the
// connection's socket down, the waiting call returns with a broken connection, and the command
// ends as for a lost connection (exit 4, nothing of it written), saying that the server did not
// answer in time.
#pragma once

#include <atomic>
#include <chrono>
#include <condition_variable>
#include <cstdint>
#include <mutex>
#include <thread>

namespace cw::store::postgresql {

class ReplyWatch {
 public:
  explicit ReplyWatch(std::chrono::milliseconds limit) : limit_(limit) {}
  ReplyWatch(const ReplyWatch&) = delete;
  ReplyWatch& operator=(const ReplyWatch&) = delete;
  ~ReplyWatch();

  /// Watches the connection whose socket is `socket` from now on (a duplicate of it is kept, so
  /// that the number never names another file); -1 watches none.
  void watch_socket(int socket);
  /// True once a request has been given up on.
  bool gave_up() const { return gave_up_.load(); }
  std::chrono::milliseconds limit() const { return limit_; }
  /// The limit of the request given up on (the limit, or a bulk statement's).
  std::chrono::milliseconds exceeded() const {
    return std::chrono::duration_cast<std::chrono::milliseconds>(
        std::chrono::nanoseconds(exceeded_.load()));
  }

  /// Held while a request waits for its reply: atomic stores and an uncontended lock, no
  /// wake-up. A bulk statement over the whole store (a migration, building derived rows after a
  /// copy) may take `kBulkTimes` the limit.
  class Waiting {
   public:
    static constexpr int kBulkTimes = 10;
    explicit Waiting(ReplyWatch& watch, bool bulk = false);
    ~Waiting() { watch_.since_.store(0); }
    Waiting(const Waiting&) = delete;
    Waiting& operator=(const Waiting&) = delete;

   private:
    ReplyWatch& watch_;
  };

 private:
  void run();

  const std::chrono::milliseconds limit_;
  /// When the request now waiting was sent (steady clock, nanoseconds); 0 when none waits.
  std::atomic<std::int64_t> since_{0};
  /// How long the request now waiting may take (nanoseconds).
  std::atomic<std::int64_t> allowed_{0};
  std::atomic<bool> gave_up_{false};
  std::atomic<std::int64_t> exceeded_{0};
  std::mutex mutex_;  ///< guards socket_, stop_ and the thread's start
  std::condition_variable stopping_;
  int socket_ = -1;
  bool stop_ = false;
  bool started_ = false;
  std::thread thread_;
};

/// The limit set by CURVEWARDEN_REPLY_TIMEOUT (whole seconds, 1 to 86400), else 30 s. A value
/// that is not one is bad input (UsageError naming the variable).
std::chrono::milliseconds reply_limit_from_environment();

}  // namespace cw::store::postgresql
