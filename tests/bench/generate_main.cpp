// SPDX-License-Identifier: Apache-2.0
// curvewarden-bench-store: builds a benchmark store (store_generator.h) and, with --files, the
// input files the command benchmarks use and a shell-readable description of the store.
//
//   curvewarden-bench-store --out lab.db --curves 100000 [--seed 1] [--end 2026-12-01T12:00:00Z]
//                           [--files DIR]
//   curvewarden-bench-store --files DIR [--seed 1]     (the input files only)
#include <chrono>
#include <cstdlib>
#include <exception>
#include <fstream>
#include <iostream>
#include <string>

#include "core/error.h"
#include "store_generator.h"

namespace {

[[noreturn]] void usage(const std::string& problem) {
  std::cerr << "curvewarden-bench-store: error: " << problem << "\n"
            << "usage: curvewarden-bench-store --out FILE --curves N [--seed N] [--end TIME]"
               " [--files DIR] [--quiet]\n";
  std::exit(2);
}

void write_file(const std::string& path, const std::string& text) {
  std::ofstream out(path, std::ios::binary);
  out << text;
  if (!out) throw std::runtime_error("cannot write '" + path + "'");
}

}  // namespace

int main(int argc, char** argv) {
  cw::bench::GeneratorOptions o;
  o.end = cw::parse_instant("2026-12-01T12:00:00Z");
  std::string files;
  bool quiet = false;
  for (int i = 1; i < argc; ++i) {
    const std::string arg = argv[i];
    const auto value = [&]() -> std::string {
      if (i + 1 >= argc) usage(arg + " needs a value");
      return argv[++i];
    };
    try {
      if (arg == "--out") {
        o.location = value();
      } else if (arg == "--curves") {
        o.curves = std::stoll(value());
      } else if (arg == "--seed") {
        o.seed = std::stoull(value());
      } else if (arg == "--end") {
        o.end = cw::parse_instant(value(), "--end");
      } else if (arg == "--files") {
        files = value();
      } else if (arg == "--quiet") {
        quiet = true;
      } else {
        usage("unknown option '" + arg + "'");
      }
    } catch (const std::logic_error&) {
      usage("expected a number for " + arg);
    } catch (const cw::Error& e) {
      usage(e.what());
    }
  }
  if (o.location.empty() && files.empty()) usage("--out or --files is required");
  if (o.curves < 1) usage("--curves must be at least 1");
  if (!quiet) o.progress = [](const std::string& line) { std::cerr << "  " << line << "\n"; };
  try {
    if (!files.empty()) {
      // The input files depend on the seed only: --files without --out rewrites them for a
      // store generated before.
      write_file(files + "/points-30x12x3.csv", cw::bench::wide_points_file(12, 3, o.seed));
      write_file(files + "/run-100000.csv", cw::bench::wide_run_file(100000, 20, o.seed));
      write_file(files + "/run-310.csv", cw::bench::wide_run_file(310, 2, o.seed));
    }
    if (o.location.empty()) return 0;
    const auto started = std::chrono::steady_clock::now();
    const cw::bench::GeneratorReport r = cw::bench::generate_store(o);
    const double seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count();
    std::cout << "calibrations " << r.calibrations << "\ncurves " << r.curves << "\npoints "
              << r.points << "\nreviews " << r.reviews << "\nretirements " << r.retirements
              << "\nruns " << r.runs << "\nchecks " << r.checks << "\nresults " << r.results
              << "\nentries " << r.entries << "\nseconds " << seconds << "\n";
    if (!files.empty()) {
      write_file(files + "/store.env",
                 "BENCH_NOW=" + cw::format_utc(o.end) + "\nBENCH_METHOD=" + r.wide_method +
                     "\nBENCH_INSTRUMENT=" + r.wide_instrument + "\nBENCH_LOT=" + r.wide_lot +
                     "\nBENCH_CURVE=" + std::to_string(r.active_curve) + "\nBENCH_CHECK_RESPONSE=" +
                     std::to_string(r.check_response) + "\nBENCH_ANALYTE=" + r.active_analyte +
                     "\nBENCH_CURVES=" + std::to_string(r.curves) +
                     "\nBENCH_ENTRIES=" + std::to_string(r.entries) + "\n");
    }
  } catch (const std::exception& e) {
    std::cerr << "curvewarden-bench-store: error: " << e.what() << "\n";
    return 1;
  }
  return 0;
}
