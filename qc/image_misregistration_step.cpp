#include "qc/image_misregistration_step.h"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "qc/residual_table.h"
#include "qc/robust_stats.h"

namespace strandline {

const ParamList<ImageMisregistrationStep::Params>& ImageMisregistrationStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "min_transects", .member = member_of<&Params::min_transects>, .lower = at_least(3),
       .upper = at_most(100000), .meaning = "transects an image needs (also after the inlier refit) to be tested"},
      {.name = "alpha", .member = member_of<&Params::alpha>, .lower = greater_than(0), .upper = less_than(1),
       .meaning = "the fit's chi-square drop must have a tail probability below this"},
      {.name = "min_shift_m", .member = member_of<&Params::min_shift_m>, .unit = "m", .lower = at_least(0),
       .meaning = "least rms fitted offset over the image's transects to reject it"},
      {.name = "inlier_k", .member = member_of<&Params::inlier_k>, .lower = greater_than(0),
       .meaning = "inliers lie within inlier_k noise of the fit"},
      {.name = "use_geometry", .member = member_of<&Params::use_geometry>,
       .meaning = "fit a 2-D shift along each transect's azimuth when every transect has geometry"},
      {.name = "min_azimuth_spread_deg", .member = member_of<&Params::min_azimuth_spread_deg>, .unit = "deg",
       .lower = at_least(0), .upper = at_most(45),
       .meaning = "least rms spread of an image's azimuths about their principal direction for the 2-D shift; "
                  "below it the common offset runs"},
      {.name = "level_half_window_days", .member = member_of<&Params::level_half_window_days>, .unit = "days",
       .lower = greater_than(0), .meaning = "half-window of the running median the residuals are taken from"},
      {.name = "storm_share_max", .member = member_of<&Params::storm_share_max>, .lower = greater_than(0),
       .upper = at_most(1), .meaning = "images with at least this share of storm-response points are not tested"},
  };
  return list;
}

std::unique_ptr<Step> ImageMisregistrationStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<ImageMisregistrationStep>(read_params(Params::fields(), params, pointer));
}

ImageMisregistrationStep::ImageMisregistrationStep(const Params& p)
    : SiteStep("image_misregistration", params_json(Params::fields(), p)), p_(p) {}

