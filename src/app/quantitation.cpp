// SPDX-License-Identifier: Apache-2.0
// Checks and quantitation.
#include "app/quantitation.h"

#include <cmath>
#include <numeric>

#include "app/registry.h"
#include "core/error.h"
#include "core/text.h"
#include "fitting/fit.h"
#include "store/curve_repository.h"

namespace cw::app {
namespace {

double checked_positive(double v, const std::string& what) {
  if (!std::isfinite(v) || v <= 0)
    throw UsageError(what + " must be a number above 0, got " + format_plain(v));
  return v;
}

/// The fitted response for a reading: the analyte response, or the ratio to the internal standard.
double fitted_response(const MethodDefinition& d, double response,
                       const std::optional<double>& is_response, const std::string& option) {
  if (!std::isfinite(response)) throw UsageError(option + " must be a finite number");
  if (d.internal_standard) {
    if (!is_response) {
      throw UsageError("method " + quote(d.code) + " uses the internal standard " +
                           quote(*d.internal_standard) + ": give --is-response",
                       "the response is divided by the internal-standard response");
    }
    return response / checked_positive(*is_response, "--is-response");
  }
  if (is_response) {
    throw UsageError("method " + quote(d.code) +
                     " has no internal standard; --is-response does not apply");
  }
  return response;
}

std::vector<std::string> tokens(const std::vector<Finding>& findings) {
  std::vector<std::string> out;
  for (const auto& f : findings) out.emplace_back(to_string(f.reason));
  return out;
}

std::vector<ReasonDetail> details(const std::vector<Finding>& findings) {
  std::vector<ReasonDetail> out;
  for (const auto& f : findings)
    out.push_back({std::string(to_string(f.reason)), f.since, f.message});
  return out;
}

/// The smallest usual dilution factor that brings x0 below 80 % of the top calibrator
/// (common practice: aim for the upper middle of the range, not its edge).
std::optional<double> suggest_dilution(double x0, double high) {
  for (double df : {2.0, 5.0, 10.0, 20.0, 50.0, 100.0, 200.0, 500.0, 1000.0, 10000.0}) {
    if (x0 / df <= 0.8 * high) return df;
  }
  return std::nullopt;
}

std::string sample_text(const std::string& s) {
  std::string t = trim(s);
  if (t.empty()) throw UsageError("--sample is empty", "give the sample's id");
  if (t.size() > 200) throw UsageError("--sample is longer than 200 characters");
  for (char c : t) {
    if (static_cast<unsigned char>(c) < 0x20)
      throw UsageError("--sample contains a control character");
  }
  return t;
}

}  // namespace

CheckOutcome log_check(Session& s, const CheckRequest& r) {
  const CurveId id = parse_curve_id(r.curve);
  const Instant at = s.at();
  Check check;
  std::optional<std::pair<std::vector<std::string>, std::string>> refusal;
  std::string unit;
  {
    store::ReadTransaction read(s.db());
    FactLoader facts(s);
    const Curve& c = facts.curve(id);
    const MethodDefinition& d = facts.version_of(id).definition;
    unit = d.unit;
    require_acquired(s, c);
    check.curve_id = id;
    check.kind = r.kind;
    check.response = r.response;
    check.is_response = r.is_response;
    const double y = fitted_response(d, r.response, r.is_response, "--response");
    if (r.kind == CheckKind::Check) {
      if (!r.nominal)
        throw UsageError("a check needs --nominal CONC",
                         "the check standard's nominal concentration");
      check.nominal = checked_positive(*r.nominal, "--nominal");
    } else {
      if (r.nominal && *r.nominal != 0)
        throw UsageError("a blank has nominal 0; leave out --nominal or give 0");
      check.nominal = 0;
    }
    check.measured = fitting::back_calculate(c.fit, y);
    if (r.kind == CheckKind::Check) {
      check.limit_low = 100 - d.check.tolerance_pct;
      check.limit_high = 100 + d.check.tolerance_pct;
      if (check.measured) check.recovery_pct = 100 * *check.measured / check.nominal;
      check.passed = check.recovery_pct && *check.recovery_pct >= *check.limit_low &&
                     *check.recovery_pct <= *check.limit_high;
    } else {
      check.limit_high = d.check.blank_limit ? *d.check.blank_limit : c.fit.lod;
      check.passed = check.measured && *check.measured < *check.limit_high;
    }
    check.analyst = s.actor().name;
    check.occurred_at = at;
    const CurveStatus status = facts.status(id, at);
    if (status.state == CurveState::Rejected || status.state == CurveState::Retired) {
      refusal = {{std::string(to_string(status.state))},
                 "curve " + r.curve + " is " + std::string(to_string(status.state)) + " (" +
                     (status.cause ? status.cause->message : std::string()) +
                     "); checks are not recorded against it"};
    }
  }
  if (refusal) refuse(s, "check.log", "curve", r.curve, refusal->first, refusal->second);

  CheckOutcome out;
  out.unit = unit;
  {
    auto tx = s.write();
    check.id = store::insert_check(tx, check);
    tx.append_entry({"check.log", "check", std::to_string(check.id.value),
                     std::string(to_string(check.kind)) + (check.passed ? " passed" : " FAILED") +
                         " on curve " + r.curve,
                     at});
    tx.commit();
  }
  out.check = check;
  FactLoader facts(s);
  if (!check.passed) {
    // Results since the last passing check before this one (or since acquisition) must be re-run.
    std::optional<Instant> last_pass;
    for (const auto& k : store::checks_of_curve(s.db(), id)) {
      if (k.passed && k.occurred_at <= at && k.id != check.id) last_pass = k.occurred_at;
    }
    out.affected_results = store::reported_results_between(s.db(), id, last_pass, at);
  }
  out.curve = make_view(facts, id, at);
  return out;
}

QuantifyOutcome quantify(Session& s, const QuantifyRequest& r) {
  const Instant at = s.at();
  const std::string sample = sample_text(r.sample);
  if (r.responses.empty()) throw UsageError("give --response R");
  const double dilution = checked_positive(r.dilution, "--dilution");
  int m = static_cast<int>(r.responses.size());
  if (r.replicates) {
    if (*r.replicates < 1) throw UsageError("--replicates must be at least 1");
    if (r.responses.size() > 1 && *r.replicates != m) {
      throw UsageError("--replicates " + std::to_string(*r.replicates) + " does not match the " +
                       std::to_string(m) + " --response values given");
    }
    m = *r.replicates;
  }
  const double response =
      std::accumulate(r.responses.begin(), r.responses.end(), 0.0) / r.responses.size();
  if (r.curve && (r.method || r.instrument || r.analyte)) {
    throw UsageError("give either --curve ID or --method, --instrument and --analyte, not both");
  }
  if (!r.curve && !(r.method && r.instrument && r.analyte)) {
    throw UsageError("give --curve ID, or --method CODE --instrument CODE --analyte NAME");
  }

  QuantifyOutcome out;
  Result result;
  result.sample = sample;
  result.response = response;
  result.is_response = r.is_response;
  result.replicates = m;
  result.dilution = dilution;
  result.analyst = s.actor().name;
  result.occurred_at = at;
  std::vector<Finding> blocking;
  {
    store::ReadTransaction read(s.db());
    FactLoader facts(s);
    std::optional<CurveId> chosen;
    if (r.curve) {
      chosen = parse_curve_id(*r.curve);
      const Curve& c = facts.curve(*chosen);
      result.analyte = c.analyte;
      result.method_id = c.method_id;
      result.instrument_id = c.instrument_id;
    } else {
      const Method method = get_method(s, *r.method);
      const Instrument instrument = get_instrument(s, *r.instrument);
      bool known = false;
      for (const auto& v : method.versions) known = known || v.definition.has_analyte(*r.analyte);
      if (!known) {
        std::string list;
        for (const auto& a : method.latest().definition.analytes)
          list += (list.empty() ? "" : ", ") + a;
        throw UsageError("method " + quote(method.code) + " has no analyte " + quote(*r.analyte),
                         "its analytes: " + list);
      }
      result.analyte = *r.analyte;
      result.method_id = method.id;
      result.instrument_id = instrument.id;
      for (CurveId id : store::live_curves_in_group(s.db(), method.id, instrument.id, *r.analyte,
                                                    std::nullopt, at)) {
        if (facts.status(id, at).state == CurveState::Active) {
          chosen = id;
          break;
        }
      }
      if (!chosen) {
        std::string message = "no active curve for method " + method.code + ", instrument " +
                              instrument.code + ", analyte " + *r.analyte + " at " +
                              s.zone().format_local(at);
        // Explain with the latest curve that passed acceptance (the one the analyst expects
        // to use); fall back to the latest curve of any verdict.
        auto latest =
            store::latest_curve_in_group(s.db(), method.id, instrument.id, *r.analyte, at, true);
        if (!latest) {
          latest = store::latest_curve_in_group(s.db(), method.id, instrument.id, *r.analyte, at);
        }
        if (latest) {
          const CurveStatus st = facts.status(*latest, at);
          const bool accepted = facts.curve(*latest).verdict == Verdict::Accepted;
          message += "; the latest " + std::string(accepted ? "accepted " : "") + "curve, " +
                     std::to_string(latest->value) + ", is " + std::string(to_string(st.state));
          blocking.push_back({Reason::NoActiveCurve, std::nullopt, message});
          for (const auto& f : st.blocking()) blocking.push_back(f);
        } else {
          message += "; none has been logged";
          blocking.push_back({Reason::NoActiveCurve, std::nullopt, message});
        }
      }
    }
    if (chosen) {
      const Curve& c = facts.curve(*chosen);
      const MethodVersion& version = facts.version_of(*chosen);
      out.unit = version.definition.unit;
      out.method_version = version.version;
      for (const Lot* lot : facts.lots_of(*chosen)) out.lots.push_back(*lot);
      const double y = fitted_response(version.definition, response, r.is_response, "--response");
      result.curve_id = *chosen;
      require_acquired(s, c);
      const CurveStatus status = facts.status(*chosen, at);
      out.curve = make_view(facts, *chosen, at);
      if (!status.is_usable()) {
        blocking = status.blocking();
      } else {
        try {
          const fitting::Prediction p = fitting::inverse_predict(c.fit, y, m);
          result.x0 = p.x0;
          result.sd_x0 = p.sd_x0;
          if (p.x0 > c.fit.range_high) {
            out.suggested_dilution = suggest_dilution(p.x0, c.fit.range_high);
            std::string message =
                "response " + format_plain(response) + " gives about " + format_sig(p.x0, 3) + " " +
                out.unit + ", above the highest calibrator (" + format_plain(c.fit.range_high) +
                " " + out.unit + "): dilute and re-run";
            if (out.suggested_dilution)
              message += " (e.g. a " + format_plain(*out.suggested_dilution) + "-fold dilution)";
            blocking.push_back({Reason::AboveRange, std::nullopt, message});
          } else {
            result.concentration = p.x0 * dilution;
            result.ci_low = p.ci_low * dilution;
            result.ci_high = p.ci_high * dilution;
            result.sd_x0 = p.sd_x0;
            if (p.x0 < c.fit.range_low) {
              result.flags.push_back("below-range");
              out.report_as = "< " + format_plain(c.fit.range_low * dilution) + " " + out.unit;
            }
          }
        } catch (const fitting::FitError& e) {
          blocking.push_back({Reason::NoSolution, std::nullopt,
                              "response " + format_plain(response) + " cannot be read on curve " +
                                  std::to_string(chosen->value) + ": " + e.what()});
        }
      }
    }
  }
  result.status = blocking.empty() ? ResultStatus::Reported : ResultStatus::Refused;
  result.reasons = tokens(blocking);
  result.details = details(blocking);
  if (result.status == ResultStatus::Refused) {
    result.concentration.reset();
    result.ci_low.reset();
    result.ci_high.reset();
  }
  auto tx = s.write();
  result.id = store::insert_result(tx, result);
  std::string summary =
      sample + " " + result.analyte + ": " + std::string(to_string(result.status));
  for (const auto& t : result.reasons) summary += " " + t;
  tx.append_entry({result.status == ResultStatus::Reported ? "result.report" : "result.refuse",
                   "result", std::to_string(result.id.value), summary, at});
  tx.commit();
  out.result = std::move(result);
  return out;
}

}  // namespace cw::app
