#include "corrections/tide/harmonic_fit.h"

#include <Eigen/Dense>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numbers>
#include <stdexcept>

#include "corrections/core/errors.h"
#include "corrections/tide/angle_units.h"
#include "corrections/tide/constituent_table.h"

namespace strandline::tide {

namespace {

// Above this the standard errors are inflated a hundredfold or more over an
// orthogonal design: the record cannot tell the constituents apart.
constexpr double kMaxCondition = 100.0;

struct Admitted {
  const ConstituentDefinition* definition;
  double speed_deg_per_h;
};

std::vector<const ConstituentDefinition*> candidate_definitions(const HarmonicFitOptions& options,
                                                                const std::string& source) {
  const std::vector<std::string>& names =
      options.constituents.empty() ? default_fit_constituents() : options.constituents;
  std::vector<const ConstituentDefinition*> out;
  for (const auto& name : names) {
    const ConstituentDefinition* d = find_constituent(name);
    if (!d)
      throw InputError(source + ": constituent \"" + name + "\" is unknown (known: " + known_constituent_names() +
                       ")");
    if (std::find(out.begin(), out.end(), d) != out.end())
      throw InputError(source + ": constituent \"" + name + "\" requested twice");
    out.push_back(d);
  }
  return out;
}

}  // namespace

const std::vector<std::string>& default_fit_constituents() {
  static const std::vector<std::string> names = {
      "M2",  "K1",   "S2",  "O1",   "N2",  "P1",  "K2",      "Q1",   "Sa",   "Ssa",    "M4",  "NU2",
      "Mf",  "Mm",   "L2",  "2N2",  "MU2", "J1",  "MS4",     "MN4",  "M6",   "T2",     "OO1", "S1",
      "M3",  "MK3",  "2MK3", "S4",  "M8",  "R2",  "LAMBDA2", "RHO1", "2Q1",  "SIGMA1", "MSf", "2SM2",
      "MO3", "SK3",  "MK4", "SN4",  "2MN6", "2MS6", "S6",    "PI1",  "PHI1", "PSI1",   "THETA1", "CHI1"};
  return names;
}

HarmonicFitResult fit_harmonics(const std::vector<TimeS>& times_s, const std::vector<double>& levels_m,
                                const HarmonicFitOptions& options, const std::string& source) {
  if (times_s.size() != levels_m.size()) throw std::invalid_argument("fit_harmonics: times and levels differ in length");
  if (!(options.rayleigh_factor > 0)) throw std::invalid_argument("fit_harmonics: Rayleigh factor must be positive");
  const std::size_t n = times_s.size();
  if (n < 3) throw InputError(source + ": " + std::to_string(n) + " samples are too few for a harmonic analysis");
  for (std::size_t i = 0; i < n; ++i)
    if (!std::isfinite(times_s[i]) || !std::isfinite(levels_m[i]))
      throw InputError(source + ": sample " + std::to_string(i + 1) + " is not finite");
  const auto [first_it, last_it] = std::minmax_element(times_s.begin(), times_s.end());
  const TimeS first = *first_it, last = *last_it;
  const double span_h = (last - first) / 3600.0;

  HarmonicFitResult result;
  result.samples = n;
  result.span_days = span_h / 24.0;

  // Rayleigh selection in priority order; the mean level (speed 0) comes first.
  std::vector<Admitted> admitted;
  const double needed_cycles = options.rayleigh_factor * 360.0;
  for (const ConstituentDefinition* d : candidate_definitions(options, source)) {
    const double speed = speed_deg_per_h(*d);
    std::string conflict;
    double closest = std::abs(speed);
    if (closest * span_h < needed_cycles) conflict = "Z0";
    for (const Admitted& a : admitted) {
      const double gap = std::abs(speed - a.speed_deg_per_h);
      if (gap * span_h < needed_cycles && (conflict.empty() || gap < closest)) {
        conflict = std::string(a.definition->name);
        closest = gap;
      }
    }
    if (conflict.empty()) {
      admitted.push_back({d, speed});
    } else {
      result.unresolved.push_back({std::string(d->name), conflict, needed_cycles / closest / 24.0});
    }
  }
  if (admitted.empty()) {
    char text[160];
    std::snprintf(text, sizeof text, ": a record of %.2f days resolves no tidal constituent", result.span_days);
    std::string message = source + text;
    if (!result.unresolved.empty()) {
      std::snprintf(text, sizeof text, " (%s needs %.2f days)", result.unresolved.front().name.c_str(),
                    result.unresolved.front().needed_days);
      message += text;
    }
    throw InputError(message);
  }

  const int base = options.fit_rate ? 2 : 1;
  const int p = base + 2 * static_cast<int>(admitted.size());
  if (static_cast<int>(n) <= p)
    throw InputError(source + ": " + std::to_string(n) + " samples are too few for " + std::to_string(p) +
                     " unknowns");

  // Columns: mean, [rate per year], then f cos(V+u), f sin(V+u) per constituent,
  // and the levels as a last column. Sequential Householder QR over blocks of
  // rows keeps memory at O(block * p) for decades of gauge samples: the final
  // triangle [[R, z], [0, rho]] gives x = R^-1 z and the residual sum of squares rho^2.
  const TimeS epoch = 0.5 * (first + last);
  const int q = p + 1;
  constexpr std::size_t kBlockRows = 4096;
  Eigen::MatrixXd triangle(0, q);
  for (std::size_t begin = 0; begin < n; begin += kBlockRows) {
    const std::size_t rows = std::min(kBlockRows, n - begin);
    Eigen::MatrixXd block(triangle.rows() + static_cast<Eigen::Index>(rows), q);
    block.topRows(triangle.rows()) = triangle;
    for (std::size_t k = 0; k < rows; ++k) {
      const std::size_t i = begin + k;
      const Eigen::Index row = triangle.rows() + static_cast<Eigen::Index>(k);
      const AstronomicalArguments astro = astronomical_arguments(times_s[i]);
      const auto nodal = nodal_factors(node_angles(astro));
      block(row, 0) = 1.0;
      if (options.fit_rate) block(row, 1) = (times_s[i] - epoch) / kSecondsPerJulianYear;
      for (std::size_t j = 0; j < admitted.size(); ++j) {
        const ConstituentDefinition& d = *admitted[j].definition;
        const NodalFactor nf = constituent_nodal_factor(d, nodal);
        const double arg = (equilibrium_argument_deg(d, astro) + nf.u_deg) * kRad;
        block(row, base + 2 * j) = nf.f * std::cos(arg);
        block(row, base + 2 * j + 1) = nf.f * std::sin(arg);
      }
      block(row, p) = levels_m[i];
    }
    const Eigen::HouseholderQR<Eigen::MatrixXd> qr(block);
    const Eigen::Index keep = std::min<Eigen::Index>(block.rows(), q);
    triangle = qr.matrixQR().topRows(keep).triangularView<Eigen::Upper>();
  }

  const Eigen::MatrixXd r = triangle.topLeftCorner(p, p);
  // Collinearity of the columns (scaled to unit norm, so units do not matter):
  // the condition number of the equilibrated design, from R's singular values.
  const Eigen::VectorXd column_norms = r.colwise().norm().transpose();
  if (!(column_norms.minCoeff() > 0))
    throw InputError(source + ": the samples do not determine all " + std::to_string(p) + " unknowns");
  const Eigen::JacobiSVD<Eigen::MatrixXd> svd(r * column_norms.cwiseInverse().asDiagonal());
  const double condition = svd.singularValues()(0) / svd.singularValues()(p - 1);
  if (!(condition < kMaxCondition)) {
    char text[200];
    std::snprintf(text, sizeof text,
                  ": the samples do not determine all %d unknowns (condition number %.3g): the sampling or the "
                  "gaps alias some constituents; shorten the constituent list",
                  p, condition);
    throw InputError(source + text);
  }
  const Eigen::VectorXd x = r.triangularView<Eigen::Upper>().solve(triangle.col(p).head(p));
  const double rss = triangle(p, p) * triangle(p, p);
  const double dof = static_cast<double>(n - p);
  const double sigma2 = rss / dof;
  // Covariance sigma^2 (A^T A)^-1 = sigma^2 R^-1 R^-T.
  const Eigen::MatrixXd r_inv = r.triangularView<Eigen::Upper>().solve(Eigen::MatrixXd::Identity(p, p));
  const Eigen::MatrixXd cov = r_inv * r_inv.transpose() * sigma2;

  ConstituentSet& set = result.constants;
  set.datum = options.datum;
  set.z0_m = x(0);
  set.z0_rate_m_per_yr = options.fit_rate ? x(1) : 0.0;
  set.z0_epoch_s = epoch;
  set.residual_std_m = std::sqrt(sigma2);
  for (std::size_t j = 0; j < admitted.size(); ++j) {
    const int ic = base + 2 * static_cast<int>(j), is = ic + 1;
    const double c = x(ic), s = x(is);  // H cos g, H sin g
    HarmonicConstant k;
    k.name = std::string(admitted[j].definition->name);
    k.amplitude_m = std::hypot(c, s);
    k.phase_deg = std::fmod(std::atan2(s, c) * kDeg + 360.0, 360.0);
    // First-order propagation of the (c, s) covariance to amplitude and phase.
    const double h2 = c * c + s * s;
    if (h2 > 0) {
      const double var_h = (c * c * cov(ic, ic) + s * s * cov(is, is) + 2 * c * s * cov(ic, is)) / h2;
      const double var_g = (s * s * cov(ic, ic) + c * c * cov(is, is) - 2 * c * s * cov(ic, is)) / (h2 * h2);
      k.amplitude_se_m = std::sqrt(std::max(var_h, 0.0));
      k.phase_se_deg = std::sqrt(std::max(var_g, 0.0)) * kDeg;
    }
    k.resolvable = true;
    set.constituents.push_back(std::move(k));
  }
  nlohmann::json unresolved = nlohmann::json::array();
  for (const auto& u : result.unresolved)
    unresolved.push_back({{"name", u.name},
                          {"conflicts_with", u.conflicts_with},
                          {"needed_days", std::isfinite(u.needed_days) ? nlohmann::json(u.needed_days) : nullptr}});
  set.record = {{"source", source},
                {"first", format_time_utc(first)},
                {"last", format_time_utc(last)},
                {"samples", n},
                {"span_days", result.span_days},
                {"rayleigh_factor", options.rayleigh_factor},
                {"fit_rate", options.fit_rate},
                {"z0_se_m", std::sqrt(cov(0, 0))},
                {"condition_number", condition},
                {"unresolved", unresolved}};
  if (options.fit_rate) set.record["z0_rate_se_m_per_yr"] = std::sqrt(cov(1, 1));
  return result;
}

}  // namespace strandline::tide
