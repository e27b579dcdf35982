// Number and time formatting shared by the views. Missing values show as an en dash.

export const DASH = '–';
const MINUS = '−';

export function num(value, digits = 2) {
  if (value == null || !Number.isFinite(value)) return DASH;
  return value.toFixed(digits).replace('-', MINUS);
}

export function signed(value, digits = 2) {
  if (value == null || !Number.isFinite(value)) return DASH;
  const text = Math.abs(value).toFixed(digits);
  if (Number(text) === 0) return text;
  return (value < 0 ? MINUS : '+') + text;
}

export function range(pair, digits = 2, fmt = num) {
  if (!Array.isArray(pair) || pair[0] == null || pair[1] == null) return DASH;
  return `${fmt(pair[0], digits)} to ${fmt(pair[1], digits)}`;
}

export function pct(fraction, digits = 1) {
  if (fraction == null || !Number.isFinite(fraction)) return DASH;
  return `${(fraction * 100).toFixed(digits)}%`;
}

export function count(n) {
  return n == null ? DASH : Number(n).toLocaleString('en-GB');
}

/** RFC 3339 → "2024-12-26" (UTC). */
export function date(iso) {
  if (!iso) return DASH;
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? String(iso) : d.toISOString().slice(0, 10);
}

/** RFC 3339 → "2024-12-26 10:29 UTC". */
export function dateTime(iso) {
  if (!iso) return DASH;
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return String(iso);
  return `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC`;
}

/** Seconds since the epoch of an RFC 3339 time. */
export function seconds(iso) {
  return Date.parse(iso) / 1000;
}

export const SECONDS_PER_YEAR = 365.25 * 86400; // Julian year, as the trend and seasonal fits use
export const EPOCH_2000 = Date.UTC(2000, 0, 1) / 1000;

/** Day of year (0-based, fractional) → "14 Nov". */
export function dayOfYear(doy) {
  if (doy == null || !Number.isFinite(doy)) return DASH;
  const d = new Date(Date.UTC(2001, 0, 1) + doy * 86400_000);
  return d.toLocaleDateString('en-GB', {day: 'numeric', month: 'short', timeZone: 'UTC'});
}
