// Sortable table of the per-transect summaries. Sorting is by column key and
// direction; both live in the view's URL.
import {h} from './dom.js';
import {num, signed, pct, count, range, DASH} from './format.js';
import {flagSeverity, flagText} from './flags.js';
import {STATS} from './stats.js';

const rejectedShare = STATS.rejected.value;

export const COLUMNS = [
  {key: 'transect', label: 'Transect', value: (r) => r.id, text: true},
  {key: 'slope', label: 'Slope tan β', value: (r) => r.s?.slope ?? null},
  {key: 'source', label: 'Slope source', value: (r) => r.s?.slope_source ?? null, text: true},
  {key: 'trend', label: 'Trend m/yr', value: (r) => r.s?.trend?.rate_m_per_yr ?? null},
  {key: 'seasonal', label: 'Seasonal amp. m', value: (r) => r.s?.seasonal?.amplitude_m ?? null},
  {key: 'observations', label: 'Observations', value: (r) => r.s?.n_observations ?? null},
  {key: 'accepted', label: 'Accepted', value: (r) => r.s?.n_accepted ?? null},
  {key: 'rejected', label: 'Rejected', value: (r) => rejectedShare(r.s)},
  {key: 'flags', label: 'Counts by flag', sortable: false},
];

export function sortKeyOrDefault(key) {
  return COLUMNS.some((c) => c.key === key && c.sortable !== false) ? key : 'transect';
}

function compare(column, dir) {
  const sign = dir === 'desc' ? -1 : 1;
  return (a, b) => {
    const va = column.value(a), vb = column.value(b);
    if (va == null && vb == null) return a.order - b.order;
    if (va == null) return 1; // missing values last in both directions
    if (vb == null) return -1;
    const c = column.text ? String(va).localeCompare(String(vb), 'en', {numeric: true}) : va - vb;
    return c !== 0 ? sign * c : a.order - b.order;
  };
}

function slopeCell(s) {
  if (!s || s.slope == null) return DASH;
  return [h('span', {class: 'num'}, num(s.slope, 3)),
    h('span', {class: 'ci'}, `95% ${range(s.slope_ci95, 3)}`)];
}

function sourceCell(s) {
  if (!s) return DASH;
  const weak = s.slope_source === 'default' || s.slope_source === 'none' || s.slope_identifiable === false;
  return h('span', {class: weak ? 'badge badge-warn' : 'badge', title: s.slope_identifiable === false
    ? 'the spectral estimate was not identifiable' : 'slope identifiable'},
  `${s.slope_source}${s.slope_identifiable === false ? ' · not identifiable' : ''}`);
}

function trendCell(s) {
  const t = s?.trend;
  if (!t) return DASH;
  const ci = t.ci95_with_slope_m_per_yr || t.ci95_m_per_yr;
  return [h('span', {class: 'num'}, signed(t.rate_m_per_yr, 2)),
    h('span', {class: 'ci', title: '95% interval including the slope term'}, `95% ${range(ci, 2, signed)}`)];
}

function flagsCell(s) {
  const counts = s?.counts_by_flag;
  if (!counts || Object.keys(counts).length === 0) return DASH;
  const names = Object.keys(counts).sort((a, b) => counts[b] - counts[a]);
  return h('span', {class: 'chips'}, names.map((name) =>
    h('span', {class: `chip chip-${flagSeverity(name)}`, title: flagText(name)}, `${name.replaceAll('_', ' ')} ${count(counts[name])}`)));
}

/**
 * rows: [{id, order, s (summary or undefined)}]; returns the table element.
 * onSort(key, dir) is called when a header is chosen; onHover(id|null) for the plan.
 */
export function summaryTable({rows, sort, dir, hrefOf, onSort, onHover}) {
  const column = COLUMNS.find((c) => c.key === sort) || COLUMNS[0];
  const sorted = [...rows].sort(compare(column, dir));

  const head = h('tr', {}, COLUMNS.map((c) => {
    if (c.sortable === false) return h('th', {scope: 'col'}, c.label);
    const active = c.key === column.key;
    const next = active && dir === 'asc' ? 'desc' : 'asc';
    return h('th', {scope: 'col', 'aria-sort': active ? (dir === 'asc' ? 'ascending' : 'descending') : 'none'},
      h('button', {type: 'button', class: 'sort', 'data-sort': c.key, on: {click: () => onSort(c.key, next)}},
        c.label, h('span', {class: 'sort-mark', 'aria-hidden': 'true'}, active ? (dir === 'asc' ? '▲' : '▼') : '↕')));
  }));

  const body = h('tbody', {}, sorted.map((r) => {
    const s = r.s;
    const n = s?.n_observations;
    const rejected = s && n != null ? n - s.n_accepted : null;
    return h('tr', {'data-transect-id': r.id, 'data-sort-value': column.value(r) ?? '',
      on: {mouseenter: () => onHover?.(r.id), mouseleave: () => onHover?.(null)}},
    h('th', {scope: 'row'}, h('a', {href: hrefOf(r.id)}, r.id)),
    h('td', {class: 'stack'}, slopeCell(s)),
    h('td', {}, sourceCell(s)),
    h('td', {class: 'stack'}, trendCell(s)),
    h('td', {class: 'num'}, s?.seasonal ? num(s.seasonal.amplitude_m, 1) : DASH),
    h('td', {class: 'num'}, count(n)),
    h('td', {class: 'num'}, count(s?.n_accepted)),
    h('td', {class: 'num'}, rejected == null ? DASH : `${count(rejected)} (${pct(rejectedShare(s), 1)})`),
    h('td', {class: 'wrap'}, flagsCell(s)));
  }));

  return [
    h('p', {class: 'table-note'}, 'Latest result per transect. Intervals are 95%; the trend interval includes the slope term. ' +
      'Choose a column heading to sort.'),
    h('div', {class: 'table-scroll', tabindex: '0', 'aria-label': 'Summary per transect (scrolls sideways)'},
      h('table', {class: 'data summary-table', 'data-testid': 'summary-table'},
        h('caption', {class: 'sr-only'}, 'Summary per transect'),
        h('thead', {}, head), body))];
}
