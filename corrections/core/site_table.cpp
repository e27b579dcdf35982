#include "corrections/core/site_table.h"

#include <algorithm>
#include <numeric>
#include <stdexcept>

namespace strandline {

std::string_view slope_source_name(SlopeSource s) {
  switch (s) {
    case SlopeSource::none: return "none";
    case SlopeSource::fixed: return "fixed";
    case SlopeSource::estimated: return "estimated";
    case SlopeSource::default_value: return "default";
  }
  return "none";
}

void SiteTable::reset_derived() {
  const std::size_t n = size();
  for (auto* column : {&water_level_m, &water_level_sigma_m, &hs0_m, &l0_m, &setup_m, &runup_m,
                       &wave_level_m, &wave_sigma_m, &correction_m, &chainage_m, &sigma_m,
                       &sigma_sensor_m, &sigma_water_level_m, &sigma_slope_m, &sigma_wave_m,
                       &sensor_offset_m, &sigma_sensor_offset_m})
    column->assign(n, kUnknown);
  flags.assign(n, 0);
  sensor_offsets = {};
  for (auto& t : transects) t.sensor_offsets.clear();
}

std::uint32_t SiteTableBuilder::transect_index(const std::string& id) {
  auto [it, inserted] = transect_lookup_.try_emplace(id, static_cast<std::uint32_t>(transect_ids_.size()));
  if (inserted) transect_ids_.push_back(id);
  return it->second;
}

std::optional<std::uint32_t> SiteTableBuilder::find_transect(const std::string& id) const {
  auto it = transect_lookup_.find(id);
  if (it == transect_lookup_.end()) return std::nullopt;
  return it->second;
}

std::uint32_t SiteTableBuilder::image_index(const std::string& id) {
  auto [it, inserted] = image_lookup_.try_emplace(id, static_cast<std::uint32_t>(image_ids_.size()));
  if (inserted) image_ids_.push_back(id);
  return it->second;
}

std::uint16_t SiteTableBuilder::sensor_index(const std::string& name) {
  auto [it, inserted] = sensor_lookup_.try_emplace(name, static_cast<std::uint16_t>(sensor_names_.size()));
  if (inserted) {
    if (sensor_names_.size() >= 65535) throw std::length_error("more than 65535 sensor names");
    sensor_names_.push_back(name);
  }
  return it->second;
}

static std::uint64_t pair_key(std::uint32_t transect, std::uint32_t image) {
  return (std::uint64_t{transect} << 32) | image;
}

bool SiteTableBuilder::add(std::uint32_t transect, std::uint32_t image, std::uint16_t sensor,
                           const Point& p) {
  if (!seen_pairs_.try_emplace(pair_key(transect, image), p.input_row).second) return false;
  points_.push_back({transect, image, sensor, p});
  return true;
}

std::uint32_t SiteTableBuilder::first_row_of(std::uint32_t transect, std::uint32_t image) const {
  return seen_pairs_.at(pair_key(transect, image));
}

SiteTable SiteTableBuilder::build() && {
  // Sort transects by id so outputs are stable whatever the input order.
  std::vector<std::uint32_t> order(transect_ids_.size());
  std::iota(order.begin(), order.end(), 0u);
  std::sort(order.begin(), order.end(),
            [&](auto a, auto b) { return transect_ids_[a] < transect_ids_[b]; });
  std::vector<std::uint32_t> new_index(order.size());
  for (std::uint32_t i = 0; i < order.size(); ++i) new_index[order[i]] = i;
  for (auto& s : points_) s.transect = new_index[s.transect];

  std::stable_sort(points_.begin(), points_.end(), [](const Staged& a, const Staged& b) {
    if (a.transect != b.transect) return a.transect < b.transect;
    if (a.p.time_s != b.p.time_s) return a.p.time_s < b.p.time_s;
    return a.p.input_row < b.p.input_row;
  });

  SiteTable t;
  const std::size_t n = points_.size();
  t.transect.reserve(n);
  t.image.reserve(n);
  t.sensor.reserve(n);
  t.input_row.reserve(n);
  t.time_s.reserve(n);
  t.chainage_raw_m.reserve(n);
  t.cloud_fraction.reserve(n);
  t.georef_rmse_m.reserve(n);
  for (const auto& s : points_) {
    t.transect.push_back(s.transect);
    t.image.push_back(s.image);
    t.sensor.push_back(s.sensor);
    t.input_row.push_back(s.p.input_row);
    t.time_s.push_back(s.p.time_s);
    t.chainage_raw_m.push_back(s.p.chainage_raw_m);
    t.cloud_fraction.push_back(s.p.cloud_fraction);
    t.georef_rmse_m.push_back(s.p.georef_rmse_m);
  }
  points_.clear();
  points_.shrink_to_fit();

  t.transects.resize(order.size());
  for (std::uint32_t i = 0; i < order.size(); ++i) t.transects[i].id = transect_ids_[order[i]];
  std::size_t row = 0;
  for (std::uint32_t i = 0; i < t.transects.size(); ++i) {
    t.transects[i].begin = row;
    while (row < n && t.transect[row] == i) ++row;
    t.transects[i].end = row;
  }
  t.image_ids = std::move(image_ids_);
  t.sensor_names = std::move(sensor_names_);
  t.reset_derived();
  return t;
}

}  // namespace strandline
