// SPDX-License-Identifier: Apache-2.0
// The benchmark store generator: a fictional lab's two years, written through the library.
#include "store_generator.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <memory>
#include <optional>
#include <queue>
#include <vector>

#include "app/curves.h"
#include "app/session.h"
#include "audit/sha256.h"
#include "core/clock.h"
#include "core/error.h"
#include "domain/check_judgement.h"
#include "domain/expiry.h"
#include "domain/quantitation.h"
#include "domain/user.h"
#include "import/method_file.h"
#include "store/store.h"

namespace cw::bench {
namespace {

using namespace std::chrono_literals;
using Seconds = std::chrono::seconds;

/// A small, portable generator (splitmix64): the same stream on every platform and library,
/// unlike the standard distributions.
class Random {
 public:
  explicit Random(std::uint64_t seed) : state_(seed) {}
  std::uint64_t next() {
    std::uint64_t z = (state_ += 0x9E3779B97F4A7C15ull);
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
    return z ^ (z >> 31);
  }
  /// Uniform in [0, 1).
  double uniform() { return static_cast<double>(next() >> 11) * 0x1.0p-53; }
  /// Uniform integer in [0, n).
  std::int64_t below(std::int64_t n) { return static_cast<std::int64_t>(uniform() * n); }
  bool chance(double p) { return uniform() < p; }
  /// Standard normal (Box-Muller).
  double normal() {
    const double u1 = 1.0 - uniform();
    const double u2 = uniform();
    return std::sqrt(-2.0 * std::log(u1)) * std::cos(2.0 * M_PI * u2);
  }

 private:
  std::uint64_t state_;
};

/// "Now" for the entries of the transaction: the moment of the fact being recorded.
class HistoryClock final : public Clock {
 public:
  Instant now() const override { return t_; }
  bool is_overridden() const override { return true; }
  void set(Instant t) { t_ = t; }

