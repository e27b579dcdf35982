// One transect's series as column arrays for the charts, built once per load:
// x in a Float64Array (seconds, ascending), y columns with null where a row has no
// value of that kind, and rowOf mapping a chart index back to its row.
import {seconds, SECONDS_PER_YEAR, EPOCH_2000} from './format.js';

export const SIGMA_FACTOR = 2; // the error bars are corrected ± 2σ (about 95%)

export function buildSeries(rows) {
  const n = rows.length;
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = seconds(rows[i].time);
  const order = Array.from({length: n}, (_, i) => i).sort((a, b) => t[a] - t[b] || a - b);

  const x = new Float64Array(n);
  const rowOf = new Int32Array(n);
  const raw = new Array(n), corrected = new Array(n), rejected = new Array(n);
  const low = new Array(n), high = new Array(n), water = new Array(n), wave = new Array(n);
  const counts = {rows: n, raw: 0, corrected: 0, rejected: 0, water: 0, wave: 0};
  for (let k = 0; k < n; k++) {
    const i = order[k];
    const r = rows[i];
    x[k] = t[i];
    rowOf[k] = i;
    raw[k] = r.chainage_raw_m ?? null;
    const pos = r.chainage_m ?? null;
    if (r.accepted) {
      corrected[k] = pos;
      rejected[k] = null;
      const sigma = r.sigma_m;
      const ok = pos != null && sigma != null;
      low[k] = ok ? pos - SIGMA_FACTOR * sigma : null;
      high[k] = ok ? pos + SIGMA_FACTOR * sigma : null;
    } else {
      corrected[k] = null;
      // A rejected row is drawn where it was corrected to, else at its raw position.
      rejected[k] = pos ?? raw[k];
      low[k] = high[k] = null;
    }
    water[k] = r.water_level_m ?? null;
    wave[k] = r.wave_level_m ?? null;
    if (raw[k] != null) counts.raw++;
    if (corrected[k] != null) counts.corrected++;
    if (rejected[k] != null) counts.rejected++;
    if (water[k] != null) counts.water++;
    if (wave[k] != null) counts.wave++;
  }
  return {rows, x, rowOf, raw, corrected, rejected, low, high, water, wave, counts};
}

/** The trend model of the summary: position (m) at time ts (s), or null. */
export function trendModel(summary) {
  const tr = summary?.trend;
  if (!tr || tr.rate_m_per_yr == null || tr.intercept_m == null || !tr.intercept_time) return null;
  const t0 = seconds(tr.intercept_time);
  const ci = tr.ci95_with_slope_m_per_yr || tr.ci95_m_per_yr;
  const win = summary.trend_window || {};
  const from = win.from ? seconds(win.from) : summary.first_accepted ? seconds(summary.first_accepted) : null;
  const to = win.to ? seconds(win.to) : summary.last_accepted ? seconds(summary.last_accepted) : null;
  const at = (rate) => (ts) => tr.intercept_m + (rate * (ts - t0)) / SECONDS_PER_YEAR;
  return {
    at: at(tr.rate_m_per_yr),
    low: ci ? at(ci[0]) : null,
    high: ci ? at(ci[1]) : null,
    from, to, t0,
  };
}

/** The annual cycle of the summary: offset (m) at time ts (s), or null. */
export function seasonalModel(summary) {
  const se = summary?.seasonal;
  if (!se || se.amplitude_m == null || se.phase_deg == null) return null;
  const phi = (se.phase_deg * Math.PI) / 180;
  return {
    amplitude: se.amplitude_m,
    at: (ts) => se.amplitude_m * Math.cos(2 * Math.PI * ((ts - EPOCH_2000) / SECONDS_PER_YEAR) - phi),
    /** Offset at a fraction of the (Julian) year, 0..1. */
    atFraction: (f) => se.amplitude_m * Math.cos(2 * Math.PI * f - phi),
  };
}