namespace {

enum class ShiftModel { shift_2d, common_offset };

const char* shift_model_name(ShiftModel m) { return m == ShiftModel::shift_2d ? "2d_shift" : "common_offset"; }

// One image's points: residual, weight 1/noise^2, sin and cos of the transect azimuth.
struct ImagePoints {
  std::vector<double> r, w, s, c;
  std::size_t size() const { return r.size(); }
};

struct ShiftFit {
  ShiftModel model = ShiftModel::common_offset;
  double a = 0, b = 0;  // (dx, dy), or the common offset in a
  bool ok = false;
  double at(const ImagePoints& d, std::size_t j) const {
    return model == ShiftModel::shift_2d ? a * d.s[j] + b * d.c[j] : a;
  }
};

// Weighted least squares of the model over the points in `use`.
ShiftFit weighted_fit(const ImagePoints& d, const std::vector<char>& use, ShiftModel model) {
  double sw = 0, swr = 0, sss = 0, ssc = 0, scc = 0, ssr = 0, scr = 0;
  for (std::size_t j = 0; j < d.size(); ++j) {
    if (!use[j]) continue;
    sw += d.w[j], swr += d.w[j] * d.r[j];
    sss += d.w[j] * d.s[j] * d.s[j], ssc += d.w[j] * d.s[j] * d.c[j], scc += d.w[j] * d.c[j] * d.c[j];
    ssr += d.w[j] * d.s[j] * d.r[j], scr += d.w[j] * d.c[j] * d.r[j];
  }
  ShiftFit f;
  f.model = model;
  if (model == ShiftModel::common_offset) {
    if (!(sw > 0)) return f;
    f.a = swr / sw;
    f.ok = true;
    return f;
  }
  const double det = sss * scc - ssc * ssc;
  if (!(det > 1e-12 * sss * scc) || det <= 0) return f;  // exactly singular: the caller falls back
  f.a = (scc * ssr - ssc * scr) / det;
  f.b = (sss * scr - ssc * ssr) / det;
  f.ok = true;
  return f;
}

// asin(sqrt(lambda_min / trace)) of sum w (s, c)(s, c)^T over the points in use:
// lambda_min / trace is the weighted mean of sin^2(az - principal azimuth), so
// 0 on parallel transects and 1/2 (45 deg) at most.
double azimuth_spread_deg(const ImagePoints& d, const std::vector<char>& use) {
  double ss = 0, sc = 0, cc = 0;
  for (std::size_t j = 0; j < d.size(); ++j) {
    if (!use[j]) continue;
    ss += d.w[j] * d.s[j] * d.s[j], sc += d.w[j] * d.s[j] * d.c[j], cc += d.w[j] * d.c[j] * d.c[j];
  }
  const double trace = ss + cc;
  if (!(trace > 0)) return 0;
  const double lambda_min = 0.5 * trace - std::hypot(0.5 * (ss - cc), sc);
  return std::asin(std::sqrt(std::clamp(lambda_min / trace, 0.0, 0.5))) * 180.0 / std::numbers::pi;
}

std::size_t count_used(const std::vector<char>& use) {
  std::size_t n = 0;
  for (char c : use) n += c ? 1 : 0;
  return n;
}

enum class FitStart { near_median, least_absolute_deviation };

// Starts from the points near the median residual, or from those near the
// least-absolute-deviation fit (iteratively reweighted least squares, weights
// w / max(|standardised residual|, 0.1)), then iterates the inlier set.
ShiftFit fit_on_inliers(const ImagePoints& d, ShiftModel model, FitStart from, double inlier_k,
                        std::vector<char>& use) {
  use.assign(d.size(), 0);
  if (from == FitStart::near_median) {
    std::vector<double> work = d.r;
    const double med = median_in_place(work);
    for (std::size_t j = 0; j < d.size(); ++j) use[j] = std::abs(d.r[j] - med) <= inlier_k / std::sqrt(d.w[j]);
  } else {
    ImagePoints lad = d;
    std::vector<char> all(d.size(), 1);
    ShiftFit start = weighted_fit(lad, all, model);
    for (int iter = 0; iter < 30 && start.ok; ++iter) {
      for (std::size_t j = 0; j < d.size(); ++j)
        lad.w[j] = d.w[j] / std::max(std::abs(d.r[j] - start.at(d, j)) * std::sqrt(d.w[j]), 0.1);
      start = weighted_fit(lad, all, model);
    }
    if (!start.ok) return start;
    for (std::size_t j = 0; j < d.size(); ++j)
      use[j] = std::abs(d.r[j] - start.at(d, j)) <= inlier_k / std::sqrt(d.w[j]);
  }
  ShiftFit fit;
  for (int iter = 0; iter < 10; ++iter) {
    fit = weighted_fit(d, use, model);
    if (!fit.ok) break;
    bool changed = false;
    for (std::size_t j = 0; j < d.size(); ++j) {
      const char in = std::abs(d.r[j] - fit.at(d, j)) <= inlier_k / std::sqrt(d.w[j]);
      changed = changed || in != use[j];
      use[j] = in;
    }
    if (!changed) break;
  }
  return fit;
}

}  // namespace