 private:
  Instant t_{};
};

// Generic analyte names of an environmental lab (substances, not products).
constexpr const char* kAnalytes[] = {
    "nitrate",      "nitrite",  "sulfate",     "chloride",   "fluoride",   "bromide",   "phosphate",
    "ammonium",     "sodium",   "potassium",   "calcium",    "magnesium",  "iron",      "manganese",
    "copper",       "zinc",     "lead",        "cadmium",    "nickel",     "chromium",  "arsenic",
    "selenium",     "antimony", "barium",      "boron",      "aluminium",  "benzene",   "toluene",
    "ethylbenzene", "xylene",   "naphthalene", "phenol",     "chloroform", "bromoform", "atrazine",
    "simazine",     "cyanide",  "uranium",     "molybdenum", "vanadium"};
constexpr int kAnalyteCount = sizeof(kAnalytes) / sizeof(kAnalytes[0]);
constexpr int kWideAnalytes = 30;
constexpr const char* kWideMethod = "M-001";

std::string two_digits(int n) {
  return (n < 10 ? "0" : "") + std::to_string(n);
}
std::string three_digits(int n) {
  return (n < 100 ? "0" : "") + two_digits(n);
}

std::string number(double v) {
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.6g", v);
  return buffer;
}

/// The plan of one method, decided from the seed before anything is written.
struct MethodPlan {
  std::string code;
  std::vector<std::string> analytes;
  std::vector<int> instruments;  ///< indexes into the instrument list
  int valid_days = 7;
  bool review_required = true;
  bool check_daily = false;
  bool revised = false;
  double slope_base = 1.0;
};

std::string method_text(const MethodPlan& m, int version) {
  std::string analytes;
  for (const auto& a : m.analytes) analytes += (analytes.empty() ? "\"" : ", \"") + a + "\"";
  std::string t = "# Generated benchmark method (fictional lab)\n";
  t += "code = \"" + m.code + "\"\n";
  t += "title = \"Benchmark method " + m.code + " version " + std::to_string(version) + "\"\n";
  t += "unit = \"mg/L\"\nanalytes = [" + analytes + "]\n\n[calibration]\n";
  t += "model = \"linear\"\nweighting = \"" + std::string(m.code.back() % 2 ? "1/x" : "none") +
       "\"\nmin_levels = 5\nmin_r2 = 0.995\nmax_error_pct = 15.0\nmax_error_pct_lowest = 20.0\n";
  t += "valid_for = \"" + std::to_string(version == 1 ? m.valid_days : m.valid_days + 7) +
       " days\"\n";
  t += std::string("review_required = ") + (m.review_required ? "true" : "false") + "\n";
  t += "\n[check]\ntolerance_pct = 10.0\nsamples_per_check = 20\n";
  if (m.check_daily) t += "check_every = \"1 day\"\n";
  return t;
}

/// The nominal concentrations of `levels` calibration levels (mg/L).
std::vector<double> level_nominals(int levels) {
  static const double kSteps[] = {0.5, 1, 2, 5, 10, 20, 50, 100, 150, 200, 300, 500};
  return std::vector<double>(kSteps, kSteps + std::min(levels, 12));
}

/// A points file of every analyte of `analytes`: response = slope·x + intercept with a
/// relative noise of `noise`.
std::string points_text(const std::vector<std::string>& analytes, int levels, int replicates,
                        double slope_base, double noise, Random& rng) {
  std::string t = "analyte,level,replicate,nominal,response\n";
  const auto nominals = level_nominals(levels);
  for (std::size_t a = 0; a < analytes.size(); ++a) {
    const double slope = slope_base * (0.5 + 0.1 * static_cast<double>(a % 10));
    const double intercept = 0.002 * slope;
    for (std::size_t l = 0; l < nominals.size(); ++l) {
      for (int r = 1; r <= replicates; ++r) {
        const double y = (slope * nominals[l] + intercept) * (1.0 + noise * rng.normal());
        t += analytes[a] + "," + std::to_string(l + 1) + "," + std::to_string(r) + "," +
             number(nominals[l]) + "," + number(std::max(y, 1e-6)) + "\n";
      }
    }
  }
  return t;
}

std::vector<std::string> wide_analytes() {
  return std::vector<std::string>(kAnalytes, kAnalytes + kWideAnalytes);
}

/// Something that happens after a calibration, recorded when the history reaches it.
struct Pending {
  enum class Kind { Review, Retire, Run } kind = Kind::Review;
  Instant at;
  std::int64_t order = 0;  ///< ties broken by creation order: deterministic
  std::vector<CurveId> curves;
  std::vector<Curve> fitted;  ///< Run: the curves as stored (fit, analyte)
  ReviewDecision decision = ReviewDecision::Approve;
  std::size_t method = 0, instrument = 0;
  MethodVersionId version;
  std::vector<LotId> lots;
  std::string analyst;
  static Pending of(Kind kind, Instant at, std::int64_t order) {
    Pending p;
    p.kind = kind;
    p.at = at;
    p.order = order;
    return p;
  }
  bool operator>(const Pending& o) const { return at != o.at ? at > o.at : order > o.order; }
};

class Generator {
 public:
  explicit Generator(const GeneratorOptions& o)
      : o_(o), rng_(o.seed), zone_(LabZone::named("UTC")), start_(o.end - 24h * o.days) {}

  GeneratorReport run() {
    store::OpenOptions open;
    open.location = o_.location;
    open.create = true;
    store_ = store::Store::open(open);
    if (!store_->was_created() || store_->read()->registry().settings()) {
      throw StoreError("store '" + o_.location + "' already exists",
                       "the generator builds a new store; remove the file first");
    }
    plan_methods();
    begin(start_ - 60 * 24h);
    unit_->registry_writer().add_settings({"Fenwick Brook Water Laboratory (fictional)", "UTC"});
    entry({"lab.init", "lab", "Fenwick Brook Water Laboratory (fictional)", std::nullopt,
           clock_.now()});
    register_users();
    register_instruments();
    register_methods();
    history();
    if (unit_) unit_->commit();
    unit_.reset();
    return report_;
  }

 private:
  // ------------------------------------------------------------------ transactions

  void begin(Instant t) {
    clock_.set(t);
    actor_ =
        store::Actor{analysts_[batch_ % analysts_.size()], &clock_, app::tool_version(), "bench"};
    ++batch_;
    unit_ = store_->write(actor_);
    in_unit_ = 0;
  }

  void entry(const store::EntryHeader& h) {
    clock_.set(h.occurred_at);
    unit_->append_entry(h);
    ++report_.entries;
    ++in_unit_;
  }

