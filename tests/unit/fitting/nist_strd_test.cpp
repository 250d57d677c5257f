// SPDX-License-Identifier: Apache-2.0
// Checks fit() against the certified results of the NIST StRD linear least-squares datasets
// Norris, Pontius, NoInt1 and NoInt2 by log relative error (LRE).
#include <algorithm>
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdlib>
#include <fstream>
#include <iomanip>
#include <iostream>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "fitting/fit.h"

namespace {

using cw::fitting::FitResult;
using cw::fitting::Model;
using cw::fitting::Observation;
using cw::fitting::Weighting;

// Source of every certified value in this file: NIST Statistical Reference Datasets, Linear
// Least Squares Regression, Statistical Engineering Division, Information Technology Laboratory,
// NIST (tests/data/nist-strd/certified.json, copied digit for digit from the NIST .dat files).
constexpr double kMinLre = 9.0;

std::string data_path(const std::string& name) {
  return std::string(CW_TEST_DATA_DIR) + "/nist-strd/" + name;
}

const nlohmann::json& certified() {
  static const nlohmann::json document = [] {
    std::ifstream in(data_path("certified.json"));
    if (!in) throw std::runtime_error("cannot open " + data_path("certified.json"));
    return nlohmann::json::parse(in);
  }();
  return document;
}

// Certified numbers are JSON strings in NIST notation; strtod reads them without a detour.
double certified_number(const nlohmann::json& value) {
  const std::string text = value.get<std::string>();
  char* end = nullptr;
  const double number = std::strtod(text.c_str(), &end);
  if (end == text.c_str() || *end != '\0') throw std::runtime_error("not a number: " + text);
  return number;
}

std::vector<Observation> read_xy(const std::string& file) {
  std::ifstream in(data_path(file));
  if (!in) throw std::runtime_error("cannot open " + data_path(file));
  std::string line;
  std::getline(in, line);
  if (line != "x,y") throw std::runtime_error("unexpected header in " + file + ": " + line);
  std::vector<Observation> out;
  while (std::getline(in, line)) {
    if (line.empty()) continue;
    const auto comma = line.find(',');
    out.push_back({std::strtod(line.substr(0, comma).c_str(), nullptr),
                   std::strtod(line.substr(comma + 1).c_str(), nullptr)});
  }
  return out;
}

// LRE = -log10(|estimate - certified|/|certified|), capped at 15 for an exact match.
double lre(double estimate, double cert) {
  if (estimate == cert) return 15.0;
  return std::min(15.0, -std::log10(std::abs(estimate - cert) / std::abs(cert)));
}

void check_lre(const std::string& dataset, const std::string& what, double estimate, double cert) {
  const double value = lre(estimate, cert);
  std::cout << dataset << ' ' << what << " LRE " << std::fixed << std::setprecision(1) << value
            << std::defaultfloat << '\n';
  INFO(dataset << ' ' << what << ": estimate " << std::setprecision(17) << estimate
               << ", certified " << cert << ", LRE " << value);
  CHECK(value >= kMinLre);
}

void check_dataset(const std::string& name, Model model) {
  const nlohmann::json& entry = certified().at("datasets").at(name);
  const std::vector<Observation> data = read_xy(entry.at("file").get<std::string>());
  REQUIRE(data.size() == entry.at("observations").get<std::size_t>());

  const FitResult fit = cw::fitting::fit(model, Weighting::None, data);
  REQUIRE(fit.dof == entry.at("residual_df").get<int>());

  for (const auto& parameter : entry.at("parameters")) {
    const std::string term = parameter.at("term").get<std::string>();
    double estimate = 0;
    double sd = 0;
    if (term == "1") {
      estimate = fit.intercept;
      sd = fit.se_intercept;
    } else if (term == "x") {
      estimate = fit.slope;
      sd = fit.se_slope;
    } else if (term == "x^2") {
      estimate = fit.quadratic;
      sd = fit.se_quadratic;
    } else {
      FAIL("unexpected term " << term);
    }
    const std::string label = parameter.at("name").get<std::string>();
    check_lre(name, label, estimate, certified_number(parameter.at("estimate")));
    check_lre(name, label + " sd", sd, certified_number(parameter.at("std_dev")));
  }
  check_lre(name, "residual sd", fit.residual_sd, certified_number(entry.at("residual_std_dev")));
  check_lre(name, "r2", fit.r2, certified_number(entry.at("r_squared")));
}

}  // namespace

// NIST StRD, Statistical Engineering Division: Norris, straight line, lower difficulty.
TEST_CASE("fit: NIST StRD Norris straight line reaches LRE >= 9", "[fitting][nist]") {
  check_dataset("Norris", Model::Linear);
}

// NIST StRD, Statistical Engineering Division: Pontius, quadratic, lower difficulty.
TEST_CASE("fit: NIST StRD Pontius quadratic reaches LRE >= 9", "[fitting][nist]") {
  check_dataset("Pontius", Model::Quadratic);
}

// NIST StRD, Statistical Engineering Division: NoInt1, line through the origin, uncentred R².
TEST_CASE("fit: NIST StRD NoInt1 through origin reaches LRE >= 9", "[fitting][nist]") {
  const nlohmann::json& entry = certified().at("datasets").at("NoInt1");
  REQUIRE_FALSE(entry.at("intercept").get<bool>());
  check_dataset("NoInt1", Model::LinearThroughOrigin);
}

// NIST StRD, Statistical Engineering Division: NoInt2, line through the origin, uncentred R².
TEST_CASE("fit: NIST StRD NoInt2 through origin reaches LRE >= 9", "[fitting][nist]") {
  const nlohmann::json& entry = certified().at("datasets").at("NoInt2");
  REQUIRE_FALSE(entry.at("intercept").get<bool>());
  check_dataset("NoInt2", Model::LinearThroughOrigin);
}
