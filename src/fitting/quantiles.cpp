// SPDX-License-Identifier: Apache-2.0
// Student-t and Fisher F quantiles; the only translation unit that sees Boost.Math.
#include <array>
#include <boost/math/distributions/fisher_f.hpp>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <cstddef>

#include "fitting/fit.h"
#include "fitting/number_format.h"

namespace cw::fitting {
namespace {

void check_probability(double p) {
  if (!(p > 0 && p < 1)) {
    throw FitError("a quantile needs a probability between 0 and 1, got " +
                   detail::format_number(p));
  }
}

void check_dof(double dof) {
  if (!(dof > 0) || std::isinf(dof)) {
    throw FitError("a quantile needs degrees of freedom above 0, got " +
                   detail::format_number(dof));
  }
}

}  // namespace

double student_t_quantile(double p, double dof) {
  check_probability(p);
  check_dof(dof);
  // Remembered per thread: a run's samples ask for the same few quantiles thousands of times,
  // and Boost's inverse incomplete beta costs microseconds each time.
  struct Remembered {
    double p = 0;
    double dof = 0;
    double value = 0;
  };
  constexpr std::size_t kRemembered = 8;
  thread_local std::array<Remembered, kRemembered> remembered{};
  thread_local std::size_t next = 0;
  for (const Remembered& r : remembered) {
    if (r.p == p && r.dof == dof) return r.value;
  }
  const double value = boost::math::quantile(boost::math::students_t_distribution<double>(dof), p);
  remembered[next] = {p, dof, value};
  next = (next + 1) % kRemembered;
  return value;
}

double f_quantile(double p, double dof1, double dof2) {
  check_probability(p);
  check_dof(dof1);
  check_dof(dof2);
  return boost::math::quantile(boost::math::fisher_f_distribution<double>(dof1, dof2), p);
}

}  // namespace cw::fitting