  /// Commits when the transaction is large enough (between changes only).
  void maybe_commit(Instant next) {
    if (in_unit_ < o_.entries_per_transaction) return;
    unit_->commit();
    unit_.reset();
    if (o_.progress) {
      o_.progress(std::to_string(report_.curves) + " curves, " + std::to_string(report_.entries) +
                  " entries");
    }
    begin(next);
  }

  // ------------------------------------------------------------------ registries

  void plan_methods() {
    for (int i = 1; i <= o_.methods; ++i) {
      MethodPlan m;
      m.code = "M-" + three_digits(i);
      const int n = i == 1 ? kWideAnalytes : 1 + static_cast<int>(rng_.below(9));
      const int first = static_cast<int>(rng_.below(kAnalyteCount));
      for (int k = 0; k < n; ++k) m.analytes.push_back(kAnalytes[(first + k) % kAnalyteCount]);
      if (i == 1) m.analytes = wide_analytes();
      const int on = 1 + static_cast<int>(rng_.below(3));
      for (int k = 0; k < on; ++k) {
        const int ins = static_cast<int>((i * 7 + k * 17) % o_.instruments);
        if (std::find(m.instruments.begin(), m.instruments.end(), ins) == m.instruments.end())
          m.instruments.push_back(ins);
      }
      m.valid_days = i == 1 ? 30 : 7 + static_cast<int>(rng_.below(4)) * 7;
      m.review_required = i == 1 || rng_.chance(0.6);
      m.check_daily = i != 1 && rng_.chance(0.3);
      m.revised = i != 1 && rng_.chance(0.1);
      // (wide_slope_base() replays the draws of the first method: keep the two in step.)
      m.slope_base = 0.02 + rng_.uniform();
      methods_.push_back(std::move(m));
    }
    for (int k = 1; k <= 12; ++k) analysts_.push_back("analyst-" + two_digits(k));
  }

  /// The analysts who act in the history, and the two the benchmark and smoke commands act as
  /// (`--as` must name an active user); one entry each, as `user add` writes them.
  void register_users() {
    std::vector<std::pair<std::string, Role>> users = {{"bench-admin", Role::Admin},
                                                       {"bench-analyst", Role::Analyst},
                                                       {"bench-reader", Role::Analyst}};
    for (const auto& a : analysts_) users.emplace_back(a, Role::Reviewer);
    for (const auto& [code, role] : users) {
      const UserId id = unit_->registry_writer().add_user(code, "Bench user " + code, clock_.now());
      unit_->registry_writer().add_user_event(
          id, UserEvent{UserStatus::Enabled, role, "benchmark store", "bench-admin", clock_.now()});
      entry({"user.add", "user", code, std::string("benchmark store"), clock_.now()});
    }
  }

  void register_instruments() {
    static const char* kKinds[] = {"IC", "ICPMS", "GCMS", "HPLC", "UVVIS"};
    for (int i = 0; i < o_.instruments; ++i) {
      const std::string code = std::string(kKinds[i % 5]) + "-" + two_digits(i + 1);
      instrument_ids_.push_back(unit_->registry_writer().add_instrument(
          code, "Bench " + std::string(kKinds[i % 5]) + " unit " + std::to_string(i + 1),
          clock_.now()));
      instrument_codes_.push_back(code);
      entry({"instrument.add", "instrument", code, std::nullopt, clock_.now()});
    }
  }

  MethodVersion version_of(std::size_t m, int number, Instant effective) {
    const MethodPlan& plan = methods_[m];
    const std::string text = method_text(plan, number);
    const import::MethodFile parsed =
        import::parse_method_text(plan.code + (number == 1 ? "" : "-v2") + ".toml", text);
    MethodVersion v;
    v.version = number;
    v.effective_at = effective;
    v.definition = parsed.definition;
    v.source_name = parsed.file_name;
    v.source_text = parsed.text;
    v.source_sha256 = parsed.sha256;
    if (number > 1) v.reason = "validity extended after revalidation";
    return v;
  }

  void register_methods() {
    for (std::size_t m = 0; m < methods_.size(); ++m) {
      const MethodId id = unit_->registry_writer().add_method(methods_[m].code, clock_.now());
      MethodVersion v = version_of(m, 1, clock_.now());
      v.method_id = id;
      v.id = unit_->registry_writer().add_method_version(id, v);
      entry({"method.add", "method", methods_[m].code, std::nullopt, clock_.now()});
      method_ids_.push_back(id);
      versions_.push_back({v});
      lots_.emplace_back();
    }
  }

