// SPDX-License-Identifier: Apache-2.0
// In-process benchmarks (Google Benchmark) on a generated store, each beside its plain-SQLite
// baseline: `audit verify` against a scan of the audit table reading every column, and the
// rows of a run written through the store against plain inserts of the same result rows with a
// prepared statement, in one transaction, into a table with the results table's own indexes.
// The baselines use the SQLite C library directly: they are the yardstick, not product code.
//
//   curvewarden-bench --store lab.db [Google Benchmark flags]
#include <benchmark/benchmark.h>
#include <sqlite3.h>

#include <cstdio>
#include <cstring>
#include <filesystem>
#include <stdexcept>
#include <string>
#include <vector>

#include "store/store.h"

namespace {

std::string g_store;
constexpr int kRows = 100'000;

sqlite3* open_db(const std::string& path, int flags) {
  sqlite3* db = nullptr;
  if (sqlite3_open_v2(path.c_str(), &db, flags, nullptr) != SQLITE_OK) {
    throw std::runtime_error("cannot open " + path);
  }
  return db;
}

void exec(sqlite3* db, const std::string& sql) {
  char* error = nullptr;
  if (sqlite3_exec(db, sql.c_str(), nullptr, nullptr, &error) != SQLITE_OK) {
    const std::string message = error ? error : "?";
    sqlite3_free(error);
    throw std::runtime_error(message + " in: " + sql);
  }
}

void BM_AuditVerify(benchmark::State& state) {
  cw::store::OpenOptions options;
  options.location = g_store;
  auto store = cw::store::Store::open(options);
  // (No user counters: the CSV report wants the same counters on every benchmark.)
  for (auto _ : state) {
    auto unit = store->read();
    const auto report = unit->audit().verify();
    if (!report.ok) state.SkipWithError("the audit chain does not verify");
  }
}

void BM_AuditScan(benchmark::State& state) {
  sqlite3* db = open_db(g_store, SQLITE_OPEN_READONLY);
  std::int64_t bytes = 0;
  for (auto _ : state) {
    sqlite3_stmt* s = nullptr;
    sqlite3_prepare_v2(db, "SELECT * FROM audit_log ORDER BY seq", -1, &s, nullptr);
    while (sqlite3_step(s) == SQLITE_ROW) {
      for (int i = 0; i < sqlite3_column_count(s); ++i) {
        const unsigned char* text = sqlite3_column_text(s, i);
        if (text) bytes += sqlite3_column_bytes(s, i);
      }
    }
    sqlite3_finalize(s);
  }
  benchmark::DoNotOptimize(bytes);
  sqlite3_close(db);
}

/// The results table and its indexes as the store defines them, in a scratch file.
std::string results_ddl() {
  sqlite3* db = open_db(g_store, SQLITE_OPEN_READONLY);
  sqlite3_stmt* s = nullptr;
  sqlite3_prepare_v2(db,
                     "SELECT sql FROM sqlite_master WHERE tbl_name = 'results' "
                     "AND type IN ('table', 'index') AND sql IS NOT NULL ORDER BY type DESC",
                     -1, &s, nullptr);
  std::string ddl;
  while (sqlite3_step(s) == SQLITE_ROW) {
    ddl += reinterpret_cast<const char*>(sqlite3_column_text(s, 0));
    ddl += ";\n";
  }
  sqlite3_finalize(s);
  sqlite3_close(db);
  return ddl;
}

void BM_PlainResultInserts(benchmark::State& state) {
  const std::string ddl = results_ddl();
  const std::string path =
      (std::filesystem::temp_directory_path() / "curvewarden-bench-inserts.db").string();
  for (auto _ : state) {
    state.PauseTiming();
    std::filesystem::remove(path);
    std::filesystem::remove(path + "-wal");
    sqlite3* db = open_db(path, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE);
    exec(db, "PRAGMA journal_mode = WAL");
    exec(db, ddl);
    state.ResumeTiming();
    exec(db, "BEGIN IMMEDIATE");
    sqlite3_stmt* s = nullptr;
    sqlite3_prepare_v2(db,
                       "INSERT INTO results (sample, analyte, status, curve_id, method_id, "
                       "instrument_id, response, replicates, dilution, x0, sd_x0, concentration, "
                       "ci_low, ci_high, flags, reasons, reason_details, analyst, occurred_at, "
                       "uncertainty, audit_seq) VALUES (?, ?, 'reported', ?, 1, 1, ?, 1, 1, ?, "
                       "?, ?, ?, ?, '[]', '[]', '[]', 'bench-analyst', "
                       "'2026-12-01T12:00:00Z', ?, ?)",
                       -1, &s, nullptr);
    for (int i = 0; i < kRows; ++i) {
      const std::string sample = "W" + std::to_string(i / 30);
      const double x = 1.0 + (i % 400) * 0.1;
      const std::string uncertainty =
          "{\"combined\":0.0123,\"components\":[{\"relative_u\":0.011,\"source\":"
          "\"calibration\"},{\"relative_u\":0.0025,\"source\":\"lot RM-1\"}],\"expanded\":"
          "0.0246,\"k\":2}";
      sqlite3_bind_text(s, 1, sample.c_str(), -1, SQLITE_TRANSIENT);
      sqlite3_bind_text(s, 2, "nitrate", -1, SQLITE_STATIC);
      sqlite3_bind_int64(s, 3, 1 + i % 30);
      sqlite3_bind_double(s, 4, 0.5 * x);
      sqlite3_bind_double(s, 5, x);
      sqlite3_bind_double(s, 6, 0.01 * x);
      sqlite3_bind_double(s, 7, x);
      sqlite3_bind_double(s, 8, 0.98 * x);
      sqlite3_bind_double(s, 9, 1.02 * x);
      sqlite3_bind_text(s, 10, uncertainty.c_str(), -1, SQLITE_TRANSIENT);
      sqlite3_bind_int64(s, 11, i + 1);
      if (sqlite3_step(s) != SQLITE_DONE) throw std::runtime_error(sqlite3_errmsg(db));
      sqlite3_reset(s);
    }
    sqlite3_finalize(s);
    exec(db, "COMMIT");
    state.PauseTiming();
    sqlite3_close(db);
    state.ResumeTiming();
  }
  std::filesystem::remove(path);
  std::filesystem::remove(path + "-wal");
}

}  // namespace

BENCHMARK(BM_AuditVerify)->Unit(benchmark::kMillisecond)->Iterations(1);
BENCHMARK(BM_AuditScan)->Unit(benchmark::kMillisecond)->Iterations(1);
BENCHMARK(BM_PlainResultInserts)->Unit(benchmark::kMillisecond)->Iterations(1);

int main(int argc, char** argv) {
  std::vector<char*> rest;
  for (int i = 0; i < argc; ++i) {
    if (std::strcmp(argv[i], "--store") == 0 && i + 1 < argc) {
      g_store = argv[++i];
    } else {
      rest.push_back(argv[i]);
    }
  }
  if (g_store.empty()) {
    std::fprintf(stderr, "curvewarden-bench: error: --store FILE is required\n");
    return 2;
  }
  int n = static_cast<int>(rest.size());
  benchmark::Initialize(&n, rest.data());
  benchmark::RunSpecifiedBenchmarks();
  benchmark::Shutdown();
  return 0;
}
