#include "qc/sensor_offset_step.h"

#include <algorithm>
#include <map>

#include "qc/sensor_offset_estimate.h"

namespace strandline {

namespace {

nlohmann::json family_offset_json(const FamilyOffset& f) {
  const auto num = [](double v) { return known(v) ? nlohmann::json(v) : nlohmann::json(); };
  return {{"family", f.family},
          {"reference_family", f.reference_family},
          {"offset_m", num(f.offset_m)},
          {"se_m", num(f.se_m)},
          {"ci95_m", known(f.ci95_low_m) ? nlohmann::json::array({f.ci95_low_m, f.ci95_high_m}) : nlohmann::json()},
          {"significant", f.significant()},
          {"n_bins", f.n_bins}};
}

}  // namespace

const ParamList<SensorOffsetStep::Params>& SensorOffsetStep::Params::fields() {
  static const ParamList<Params> list = {
      {.name = "bin_days", .member = member_of<&Params::bin_days>, .unit = "days", .lower = at_least(1),
       .upper = at_most(366), .meaning = "width of the time bins in which two families are compared"},
      {.name = "min_bins", .member = member_of<&Params::min_bins>, .lower = at_least(3), .upper = at_most(100000),
       .meaning = "fewer bins holding both families: no estimate"},
      {.name = "reference_family", .member = member_of<&Params::reference_family>,
       .meaning = "family the others are compared with (empty: the longest record of corrected points)"},
  };
  return list;
}

std::unique_ptr<Step> SensorOffsetStep::make(const nlohmann::json& params, const std::string& pointer) {
  return std::make_unique<SensorOffsetStep>(read_params(Params::fields(), params, pointer));
}

SensorOffsetStep::SensorOffsetStep(const Params& p)
    : SiteStep("sensor_offsets", params_json(Params::fields(), p)), p_(p) {}

void SensorOffsetStep::process(SiteTable& table, const RunInputs& inputs, StepLog& log) const {
  SiteSensorOffsets& site = table.sensor_offsets;
  site = {};
  site.ran = true;
  site.mode = inputs.sensor_offset_mode;
  log.note("mode", std::string(sensor_offset_mode_name(site.mode)));
  const std::vector<std::string> families = sensor_families(table, inputs);
  const std::vector<double> sensor_sigma_m = sensor_sigmas_m(table, inputs);

  // Points taking part: corrected and not rejected by the input checks.
  std::vector<char> usable(table.size(), 0);
  struct Extent {
    std::size_t n = 0;
    TimeS first = kUnknown, last = kUnknown;
  };
  std::map<std::string, Extent> points_by_family;
  for (std::size_t i = 0; i < table.size(); ++i) {
    const std::string& f = families[table.sensor[i]];
    if (f.empty() || !known(table.chainage_m[i]) || !table.accepted(i)) continue;
    usable[i] = 1;
    Extent& e = points_by_family[f];
    ++e.n;
    e.first = known(e.first) ? std::min(e.first, table.time_s[i]) : table.time_s[i];
    e.last = known(e.last) ? std::max(e.last, table.time_s[i]) : table.time_s[i];
  }
  // Default reference: the longest record (it carries the long-term trend), then
  // the most points, then name order.
  std::string reference = p_.reference_family;
  if (reference.empty()) {
    const Extent* best = nullptr;
    for (const auto& [f, e] : points_by_family)
      if (!best || e.last - e.first > best->last - best->first ||
          (e.last - e.first == best->last - best->first && e.n > best->n))
        best = &e, reference = f;
  }
  if (!points_by_family.count(reference)) {
    log.note("reference_family", reference.empty() ? nlohmann::json() : nlohmann::json(reference));
    log.note("estimates", "none: the reference family has no corrected point");
  } else {
    site.reference_family = reference;
    log.note("reference_family", reference);
    nlohmann::json site_json = nlohmann::json::array();
    for (const auto& [family, extent] : points_by_family) {
      if (family == reference) continue;
      std::vector<std::vector<OffsetBin>> per_transect(table.transects.size());
      for (std::size_t k = 0; k < table.transects.size(); ++k) {
        per_transect[k] = transect_offset_bins(table, k, table.chainage_m, usable, families, family, reference,
                                               p_.bin_days, sensor_sigma_m);
        if (!per_transect[k].empty())
          table.transects[k].sensor_offsets.push_back(
              estimate_family_offset(per_transect[k], family, reference, std::size_t(p_.min_bins)));
      }
      const FamilyOffset pooled =
          estimate_family_offset(pool_offset_bins(per_transect), family, reference, std::size_t(p_.min_bins));
      site.estimates.push_back(pooled);
      site_json.push_back(family_offset_json(pooled));
      if (pooled.significant()) log.count("significant_families");
    }
    log.note("site_offsets", site_json);
  }

  // What is applied, per sensor name.
  std::vector<double> offset_by_sensor(table.sensor_names.size(), kUnknown);
  std::vector<double> sigma_by_sensor(table.sensor_names.size(), kUnknown);
  for (std::size_t s = 0; s < table.sensor_names.size(); ++s) {
    if (site.mode == SensorOffsetMode::estimate) {
      for (const FamilyOffset& f : site.estimates)
        if (f.family == families[s] && f.significant()) {
          offset_by_sensor[s] = f.offset_m;
          sigma_by_sensor[s] = f.se_m;
        }
    } else if (site.mode == SensorOffsetMode::given && inputs.sensors) {
      if (auto c = inputs.sensors->lookup(table.sensor_names[s]); c && known(c->offset_m)) {
        offset_by_sensor[s] = c->offset_m;
        sigma_by_sensor[s] = c->offset_sigma_m;
      }
    }
    if (known(offset_by_sensor[s])) {
      site.applied_m[table.sensor_names[s]] = offset_by_sensor[s];
      site.applied_sigma_m[table.sensor_names[s]] = sigma_by_sensor[s];
    }
  }
  nlohmann::json applied = nlohmann::json::object();
  for (const auto& [sensor, v] : site.applied_m)
    applied[sensor] = {{"offset_m", v},
                       {"sigma_m", known(site.applied_sigma_m[sensor]) ? nlohmann::json(site.applied_sigma_m[sensor])
                                                                       : nlohmann::json()}};
  log.note("applied", applied);
  for (std::size_t i = 0; i < table.size(); ++i) {
    const double off = offset_by_sensor[table.sensor[i]];
    if (!known(off) || !known(table.chainage_m[i])) continue;
    table.chainage_m[i] -= off;
    table.correction_m[i] -= off;
    table.sensor_offset_m[i] = off;
    table.sigma_sensor_offset_m[i] = sigma_by_sensor[table.sensor[i]];
    table.add_flag(i, Flag::sensor_offset_applied);
    log.count("points_shifted");
  }
}

}  // namespace strandline