  /// The method's lot in use at `t`: a new one every 180 days, registered just before use.
  const Lot& lot_for(std::size_t m, Instant t) {
    auto& lots = lots_[m];
    if (lots.empty() || t - lots.back().registered_at > 180 * 24h) {
      Lot lot;
      lot.code = "RM-" + methods_[m].code.substr(2) + "-" + std::to_string(lots.size() + 1);
      lot.material = "Mixed standard for " + methods_[m].code;
      lot.registered_at = t - 1h;
      lot.expires_on = zone_.local_date(t + 400 * 24h);
      lot.certificate = "CERT-" + lot.code;
      for (const auto& a : methods_[m].analytes) lot.values.push_back({a, 1000.0, 5.0});
      lot.id = unit_->registry_writer().add_lot(lot);
      entry({"lot.add", "lot", lot.code, std::nullopt, lot.registered_at});
      lots.push_back(std::move(lot));
    }
    return lots.back();
  }

  // ------------------------------------------------------------------ history

  void history() {
    double mean_analytes = 0;
    for (const auto& m : methods_) mean_analytes += static_cast<double>(m.analytes.size());
    mean_analytes /= static_cast<double>(methods_.size());
    const auto calibrations =
        std::max<std::int64_t>(1, std::llround(static_cast<double>(o_.curves) / mean_analytes));
    // Revisions at a random moment of the second year.
    for (std::size_t m = 0; m < methods_.size(); ++m) {
      if (!methods_[m].revised) continue;
      const Instant at = start_ + Seconds(365 * 86400 + rng_.below(300 * 86400));
      revisions_.push_back({at, m});
    }
    std::sort(revisions_.begin(), revisions_.end());
    const double step = static_cast<double>(o_.days) * 86400.0 / static_cast<double>(calibrations);
    for (std::int64_t k = 0; k < calibrations; ++k) {
      const Instant at =
          start_ +
          Seconds(static_cast<std::int64_t>((static_cast<double>(k) + rng_.uniform()) * step));
      settle_until(at);
      if (at >= o_.end - 26h) break;  // the last day belongs to the anchor calibration
      const auto m = static_cast<std::size_t>(rng_.below(o_.methods));
      const auto& ins = methods_[m].instruments;
      const std::size_t i = static_cast<std::size_t>(ins[rng_.below(std::ssize(ins))]);
      calibrate(m, i, at, /*anchor=*/false);
    }
    // The anchor: a calibration of the wide method a day before the end, approved and active
    // at the end, for the benchmarks that need an active curve.
    settle_until(o_.end - 24h);
    calibrate(0, static_cast<std::size_t>(methods_[0].instruments[0]), o_.end - 24h, true);
    settle_until(o_.end);
  }

  /// Records every pending event and revision due before `t`.
  void settle_until(Instant t) {
    while (true) {
      const bool has_event = !pending_.empty() && pending_.top().at <= t;
      const bool has_revision =
          next_revision_ < revisions_.size() && revisions_[next_revision_].first <= t;
      if (!has_event && !has_revision) break;
      if (has_revision && (!has_event || revisions_[next_revision_].first <= pending_.top().at)) {
        revise(revisions_[next_revision_].second, revisions_[next_revision_].first);
        ++next_revision_;
        continue;
      }
      Pending p = pending_.top();
      pending_.pop();
      maybe_commit(p.at);
      switch (p.kind) {
        case Pending::Kind::Review:
          review(p);
          break;
        case Pending::Kind::Retire:
          retire(p);
          break;
        case Pending::Kind::Run:
          import_run(p);
          break;
      }
    }
  }

  void revise(std::size_t m, Instant at) {
    maybe_commit(at);
    MethodVersion v = version_of(m, 2, at);
    v.method_id = method_ids_[m];
    v.id = unit_->registry_writer().add_method_version(method_ids_[m], v);
    entry({"method.revise", "method", methods_[m].code, v.reason, at});
    versions_[m].push_back(v);
  }

  const MethodVersion& version_at(std::size_t m, Instant t) const {
    const auto& vs = versions_[m];
    return vs.size() > 1 && vs[1].effective_at <= t ? vs[1] : vs[0];
  }

