// SPDX-License-Identifier: Apache-2.0
#include "store/postgresql/reply_watch.h"

#include <sys/socket.h>
#include <unistd.h>

#include <algorithm>
#include <cstdlib>
#include <string>

#include "core/error.h"

namespace cw::store::postgresql {
namespace {

using Steady = std::chrono::steady_clock;

constexpr std::chrono::seconds kDefaultLimit{30};
constexpr long kMaxLimitSeconds = 86400;

std::int64_t now_ns() {
  return std::chrono::duration_cast<std::chrono::nanoseconds>(Steady::now().time_since_epoch())
      .count();
}

}  // namespace

ReplyWatch::Waiting::Waiting(ReplyWatch& watch, bool bulk) : watch_(watch) {
  watch_.allowed_.store(
      std::chrono::duration_cast<std::chrono::nanoseconds>(watch_.limit_).count() *
      (bulk ? kBulkTimes : 1));
  watch_.since_.store(std::max<std::int64_t>(1, now_ns()));
  std::lock_guard<std::mutex> lock(watch_.mutex_);
  if (!watch_.started_) {
    watch_.started_ = true;
    watch_.thread_ = std::thread([w = &watch_] { w->run(); });
  }
}

ReplyWatch::~ReplyWatch() {
  {
    std::lock_guard<std::mutex> lock(mutex_);
    stop_ = true;
  }
  stopping_.notify_all();
  if (thread_.joinable()) thread_.join();
  if (socket_ >= 0) ::close(socket_);
}

void ReplyWatch::watch_socket(int socket) {
  std::lock_guard<std::mutex> lock(mutex_);
  if (socket_ >= 0) ::close(socket_);
  socket_ = socket >= 0 ? ::dup(socket) : -1;
}

// Wakes a few times a second (a tenth of the limit, at most a second apart): a request is given
// up on between its limit and a tick after it. The thread that sends requests only stores the
// moment it sent one, so a fast round trip costs it nothing more.
void ReplyWatch::run() {
  const auto tick = std::min<std::chrono::milliseconds>(std::chrono::seconds(1), limit_ / 10);
  std::int64_t given_up_on = 0;
  std::unique_lock<std::mutex> lock(mutex_);
  while (!stop_) {
    stopping_.wait_for(lock, std::max(tick, std::chrono::milliseconds(10)));
    if (stop_) break;
    const std::int64_t since = since_.load();
    const std::int64_t allowed = allowed_.load();
    if (since == 0 || since == given_up_on || now_ns() - since < allowed || socket_ < 0) {
      continue;
    }
    given_up_on = since;
    exceeded_.store(allowed);
    gave_up_.store(true);
    ::shutdown(socket_, SHUT_RDWR);
  }
}

std::chrono::milliseconds reply_limit_from_environment() {
  const char* text = std::getenv("CURVEWARDEN_REPLY_TIMEOUT");
  if (text == nullptr || *text == '\0') return kDefaultLimit;
  const std::string value = text;
  const bool digits = value.size() <= 5 && std::all_of(value.begin(), value.end(),
                                                       [](char c) { return c >= '0' && c <= '9'; });
  const long seconds = digits ? std::stol(value) : 0;
  if (seconds < 1 || seconds > kMaxLimitSeconds) {
    throw UsageError("CURVEWARDEN_REPLY_TIMEOUT '" + value +
                         "' is not a whole number of seconds from 1 to 86400",
                     "set it to how long a command waits for the PostgreSQL server to answer one "
                     "request (default 30), or unset it");
  }
  return std::chrono::seconds(seconds);
}

}  // namespace cw::store::postgresql
