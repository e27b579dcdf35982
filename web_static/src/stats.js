// Per-transect statistics the site view can show (plan glyphs, table columns).
import {num, signed, pct} from './format.js';

export const STATS = {
  trend: {
    label: 'Trend rate',
    unit: 'm/yr',
    signed: true,
    value: (s) => s?.trend?.rate_m_per_yr ?? null,
    format: (v) => `${signed(v, 2)} m/yr`,
    describe: 'Arrow length ∝ |rate|; points seaward for advance, landward for retreat.',
  },
  slope: {
    label: 'Beach slope (tan β)',
    unit: '',
    signed: false,
    value: (s) => s?.slope ?? null,
    format: (v) => num(v, 3),
    describe: 'Bar length ∝ tan β.',
  },
  rejected: {
    label: 'Share rejected',
    unit: '',
    signed: false,
    value: (s) => (s && s.n_observations > 0 ? 1 - s.n_accepted / s.n_observations : null),
    format: (v) => pct(v, 1),
    describe: 'Bar length ∝ share of observations rejected by quality control.',
  },
  seasonal: {
    label: 'Seasonal amplitude',
    unit: 'm',
    signed: false,
    value: (s) => s?.seasonal?.amplitude_m ?? null,
    format: (v) => `${num(v, 1)} m`,
    describe: 'Bar length ∝ amplitude of the annual cycle.',
  },
};

export const DEFAULT_STAT = 'trend';

export function statOrDefault(name) {
  return Object.hasOwn(STATS, name) ? name : DEFAULT_STAT;
}