  void calibrate(std::size_t m, std::size_t i, Instant at, bool anchor) {
    maybe_commit(at);
    const MethodPlan& plan = methods_[m];
    const MethodVersion& version = version_at(m, at);
    const Lot& lot = lot_for(m, at);
    const std::string analyst = actor_.name;
    const bool poor = !anchor && rng_.chance(0.03);
    const int levels = m == 0 ? 8 : 6 + static_cast<int>(rng_.below(2));
    const std::string text =
        points_text(plan.analytes, levels, 2, plan.slope_base, poor ? 0.12 : 0.01, rng_);
    const std::string file = "ical-" + plan.code + "-" + format_date(zone_.local_date(at)) + ".csv";
    app::FittedPoints fitted = app::fit_points_text(file, text, version);
    const std::vector<const Lot*> lots{&lot};
    const Instant expires = expiry_of(at, version, lots, zone_).at;

    Calibration c;
    c.method_version_id = version.id;
    c.instrument_id = instrument_ids_[i];
    c.acquired_at = at;
    c.analyst = analyst;
    c.points_file = fitted.file_name;
    c.points_sha256 = fitted.sha256;
    c.lots = {lot.id};
    const CalibrationId cid = unit_->curve_writer().add_calibration(c);
    entry({"calibration.log", "calibration", std::to_string(cid.value), std::nullopt, at});
    ++report_.calibrations;

    Pending run = Pending::of(Pending::Kind::Run, at + 3h, order_++);
    run.method = m;
    run.instrument = i;
    run.version = version.id;
    run.lots = {lot.id};
    run.analyst = analysts_[(batch_ + 3) % analysts_.size()];
    std::vector<CurveId> accepted;
    for (auto& curve : fitted.curves) {
      curve.calibration_id = cid;
      curve.method_id = method_ids_[m];
      curve.method_version_id = version.id;
      curve.instrument_id = instrument_ids_[i];
      curve.acquired_at = at;
      curve.analyst = analyst;
      curve.expires_at = expires;
      curve.id = unit_->curve_writer().add_curve(curve);
      std::string summary = curve.analyte + ": " + std::string(to_string(curve.verdict));
      for (const auto& t : curve.failed_criteria) {
        summary += " " + std::string(fitting::to_string(t));
      }
      entry({"curve.log", "curve", std::to_string(curve.id.value), summary, at});
      ++report_.curves;
      report_.points += std::ssize(curve.points);
      if (curve.verdict != Verdict::Accepted) continue;
      accepted.push_back(curve.id);
      if (!anchor && rng_.chance(0.01)) {
        Pending retire =
            Pending::of(Pending::Kind::Retire, at + 24h + Seconds(rng_.below(86400)), order_++);
        retire.curves = {curve.id};
        pending_.push(std::move(retire));
      }
      curve.lowest_level = lowest_calibrator(curve);  // what the store reads in their place
      curve.points.clear();
      run.curves.push_back(curve.id);
      run.fitted.push_back(curve);
    }
    if (anchor && !accepted.empty()) {
      report_.wide_method = plan.code;
      report_.wide_instrument = instrument_codes_[i];
      report_.wide_lot = lot.code;
      report_.active_curve = accepted.front().value;
      report_.active_analyte = run.fitted.front().analyte;
      const auto& fit = run.fitted.front().fit;
      report_.check_response = fit.slope * 10.0 + fit.intercept;
    }
    if (version.definition.calibration.review_required && !accepted.empty()) {
      Pending review = Pending::of(Pending::Kind::Review, at + 2h, order_++);
      review.curves = accepted;
      review.analyst = analyst;
      review.decision =
          !anchor && rng_.chance(0.02) ? ReviewDecision::Reject : ReviewDecision::Approve;
      if (review.decision == ReviewDecision::Reject) run.curves.clear();
      pending_.push(std::move(review));
    }
    // A run follows one calibration in three (and never the anchor: its curve stays fresh).
    if (!anchor && !run.curves.empty() && rng_.chance(1.0 / 3.0)) pending_.push(std::move(run));
  }

  void review(const Pending& p) {
    std::string reviewer = actor_.name;
    if (reviewer == p.analyst) reviewer = analysts_[(batch_ + 1) % analysts_.size()];
    if (reviewer == p.analyst) reviewer = analysts_[(batch_ + 2) % analysts_.size()];
    const bool approve = p.decision == ReviewDecision::Approve;
    for (CurveId id : p.curves) {
      unit_->curve_writer().add_review(
          id,
          {p.decision, reviewer, approve ? "fit and residuals checked" : "drift suspected", p.at});
      entry({approve ? "curve.approve" : "curve.reject", "curve", std::to_string(id.value),
             approve ? "fit and residuals checked" : "drift suspected", p.at});
      ++report_.reviews;
    }
  }

