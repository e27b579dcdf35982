// Plan view of a site's transects in the site CRS (projected metres, north up, one
// scale for x and y). Each transect is a neutral line; the chosen statistic is a
// glyph anchored at the transect's mean shoreline position (the trend intercept):
// an arrow for signed rates (its direction is the direction of movement), a lollipop
// for unsigned values. The origin marker's shape tells whether the slope is known.
import {s, replace} from './dom.js';
import {STATS} from './stats.js';
import {num} from './format.js';

const PAD = 14;        // px kept free at the edges
const LABEL_ROOM = 46; // px beyond the geometry for the rotated transect labels
const LABEL_GAP = 14;
const FOOT = 40;       // px strip under the plan for the scale bar and north arrow  // px between label baselines below which labels are thinned

/** Transect geometry from the GeoJSON features (site-CRS properties, not the geometry). */
export function transectGeometry(features) {
  const items = features.map((f) => {
    const p = f.properties;
    const az = (p.azimuth_deg * Math.PI) / 180;
    const dx = Math.sin(az), dy = Math.cos(az);
    return {id: p.transect_id, ox: p.origin_x_m, oy: p.origin_y_m, L: p.length_m, dx, dy,
      ex: p.origin_x_m + p.length_m * dx, ey: p.origin_y_m + p.length_m * dy};
  });
  // Order alongshore (across the mean seaward direction) so neighbours are neighbours.
  let mx = 0, my = 0;
  for (const t of items) { mx += t.dx; my += t.dy; }
  const norm = Math.hypot(mx, my) || 1;
  const ax = my / norm, ay = -mx / norm;
  return items.sort((a, b) => (a.ox * ax + a.oy * ay) - (b.ox * ax + b.oy * ay));
}

function niceLength(metres) {
  const p = 10 ** Math.floor(Math.log10(metres));
  for (const m of [5, 2, 1]) if (m * p <= metres) return m * p;
  return p;
}

function originMarker(summary, x, y) {
  if (!summary) return s('circle', {class: 'origin origin-unknown', cx: x, cy: y, r: 3.2}); // no result yet
  const source = summary.slope_source;
  if (source === 'none' || summary.slope == null) {
    return s('path', {class: 'origin origin-none', d: `M${x - 3.5} ${y - 3.5}L${x + 3.5} ${y + 3.5}M${x - 3.5} ${y + 3.5}L${x + 3.5} ${y - 3.5}`});
  }
  const weak = source === 'default' || summary.slope_identifiable === false;
  return s('circle', {class: weak ? 'origin origin-weak' : 'origin origin-ok', cx: x, cy: y, r: 3.8});
}

function glyph(stat, value, vmax, ax, ay, ux, uy, maxLen) {
  if (value == null || !Number.isFinite(value)) {
    return s('rect', {class: 'glyph glyph-none', x: ax - 3, y: ay - 3, width: 6, height: 6});
  }
  const len = vmax > 0 ? Math.max(2, (Math.abs(value) / vmax) * maxLen) : 2;
  const px = -uy, py = ux; // perpendicular
  if (STATS[stat].signed) {
    const sign = value < 0 ? -1 : 1;
    const dx = ux * sign, dy = uy * sign;
    const head = Math.min(8, len);
    const bx = ax + dx * (len - head), by = ay + dy * (len - head);
    const tx = ax + dx * len, ty = ay + dy * len;
    const w = 1.6, hw = 5;
    const d = `M${ax + px * w} ${ay + py * w}L${bx + px * w} ${by + py * w}L${bx + px * hw} ${by + py * hw}` +
      `L${tx} ${ty}L${bx - px * hw} ${by - py * hw}L${bx - px * w} ${by - py * w}L${ax - px * w} ${ay - py * w}Z`;
    return s('path', {class: `glyph ${value < 0 ? 'glyph-landward' : 'glyph-seaward'}`, d});
  }
  const tx = ax + ux * len, ty = ay + uy * len;
  return s('g', {class: `glyph glyph-${stat}`},
    s('line', {x1: ax, y1: ay, x2: tx, y2: ty}),
    s('circle', {cx: tx, cy: ty, r: 3.6}));
}