void ImageMisregistrationStep::process(SiteTable& table, const RunInputs& inputs, StepLog& log) const {
  const FlagSet tolerated = flag_bit(Flag::spike) | flag_bit(Flag::hampel_outlier) | flag_bit(Flag::implausible_rate) |
                            flag_bit(Flag::alongshore_outlier);
  const ResidualTable res = build_residual_table(table, inputs, {p_.level_half_window_days, 5, true}, tolerated);
  bool geometry = p_.use_geometry && !table.transects.empty();
  for (const auto& t : table.transects) geometry = geometry && t.geometry.present();
  log.note("model", geometry ? "per image: 2-D shift projected on each transect's azimuth when the azimuths spread "
                               "at least min_azimuth_spread_deg, else common offset"
                             : "common offset (no transect geometry)");
  constexpr double kDeg = std::numbers::pi / 180.0;

  nlohmann::json rejected = nlohmann::json::array();
  ImagePoints d;
  std::vector<std::size_t> rows;
  std::vector<char> all, use;
  for (std::size_t im = 0; im < res.rows_by_image.size(); ++im) {
    d.r.clear(), d.w.clear(), d.s.clear(), d.c.clear(), rows.clear();
    std::size_t storm_points = 0;
    for (std::size_t i : res.rows_by_image[im]) storm_points += has_flag(table.flags[i], Flag::storm_response) ? 1 : 0;
    // A storm moves every transect landward at once: an image where storm
    // response is seen on many transects is explained by the storm.
    if (storm_points > 0 && double(storm_points) >= p_.storm_share_max * double(res.rows_by_image[im].size())) {
      log.count("images_explained_by_storm");
      continue;
    }
    for (std::size_t i : res.rows_by_image[im]) {
      if (has_flag(table.flags[i], Flag::storm_response)) continue;
      const auto& g = table.transects[table.transect[i]].geometry;
      rows.push_back(i);
      d.r.push_back(res.residual_m[i]);
      d.w.push_back(1.0 / (res.noise_m[i] * res.noise_m[i]));
      d.s.push_back(geometry ? std::sin(g.azimuth_deg * kDeg) : 0.0);
      d.c.push_back(geometry ? std::cos(g.azimuth_deg * kDeg) : 0.0);
    }
    const std::size_t n = rows.size();
    if (n == 0) continue;  // nothing of the image takes part (e.g. no water level: uncorrected)
    if (static_cast<long long>(n) < p_.min_transects) {
      log.count("images_not_testable");
      continue;
    }
    all.assign(n, 1);
    const double spread_deg = geometry ? azimuth_spread_deg(d, all) : 0.0;
    ShiftModel model =
        geometry && spread_deg >= p_.min_azimuth_spread_deg ? ShiftModel::shift_2d : ShiftModel::common_offset;
    ShiftFit fit = fit_on_inliers(d, model, FitStart::near_median, p_.inlier_k, use);
    // On fanned transects a 2-D shift's projection can vary across the image by
    // more than the inlier band about the median: restart from the least-absolute-
    // deviation fit. Only then, since that start also takes in runs of bad
    // transects (e.g. cloud shadow) that the median start leaves out.
    if (model == ShiftModel::shift_2d && (!fit.ok || static_cast<long long>(count_used(use)) < p_.min_transects))
      fit = fit_on_inliers(d, model, FitStart::least_absolute_deviation, p_.inlier_k, use);
    // Inliers on too few azimuths leave the alongshore part unresolved: the
    // common offset along their shared azimuth is then the model that can run.
    if (model == ShiftModel::shift_2d && (!fit.ok || azimuth_spread_deg(d, use) < p_.min_azimuth_spread_deg)) {
      model = ShiftModel::common_offset;
      fit = fit_on_inliers(d, model, FitStart::near_median, p_.inlier_k, use);
    }
    const std::size_t n_in = count_used(use);
    if (!fit.ok || static_cast<long long>(n_in) < p_.min_transects) {
      log.count("images_not_testable");
      continue;
    }
    log.count("images_tested");
    log.count(model == ShiftModel::shift_2d ? "images_tested_2d" : "images_tested_common_offset");
    const int dof = model == ShiftModel::shift_2d ? 2 : 1;
    double chi0 = 0, chi1 = 0, pred2 = 0;
    for (std::size_t j = 0; j < n; ++j) {
      const double pred = fit.at(d, j);
      pred2 += pred * pred;
      if (!use[j]) continue;
      chi0 += d.w[j] * d.r[j] * d.r[j];
      chi1 += d.w[j] * (d.r[j] - pred) * (d.r[j] - pred);
    }
    const double reduced = n_in > static_cast<std::size_t>(dof) ? chi1 / double(n_in - dof) : 1.0;
    const double drop = (chi0 - chi1) / std::max(1.0, reduced);
    const double p_value = chi_square_survival(drop, dof);
    const double shift_rms = std::sqrt(pred2 / double(n));
    if (p_value < p_.alpha && shift_rms >= p_.min_shift_m) {
      log.count("images_rejected");
      nlohmann::json j = {{"image_id", table.image_ids[im]}, {"model", shift_model_name(model)},
                          {"shift_rms_m", shift_rms}, {"p_value", p_value}};
      if (model == ShiftModel::shift_2d) j["shift_x_m"] = fit.a, j["shift_y_m"] = fit.b;
      else j["offset_m"] = fit.a;
      if (geometry) j["azimuth_spread_deg"] = spread_deg;
      rejected.push_back(j);
      // Every corrected point of the image, whether or not it took part in the fit.
      for (std::size_t i : res.rows_by_image[im]) table.add_flag(i, Flag::image_misregistered);
    }
  }
  // Corrected rows of rejected images that took no part (e.g. rejected for cloud) are flagged too.
  if (!rejected.empty()) {
    std::vector<char> bad(table.image_ids.size(), 0);
    for (std::size_t im = 0; im < res.rows_by_image.size(); ++im)
      for (std::size_t i : res.rows_by_image[im])
        if (has_flag(table.flags[i], Flag::image_misregistered)) bad[im] = 1;
    std::int64_t points = 0;
    for (std::size_t i = 0; i < table.size(); ++i)
      if (bad[table.image[i]] && known(table.chainage_m[i])) {
        table.add_flag(i, Flag::image_misregistered);
        ++points;
      }
    log.count("image_misregistered", points);
  }
  log.note("rejected_images", rejected);
}

}  // namespace strandline
