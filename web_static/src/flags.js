// Flag vocabulary of the cleaned rows (server/FORMATS.md, "Flags" and "QC flags"):
// severity and the reason shown on hover.

export const FLAGS = {
  no_water_level: ['rejects', 'no water level at image time (outside the record, or a gap over the limit); left uncorrected'],
  tide_predicted: ['info', 'water level from the harmonic prediction, not the gauge'],
  no_slope: ['rejects', 'no slope for the transect; left uncorrected'],
  default_slope: ['warns', 'the configured default slope was used'],
  slope_not_identifiable: ['warns', 'the spectral slope estimate was not identifiable'],
  no_wave_data: ['warns', 'waves given but none within the gap limit at image time; wave term empty'],
  beyond_transect: ['rejects', 'raw chainage outside [0, transect length]'],
  cloudy_image: ['rejects', 'cloud fraction above the image-quality threshold'],
  poor_georeference: ['rejects', 'geolocation RMSE above the image-quality threshold'],
  spike: ['rejects', 'far from both neighbours in the same direction'],
  hampel_outlier: ['rejects', 'outside the running median ± k·1.4826·MAD'],
  implausible_rate: ['rejects', 'rate of change from the previous accepted point beyond the plausible limit'],
  alongshore_outlier: ['rejects', 'at odds with neighbouring transects on the same image'],
  image_misregistered: ['rejects', 'the whole image is displaced (fitted shift significant and large)'],
  sparse_period: ['warns', 'too few accepted points in the surrounding period'],
  storm_response: ['info', 'landward jump with high waves that persists: real change, kept'],
  sigma_sensor_unknown: ['warns', 'sensor term unknown: sigma omits it'],
  sigma_water_level_unknown: ['warns', 'water-level term unknown: sigma omits it'],
  sigma_slope_unknown: ['warns', 'slope term unknown (no slope sigma): sigma omits it'],
  sigma_wave_unknown: ['warns', 'wave term unknown: sigma omits it'],
  coarse_gauge: ['warns', 'gauge samples more than ~1 h apart around the image: interpolated, wider sigma'],
  slope_poorly_constrained: ['warns', 'the slope interval touches the search range or is wider than the slope'],
  sensor_offset_applied: ['info', 'position shifted by the offset of its sensor family'],
  sigma_sensor_offset_unknown: ['warns', 'sensor-offset term unknown: sigma omits it'],
};

export function flagSeverity(name) {
  return FLAGS[name] ? FLAGS[name][0] : 'info';
}

export function flagReason(name) {
  return FLAGS[name] ? FLAGS[name][1] : 'flag not described by this dashboard';
}

/** "spike — far from both neighbours ..." */
export function flagText(name) {
  return `${name.replaceAll('_', ' ')} — ${flagReason(name)}`;
}

/** Orders flag names: rejecting first, then warnings, then information. */
export function sortFlags(names) {
  const rank = {rejects: 0, warns: 1, info: 2};
  return [...names].sort((a, b) => rank[flagSeverity(a)] - rank[flagSeverity(b)] || a.localeCompare(b));
}
