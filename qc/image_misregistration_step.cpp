#include "qc/image_misregistration_step.h"

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

struct ShiftFit {
  double a = 0, b = 0;  // common offset (a), or (dx, dy)
  bool ok = false;
};

// Weighted least squares of r = a*u + b*v (two columns) or r = a*u (one).
ShiftFit weighted_fit(const std::vector<double>& r, const std::vector<double>& w, const std::vector<double>& u,
                      const std::vector<double>& v, const std::vector<char>& use, bool two) {
  double suu = 0, suv = 0, svv = 0, sur = 0, svr = 0;
  for (std::size_t j = 0; j < r.size(); ++j) {
    if (!use[j]) continue;
    suu += w[j] * u[j] * u[j];
    sur += w[j] * u[j] * r[j];
    if (two) {
      suv += w[j] * u[j] * v[j];
      svv += w[j] * v[j] * v[j];
      svr += w[j] * v[j] * r[j];
    }
  }
  ShiftFit f;
  if (!two) {
    if (suu <= 0) return f;
    f.a = sur / suu;
    f.ok = true;
    return f;
  }
  const double det = suu * svv - suv * suv;
  if (!(det > 1e-12 * suu * svv) || det <= 0) return f;  // azimuths too alike to separate dx and dy
  f.a = (svv * sur - suv * svr) / det;
  f.b = (suu * svr - suv * sur) / det;
  f.ok = true;
  return f;
}

}  // namespace

void ImageMisregistrationStep::process(SiteTable& table, const RunInputs& inputs, StepLog& log) const {
  const FlagSet tolerated = flag_bit(Flag::spike) | flag_bit(Flag::hampel_outlier) | flag_bit(Flag::implausible_rate) |
                            flag_bit(Flag::alongshore_outlier);
  const ResidualTable res = build_residual_table(table, inputs, {p_.level_half_window_days, 5, true}, tolerated);
  bool geometry = p_.use_geometry && !table.transects.empty();
  for (const auto& t : table.transects) geometry = geometry && t.geometry.present();
  log.note("model", geometry ? "2-D shift projected on each transect's azimuth" : "common offset");
  const int dof = geometry ? 2 : 1;
  constexpr double kDeg = std::numbers::pi / 180.0;

  nlohmann::json rejected = nlohmann::json::array();
  std::vector<double> r, w, u, v;
  std::vector<std::size_t> rows;
  for (std::size_t im = 0; im < res.rows_by_image.size(); ++im) {
    r.clear(), w.clear(), u.clear(), v.clear(), rows.clear();
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
      r.push_back(res.residual_m[i]);
      w.push_back(1.0 / (res.noise_m[i] * res.noise_m[i]));
      u.push_back(geometry ? std::sin(g.azimuth_deg * kDeg) : 1.0);
      v.push_back(geometry ? std::cos(g.azimuth_deg * kDeg) : 0.0);
    }
    const std::size_t n = rows.size();
    if (static_cast<long long>(n) < p_.min_transects) continue;
    log.count("images_tested");
    // Start from the points near the median residual, then iterate the inlier set.
    std::vector<double> work = r;
    const double med = median_in_place(work);
    std::vector<char> use(n);
    for (std::size_t j = 0; j < n; ++j) use[j] = std::abs(r[j] - med) <= p_.inlier_k / std::sqrt(w[j]);
    ShiftFit fit;
    for (int iter = 0; iter < 10; ++iter) {
      fit = weighted_fit(r, w, u, v, use, geometry);
      if (!fit.ok) break;
      bool changed = false;
      for (std::size_t j = 0; j < n; ++j) {
        const char in = std::abs(r[j] - (fit.a * u[j] + fit.b * v[j])) <= p_.inlier_k / std::sqrt(w[j]);
        changed = changed || in != use[j];
        use[j] = in;
      }
      if (!changed) break;
    }
    std::size_t n_in = 0;
    for (char c : use) n_in += c ? 1 : 0;
    if (!fit.ok || static_cast<long long>(n_in) < p_.min_transects) continue;
    double chi0 = 0, chi1 = 0, pred2 = 0;
    for (std::size_t j = 0; j < n; ++j) {
      const double pred = fit.a * u[j] + fit.b * v[j];
      pred2 += pred * pred;
      if (!use[j]) continue;
      chi0 += w[j] * r[j] * r[j];
      chi1 += w[j] * (r[j] - pred) * (r[j] - pred);
    }
    const double reduced = n_in > static_cast<std::size_t>(dof) ? chi1 / double(n_in - dof) : 1.0;
    const double drop = (chi0 - chi1) / std::max(1.0, reduced);
    const double p_value = chi_square_survival(drop, dof);
    const double shift_rms = std::sqrt(pred2 / double(n));
    if (p_value < p_.alpha && shift_rms >= p_.min_shift_m) {
      log.count("images_rejected");
      nlohmann::json j = {{"image_id", table.image_ids[im]}, {"shift_rms_m", shift_rms}, {"p_value", p_value}};
      if (geometry) j["shift_x_m"] = fit.a, j["shift_y_m"] = fit.b;
      else j["offset_m"] = fit.a;
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