function northArrow(x, y) {
  return s('g', {class: 'north-arrow', transform: `translate(${x} ${y})`},
    s('title', {}, 'Grid north of the site CRS'),
    s('circle', {r: 12}),
    s('path', {class: 'needle-dark', d: 'M0 -9L-4.5 6L0 2Z'}),
    s('path', {class: 'needle-light', d: 'M0 -9L4.5 6L0 2Z'}),
    s('text', {x: -17, y: 4, 'text-anchor': 'end'}, 'N'));
}

function scaleBar(x, y, scale, width) {
  const metres = niceLength((width * 0.22) / scale);
  const len = metres * scale;
  const label = metres >= 1000 ? `${metres / 1000} km` : `${metres} m`;
  return s('g', {class: 'scale-bar', transform: `translate(${x} ${y})`, 'data-testid': 'scale-bar'},
    s('rect', {class: 'scale-fill', x: 0, y: -3, width: len / 2, height: 3}),
    s('path', {d: `M0 -7V0H${len}V-7M${len / 2} 0V-4`}),
    s('text', {x: 0, y: -10, 'text-anchor': 'start'}, '0'),
    s('text', {x: len, y: -10, 'text-anchor': 'end'}, label));
}

/**
 * Draws into `container` and redraws when its width changes.
 * options: {features, summaries: Map id → summary, stat, hrefOf(id)}.
 */
