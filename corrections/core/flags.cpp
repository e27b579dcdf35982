#include "corrections/core/flags.h"

#include <stdexcept>

namespace strandline {

const std::vector<FlagInfo>& flag_table() {
  using S = FlagSeverity;
  static const std::vector<FlagInfo> table = {
      {Flag::no_water_level, "no_water_level", S::reject,
       "no water level at image time: outside the record or the gauge gap exceeds the limit; left uncorrected"},
      {Flag::tide_predicted, "tide_predicted", S::info,
       "water level predicted from harmonic constituents (no gauge sample close enough)"},
      {Flag::no_slope, "no_slope", S::reject,
       "no beach-face slope for the transect (none given, estimate not identifiable, no default); left uncorrected"},
      {Flag::default_slope, "default_slope", S::warn, "the configured default slope was used"},
      {Flag::slope_not_identifiable, "slope_not_identifiable", S::warn,
       "the spectral slope estimate was not identifiable for this transect"},
      {Flag::no_wave_data, "no_wave_data", S::warn,
       "waves were given but none within the gap limit at image time; wave term left empty"},
      {Flag::beyond_transect, "beyond_transect", S::reject,
       "raw chainage lies outside the transect (below 0 or beyond its length)"},
      {Flag::cloudy_image, "cloudy_image", S::reject, "cloud fraction above the image-quality threshold"},
      {Flag::poor_georeference, "poor_georeference", S::reject,
       "geolocation RMSE above the image-quality threshold"},
      {Flag::spike, "spike", S::reject, "far from both neighbours in the same direction"},
      {Flag::hampel_outlier, "hampel_outlier", S::reject,
       "outside the running median +- k * 1.4826 * MAD (Hampel identifier)"},
      {Flag::implausible_rate, "implausible_rate", S::reject,
       "rate of change from the previous accepted point beyond the plausible limit"},
      {Flag::alongshore_outlier, "alongshore_outlier", S::reject,
       "at odds with neighbouring transects on the same image"},
      {Flag::image_misregistered, "image_misregistered", S::reject,
       "the whole image is displaced on every transect (fitted shift significant)"},
      {Flag::sparse_period, "sparse_period", S::warn, "too few accepted points in the surrounding period"},
      {Flag::storm_response, "storm_response", S::info,
       "landward jump coinciding with high waves and persisting: storm response, kept as real change"},
      {Flag::sensor_offset_applied, "sensor_offset_applied", S::info,
       "position shifted by the offset of its sensor family (sensor_offsets step)"},
      {Flag::sigma_sensor_unknown, "sigma_sensor_unknown", S::warn,
       "sensor class uncertainty unknown: sigma_m omits it"},
      {Flag::sigma_water_level_unknown, "sigma_water_level_unknown", S::warn,
       "water-level uncertainty unknown: sigma_m omits it"},
      {Flag::sigma_slope_unknown, "sigma_slope_unknown", S::warn,
       "slope uncertainty unknown: sigma_m omits the slope term"},
      {Flag::sigma_wave_unknown, "sigma_wave_unknown", S::warn,
       "wave-term uncertainty unknown: sigma_m omits it"},
      {Flag::coarse_gauge, "coarse_gauge", S::warn,
       "gauge samples around the image time more than the coarse limit apart (~1 h): the level is interpolated "
       "with a wider sigma"},
      {Flag::slope_poorly_constrained, "slope_poorly_constrained", S::warn,
       "the slope's 95% interval touches the search range or is wider than the slope itself"},
      {Flag::sigma_sensor_offset_unknown, "sigma_sensor_offset_unknown", S::warn,
       "uncertainty of the applied sensor offset unknown: sigma_m omits it"},
  };
  return table;
}

const FlagInfo& flag_info(Flag f) {
  for (const auto& info : flag_table())
    if (info.flag == f) return info;
  throw std::logic_error("flag missing from flag_table()");
}

std::optional<Flag> flag_from_name(std::string_view name) {
  for (const auto& info : flag_table())
    if (info.name == name) return info.flag;
  return std::nullopt;
}

FlagSet rejecting_flags() {
  static const FlagSet bits = [] {
    FlagSet b = 0;
    for (const auto& info : flag_table())
      if (info.severity == FlagSeverity::reject) b |= flag_bit(info.flag);
    return b;
  }();
  return bits;
}

std::vector<std::string_view> flag_names(FlagSet set) {
  std::vector<std::string_view> names;
  for (const auto& info : flag_table())
    if (has_flag(set, info.flag)) names.push_back(info.name);
  return names;
}

std::string flag_list(FlagSet set) {
  std::string out;
  for (auto name : flag_names(set)) {
    if (!out.empty()) out += ';';
    out += name;
  }
  return out;
}

}  // namespace strandline
