// Colours, fonts and marker shapes shared by the canvas charts and the PNG export
// (canvas drawing cannot read the stylesheet, so the chart palette lives here).

export const COLOURS = {
  ink: '#17313b',
  muted: '#4a5f68',
  grid: 'rgba(23, 49, 59, 0.09)',
  raw: '#a0783c',
  corrected: '#0f6a73',
  bars: 'rgba(15, 106, 115, 0.24)',
  rejected: '#b3261e',
  trend: '#2b2d5c',
  fan: 'rgba(43, 45, 92, 0.14)',
  seasonal: '#8a4fa3',
  water: '#2f6690',
  wave: '#8a6d1f',
  energy: '#2b2d5c',
  ci: 'rgba(15, 106, 115, 0.16)',
  marker: '#b4502d',
};

export const FONT_STACK = 'system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", "Liberation Sans", sans-serif';
export const AXIS_FONT = `12px ${FONT_STACK}`;
export const LABEL_FONT = `600 12px ${FONT_STACK}`;
export const Y_AXIS_SIZE = 62; // the same on every time chart, so their plots line up

export function axis(label, extra = {}) {
  return {
    stroke: COLOURS.muted,
    font: AXIS_FONT,
    labelFont: LABEL_FONT,
    label,
    grid: {stroke: COLOURS.grid, width: 1},
    ticks: {stroke: COLOURS.grid, width: 1, size: 4},
    ...extra,
  };
}

/**
 * Adds one marker per point to `path` (canvas pixels): 'circle', 'square', 'cross',
 * 'triangle' or 'diamond' of radius r.
 */
export function addMarker(path, shape, x, y, r) {
  switch (shape) {
    case 'square': path.rect(x - r, y - r, 2 * r, 2 * r); break;
    case 'cross':
      path.moveTo(x - r, y - r); path.lineTo(x + r, y + r);
      path.moveTo(x - r, y + r); path.lineTo(x + r, y - r);
      break;
    case 'triangle':
      path.moveTo(x, y - r); path.lineTo(x + r, y + r * 0.8); path.lineTo(x - r, y + r * 0.8); path.closePath();
      break;
    case 'diamond':
      path.moveTo(x, y - r); path.lineTo(x + r, y); path.lineTo(x, y + r); path.lineTo(x - r, y); path.closePath();
      break;
    default:
      path.moveTo(x + r, y); path.arc(x, y, r, 0, 2 * Math.PI);
  }
}

/** First index with xs[i] >= v (xs ascending). */
export function lowerBound(xs, v) {
  let lo = 0, hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] < v) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** First index with xs[i] > v (xs ascending). */
export function upperBound(xs, v) {
  let lo = 0, hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] <= v) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/**
 * Draws the points of ys (null = none) inside u's current x window as one path.
 * Returns how many were drawn. style: {shape, r (css px), fill, stroke, width}.
 */
export function drawPoints(u, xs, ys, style) {
  const ctx = u.ctx;
  const pr = window.devicePixelRatio || 1;
  const sx = u.scales.x, sy = u.scales.y;
  const i0 = lowerBound(xs, sx.min), i1 = upperBound(xs, sx.max);
  const path = new Path2D();
  const r = style.r * pr;
  let drawn = 0;
  for (let i = i0; i < i1; i++) {
    const y = ys[i];
    if (y == null || y < sy.min || y > sy.max) continue;
    addMarker(path, style.shape, u.valToPos(xs[i], 'x', true), u.valToPos(y, 'y', true), r);
    drawn++;
  }
  if (style.fill) { ctx.fillStyle = style.fill; ctx.fill(path); }
  if (style.stroke) { ctx.strokeStyle = style.stroke; ctx.lineWidth = (style.width || 1) * pr; ctx.stroke(path); }
  return drawn;
}

/** Runs fn with the canvas clipped to the plot area. */
export function clipped(u, fn) {
  const {ctx, bbox} = u;
  ctx.save();
  ctx.beginPath();
  ctx.rect(bbox.left, bbox.top, bbox.width, bbox.height);
  ctx.clip();
  try { fn(ctx); } finally { ctx.restore(); }
}