  void retire(const Pending& p) {
    for (CurveId id : p.curves) {
      unit_->curve_writer().add_retirement(id, {actor_.name, "column replaced", p.at});
      entry({"curve.retire", "curve", std::to_string(id.value), "column replaced", p.at});
      ++report_.retirements;
    }
  }

  /// A short run after a calibration: per analyte a check standard and a sample, decided by
  /// the same functions `run import` uses; a failed check refuses that analyte's sample.
  void import_run(const Pending& p) {
    const MethodVersion& version = versions_[p.method].front().id == p.version
                                       ? versions_[p.method].front()
                                       : versions_[p.method].back();
    const MethodDefinition& def = version.definition;
    std::vector<const Lot*> lots;
    for (const auto& lot : lots_[p.method]) {
      if (std::find(p.lots.begin(), p.lots.end(), lot.id) != p.lots.end()) lots.push_back(&lot);
    }
    struct Row {
      std::size_t curve;
      bool check;
      double nominal, response;
      std::string sample;
    };
    std::vector<Row> rows;
    std::string text = "position,kind,sample,analyte,response,nominal\n";
    for (std::size_t c = 0; c < p.fitted.size(); ++c) {
      const auto& fit = p.fitted[c].fit;
      const double nominal = 10.0;
      rows.push_back({c, true, nominal,
                      (fit.slope * nominal + fit.intercept) * (1.0 + 0.04 * rng_.normal()), "CCV"});
      const double x = 1.0 + 40.0 * rng_.uniform();
      rows.push_back({c, false, 0, fit.slope * x + fit.intercept,
                      "S" + std::to_string(report_.results + std::ssize(rows))});
    }
    for (std::size_t r = 0; r < rows.size(); ++r) {
      text += std::to_string(r + 1) + "," + (rows[r].check ? "check" : "sample") + "," +
              rows[r].sample + "," + p.fitted[rows[r].curve].analyte + "," +
              number(rows[r].response) + "," + (rows[r].check ? number(rows[r].nominal) : "") +
              "\n";
    }
    Run run;
    run.method_id = method_ids_[p.method];
    run.method_version_id = p.version;
    run.instrument_id = instrument_ids_[p.instrument];
    run.acquired_at = p.at;
    run.analyst = p.analyst;
    run.file_name =
        "seq-" + methods_[p.method].code + "-" + format_date(zone_.local_date(p.at)) + ".csv";
    run.file_sha256 = audit::sha256_hex(text);
    run.rows = std::ssize(rows);
    run.id = unit_->run_writer().add_run(run);
    entry({"run.import", "run", std::to_string(run.id.value), std::nullopt, p.at});
    ++report_.runs;
    std::vector<bool> failed(p.fitted.size(), false);
    for (std::size_t r = 0; r < rows.size(); ++r) {
      const Curve& curve = p.fitted[rows[r].curve];
      const long position = static_cast<long>(r + 1);
      if (rows[r].check) {
        Check check = judge_check(
            {CheckKind::Check, rows[r].nominal, rows[r].response, std::nullopt}, curve, def);
        check.curve_id = curve.id;
        check.analyst = p.analyst;
        check.occurred_at = p.at;
        check.id = unit_->curve_writer().add_check(check);
        unit_->run_writer().add_run_check(run.id, position, check.id, rows[r].sample);
        entry({"check.log", "check", std::to_string(check.id.value),
               std::string("check") + (check.passed ? " passed" : " FAILED") + " on curve " +
                   std::to_string(curve.id.value),
               p.at});
        failed[rows[r].curve] = !check.passed;
        ++report_.checks;
        continue;
      }
      Result result;
      result.sample = rows[r].sample;
      result.analyte = curve.analyte;
      result.curve_id = curve.id;
      result.method_id = method_ids_[p.method];
      result.instrument_id = instrument_ids_[p.instrument];
      result.response = rows[r].response;
      result.analyst = p.analyst;
      result.occurred_at = p.at;
      // The curve is active when the run starts (approved, within its validity, no check
      // failed yet); a failed check of the run makes it stale for what follows.
      CurveStatus status;
      if (failed[rows[r].curve]) {
        status.state = CurveState::Stale;
        status.reasons.push_back(
            {Reason::CheckFailed, p.at, "a check standard against it failed in this run"});
      }
      QuantitationReading reading;
      reading.response = rows[r].response;
      record_decision(result, decide_quantitation(curve, status, def, lots, reading));
      result.id = unit_->curve_writer().add_result(result);
      unit_->run_writer().add_run_result(run.id, position, result.id);
      std::string summary =
          result.sample + " " + result.analyte + ": " + std::string(to_string(result.status));
      for (const auto& f : result.reasons) summary += " " + std::string(to_string(f.reason));
      entry({result.status == ResultStatus::Reported ? "result.report" : "result.refuse", "result",
             std::to_string(result.id.value), summary, p.at});
      ++report_.results;
    }
  }