export function createPlan(container, options) {
  let {stat, summaries} = options;
  const items = transectGeometry(options.features);
  let lastWidth = 0;

  function draw() {
    const W = Math.max(240, container.clientWidth);
    lastWidth = W;
    let minx = Infinity, maxx = -Infinity, miny = Infinity, maxy = -Infinity;
    for (const t of items) {
      minx = Math.min(minx, t.ox, t.ex); maxx = Math.max(maxx, t.ox, t.ex);
      miny = Math.min(miny, t.oy, t.ey); maxy = Math.max(maxy, t.oy, t.ey);
    }
    const spanX = Math.max(maxx - minx, 1), spanY = Math.max(maxy - miny, 1);
    const narrow = W < 500;
    const margin = PAD + (narrow ? 30 : LABEL_ROOM);
    const innerW = W - 2 * margin;
    const H = Math.min(narrow ? 420 : 560, Math.max(narrow ? 200 : 260, spanY * (innerW / spanX) + 2 * margin));
    const scale = Math.min(innerW / spanX, (H - 2 * margin) / spanY);
    const offX = (W - spanX * scale) / 2, offY = (H - spanY * scale) / 2;
    const fullH = H + FOOT;
    const X = (x) => offX + (x - minx) * scale;
    const Y = (y) => offY + (maxy - y) * scale;

    const def = STATS[stat];
    const values = new Map(items.map((t) => [t.id, def.value(summaries.get(t.id))]));
    const vmax = Math.max(0, ...[...values.values()].filter(Number.isFinite).map(Math.abs));

    // Anchors: mean shoreline position along each transect (trend intercept), else mid-transect.
    const anchor = (t) => {
      const a = summaries.get(t.id)?.trend?.intercept_m;
      const c = Number.isFinite(a) ? Math.min(Math.max(a, 0), t.L) : t.L / 2;
      return [X(t.ox + c * t.dx), Y(t.oy + c * t.dy)];
    };
    const anchors = items.map(anchor);

    const svg = s('svg', {width: W, height: fullH, viewBox: `0 0 ${W} ${fullH}`, class: narrow ? 'plan-svg is-narrow' : 'plan-svg', role: 'img',
      'aria-label': `Plan of ${items.length} transects, ${def.label} shown along each`});

    // Backdrop: land behind the origins, sea beyond the mean shoreline.
    if (items.length > 1) {
      const ext = 0.25;
      const land = items.map((t) => [X(t.ox - t.L * ext * t.dx), Y(t.oy - t.L * ext * t.dy)]);
      const sea = items.map((t) => [X(t.ex + t.L * ext * t.dx), Y(t.ey + t.L * ext * t.dy)]);
      const poly = (pts) => pts.map(([x, y]) => `${x.toFixed(1)},${y.toFixed(1)}`).join(' ');
      svg.append(
        s('polygon', {class: 'plan-land', points: poly([...land, ...[...anchors].reverse()])}),
        s('polygon', {class: 'plan-sea', points: poly([...anchors, ...[...sea].reverse()])}),
        s('polyline', {class: 'plan-shoreline', points: poly(anchors)}));
    }

    // Labels are thinned where neighbouring origins are closer than LABEL_GAP.
    let minGap = Infinity;
    for (let i = 1; i < items.length; i++) {
      minGap = Math.min(minGap, Math.hypot(X(items[i].ox) - X(items[i - 1].ox), Y(items[i].oy) - Y(items[i - 1].oy)));
    }
    const labelStep = Number.isFinite(minGap) ? Math.max(1, Math.ceil(LABEL_GAP / Math.max(minGap, 0.1))) : 1;

    const group = s('g', {class: 'transects'});
    items.forEach((t, i) => {
      const summary = summaries.get(t.id);
      const x0 = X(t.ox), y0 = Y(t.oy), x1 = X(t.ex), y1 = Y(t.ey);
      const ux = t.dx, uy = -t.dy; // seaward unit vector on screen
      const [ax, ay] = anchors[i];
      const value = values.get(t.id);
      const maxLen = Math.max(16, Math.min(0.45 * t.L * scale, 90));
      // Label along the landward extension, never upside down.
      let angle = (Math.atan2(-uy, -ux) * 180) / Math.PI;
      let anchorText = 'start';
      if (angle > 90 || angle < -90) { angle += 180; anchorText = 'end'; }
      const lx = x0 - ux * 8, ly = y0 - uy * 8;
      const title = `${t.id} · ${def.label}: ${value == null ? 'no value' : def.format(value)}` +
        (summary ? ` · slope ${num(summary.slope, 3)} (${summary.slope_source})` : ' · no result yet');
      group.append(s('a', {href: options.hrefOf(t.id), class: 'transect', 'data-transect-id': t.id,
        'data-value': value ?? '', 'aria-label': title},
        s('title', {}, title),
        s('line', {class: 'transect-hit', x1: x0, y1: y0, x2: x1, y2: y1}),
        s('line', {class: 'transect-line', x1: x0, y1: y0, x2: x1, y2: y1}),
        glyph(stat, value, vmax, ax, ay, ux, uy, maxLen),
        originMarker(summary, x0, y0),
        i % labelStep === 0
          ? s('text', {class: 'transect-label', x: lx, y: ly, 'text-anchor': anchorText, 'dominant-baseline': 'middle',
            transform: `rotate(${angle.toFixed(1)} ${lx.toFixed(1)} ${ly.toFixed(1)})`}, t.id)
          : null));
    });
    svg.append(group, northArrow(W - PAD - 14, H + FOOT / 2), scaleBar(PAD + 6, H + FOOT - 10, scale, W));

    replace(container, svg);
    container.dataset.transects = String(items.length);
    container.dataset.stat = stat;
    container.dataset.scaleMPerPx = (1 / scale).toPrecision(4);
  }

  const observer = new ResizeObserver(() => {
    if (container.clientWidth !== lastWidth) draw();
  });
  observer.observe(container);
  draw();

  return {
    setStat(name) { stat = name; draw(); },
    setSummaries(map) { summaries = map; draw(); },
    highlight(id) {
      for (const el of container.querySelectorAll('.transect.is-highlighted')) el.classList.remove('is-highlighted');
      if (id != null) container.querySelector(`.transect[data-transect-id="${CSS.escape(id)}"]`)?.classList.add('is-highlighted');
    },
    /** The longest glyph's value and transect, for the legend. */
    extreme() {
      let best = null;
      for (const t of items) {
        const v = STATS[stat].value(summaries.get(t.id));
        if (Number.isFinite(v) && (!best || Math.abs(v) > Math.abs(best.value))) best = {id: t.id, value: v};
      }
      return best;
    },
    destroy() { observer.disconnect(); },
  };
}