  const GeneratorOptions& o_;
  Random rng_;
  LabZone zone_;
  Instant start_;
  HistoryClock clock_;
  std::unique_ptr<store::Store> store_;
  std::unique_ptr<store::WriteUnit> unit_;
  store::Actor actor_;
  std::int64_t batch_ = 0, in_unit_ = 0, order_ = 0;
  std::vector<std::string> analysts_;
  std::vector<MethodPlan> methods_;
  std::vector<MethodId> method_ids_;
  std::vector<std::vector<MethodVersion>> versions_;
  std::vector<std::vector<Lot>> lots_;
  std::vector<InstrumentId> instrument_ids_;
  std::vector<std::string> instrument_codes_;
  std::vector<std::pair<Instant, std::size_t>> revisions_;
  std::size_t next_revision_ = 0;
  std::priority_queue<Pending, std::vector<Pending>, std::greater<>> pending_;
  GeneratorReport report_;
};

}  // namespace

GeneratorReport generate_store(const GeneratorOptions& options) {
  return Generator(options).run();
}

double wide_slope_base(std::uint64_t seed) {
  // The wide method is planned first: its draws are the first analyte, the number of
  // instruments, then the slope (plan_methods()).
  Random rng(seed);
  rng.below(kAnalyteCount);
  rng.below(3);
  return 0.02 + rng.uniform();
}

std::string wide_points_file(int levels, int replicates, std::uint64_t seed) {
  Random rng(seed);
  return points_text(wide_analytes(), levels, replicates, wide_slope_base(seed), 0.01, rng);
}

std::string wide_run_file(long rows, int samples_per_check, std::uint64_t seed) {
  Random rng(seed);
  const double slope_base = wide_slope_base(seed);
  const auto analytes = wide_analytes();
  std::string t = "position,kind,sample,analyte,response,nominal\n";
  t.reserve(static_cast<std::size_t>(rows) * 40);
  long position = 0;
  const auto add = [&](const std::string& kind, const std::string& sample, std::size_t a, double x,
                       bool nominal) {
    const double slope = slope_base * (0.5 + 0.1 * static_cast<double>(a % 10));
    const double y = (slope * x + 0.002 * slope) * (1.0 + 0.01 * rng.normal());
    t += std::to_string(++position) + "," + kind + "," + sample + "," + analytes[a] + "," +
         number(y) + "," + (nominal ? number(x) : "") + "\n";
  };
  // Checks of every analyte open the run; then each analyte's samples are bracketed by a
  // passing check every `samples_per_check` samples, and the run closes with checks.
  for (std::size_t a = 0; a < analytes.size(); ++a) add("check", "CCV", a, 10.0, true);
  long samples = 0;
  const long closing = static_cast<long>(analytes.size());
  while (position < rows - closing) {
    const std::size_t a = static_cast<std::size_t>(samples % static_cast<long>(analytes.size()));
    add("sample", "W" + std::to_string(samples / static_cast<long>(analytes.size())), a,
        1.0 + 40.0 * rng.uniform(), false);
    ++samples;
    if (samples % (static_cast<long>(samples_per_check) * static_cast<long>(analytes.size())) ==
            0 &&
        position < rows - closing - static_cast<long>(analytes.size())) {
      for (std::size_t b = 0; b < analytes.size(); ++b) add("check", "CCV", b, 10.0, true);
    }
  }
  for (std::size_t a = 0; a < analytes.size() && position < rows; ++a)
    add("check", "CCV", a, 10.0, true);
  return t;
}

}  // namespace cw::bench
