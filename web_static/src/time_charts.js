// The transect's time charts: positions (raw, corrected with ± 2σ bars, rejected,
// trend with its 95% interval, trend + seasonal cycle) and, below it on the same time
// scale with a shared cursor, the water level and the wave term at each image.
// Markers and model curves are drawn straight onto uPlot's canvas from the column
// arrays: no per-point DOM, nothing rebuilt on zoom.
import {COLOURS, axis, drawPoints, clipped, lowerBound, upperBound, Y_AXIS_SIZE} from './chart_style.js';

const uPlot = window.uPlot;
const utc = (ts) => uPlot.tzDate(new Date(ts * 1e3), 'Etc/UTC');
const noPath = () => null;

export const LAYERS = {
  raw: {label: 'raw position', shape: 'square', r: 1.9, fill: COLOURS.raw, alpha: 0.55},
  bars: {label: 'corrected ± 2σ'},
  corrected: {label: 'corrected, accepted', shape: 'circle', r: 2.4, fill: COLOURS.corrected},
  rejected: {label: 'rejected (corrected or raw)', shape: 'cross', r: 3.2, stroke: COLOURS.rejected, width: 1.5},
  fan: {label: 'trend 95% interval'},
  trend: {label: 'trend'},
  seasonal: {label: 'trend + seasonal cycle'},
};

function drawCurve(u, fn, from, to, colour, width) {
  const sx = u.scales.x;
  const a = Math.max(sx.min, from ?? sx.min), b = Math.min(sx.max, to ?? sx.max);
  if (!(b > a)) return;
  const steps = Math.max(2, Math.ceil(u.bbox.width / (2 * (window.devicePixelRatio || 1))));
  clipped(u, (ctx) => {
    ctx.beginPath();
    for (let k = 0; k <= steps; k++) {
      const t = a + ((b - a) * k) / steps;
      const px = u.valToPos(t, 'x', true), py = u.valToPos(fn(t), 'y', true);
      if (k === 0) ctx.moveTo(px, py); else ctx.lineTo(px, py);
    }
    ctx.strokeStyle = colour;
    ctx.lineWidth = width * (window.devicePixelRatio || 1);
    ctx.stroke();
  });
}

function drawFan(u, trend) {
  if (!trend.low || !trend.high) return;
  const sx = u.scales.x;
  const a = Math.max(sx.min, trend.from ?? sx.min), b = Math.min(sx.max, trend.to ?? sx.max);
  if (!(b > a)) return;
  // The interval is a bow tie pivoting at the intercept time: sample both ends and the pivot.
  const ts = [a, b];
  if (trend.t0 > a && trend.t0 < b) ts.splice(1, 0, trend.t0);
  const up = ts.map((t) => Math.max(trend.low(t), trend.high(t)));
  const down = ts.map((t) => Math.min(trend.low(t), trend.high(t)));
  clipped(u, (ctx) => {
    ctx.beginPath();
    ts.forEach((t, k) => {
      const px = u.valToPos(t, 'x', true), py = u.valToPos(up[k], 'y', true);
      if (k === 0) ctx.moveTo(px, py); else ctx.lineTo(px, py);
    });
    for (let k = ts.length - 1; k >= 0; k--) ctx.lineTo(u.valToPos(ts[k], 'x', true), u.valToPos(down[k], 'y', true));
    ctx.closePath();
    ctx.fillStyle = COLOURS.fan;
    ctx.fill();
  });
}

function drawBars(u, data) {
  const sx = u.scales.x;
  const i0 = lowerBound(data.x, sx.min), i1 = upperBound(data.x, sx.max);
  const path = new Path2D();
  for (let i = i0; i < i1; i++) {
    if (data.low[i] == null) continue;
    const px = u.valToPos(data.x[i], 'x', true);
    path.moveTo(px, u.valToPos(data.low[i], 'y', true));
    path.lineTo(px, u.valToPos(data.high[i], 'y', true));
  }
  clipped(u, (ctx) => {
    ctx.strokeStyle = COLOURS.bars;
    ctx.lineWidth = 1.2 * (window.devicePixelRatio || 1);
    ctx.stroke(path);
  });
}

function yRange(pad) {
  return (u, min, max) => {
    if (min == null || max == null) return [0, 1];
    const span = max - min || Math.abs(max) || 1;
    return [min - span * pad, max + span * pad];
  };
}

function baseOptions(width, height, syncKey) {
  return {
    width, height,
    legend: {show: false},
    padding: [10, 14, 0, 0],
    tzDate: utc,
    cursor: {sync: {key: syncKey, setSeries: false}, points: {show: false}, drag: {x: true, y: false, setScale: true}, y: false},
    scales: {x: {time: true}},
  };
}

/**
 * els: {main, water, wave} containers; data from buildSeries; models {trend, seasonal}
 * (either may be null); visible: {layerName: bool}; onCursor(idx|null, u); onWindow(min, max).
 */
export function createTimeCharts(els, data, models, visible, {onCursor, onWindow, syncKey}) {
  const width = Math.max(280, els.main.clientWidth);
  const mainHeight = width < 600 ? 260 : 340;
  const drawn = {raw: 0, corrected: 0, rejected: 0, water: 0, wave: 0};
  const charts = [];
  let syncing = false;
  let firstDraw;
  const drawnOnce = new Promise((resolve) => { firstDraw = resolve; });

  function linkScale(u, key) {
    if (key !== 'x' || syncing) return;
    syncing = true;
    const {min, max} = u.scales.x;
    for (const other of charts) if (other !== u) other.setScale('x', {min, max});
    syncing = false;
    onWindow?.(min, max);
  }

  const main = new uPlot({
    ...baseOptions(width, mainHeight, syncKey),
    scales: {x: {time: true}, y: {range: yRange(0.04)}},
    axes: [axis(null, {size: 38}), axis('position (m, seaward +)', {size: Y_AXIS_SIZE, labelSize: 18})],
    series: [
      {},
      {label: 'low', paths: noPath, points: {show: false}, show: visible.bars},
      {label: 'high', paths: noPath, points: {show: false}, show: visible.bars},
      {label: 'raw', paths: noPath, points: {show: false}, show: visible.raw},
      {label: 'corrected', paths: noPath, points: {show: false}},
      {label: 'rejected', paths: noPath, points: {show: false}, show: visible.rejected},
    ],
    hooks: {
      drawClear: [(u) => {
        if (visible.fan && models.trend) drawFan(u, models.trend);
        if (visible.bars) drawBars(u, data);
      }],
      draw: [(u) => {
        const full = u.scales.x.min <= data.x[0] && u.scales.x.max >= data.x[data.x.length - 1];
        const n = {};
        clipped(u, () => {
          if (visible.raw) { u.ctx.globalAlpha = LAYERS.raw.alpha; n.raw = drawPoints(u, data.x, data.raw, LAYERS.raw); u.ctx.globalAlpha = 1; }
          if (visible.corrected) n.corrected = drawPoints(u, data.x, data.corrected, LAYERS.corrected);
          if (visible.rejected) n.rejected = drawPoints(u, data.x, data.rejected, LAYERS.rejected);
        });
        if (models.trend && visible.seasonal && models.seasonal) {
          const {trend, seasonal} = models;
          drawCurve(u, (t) => trend.at(t) + seasonal.at(t), trend.from, trend.to, COLOURS.seasonal, 1.4);
        }
        if (models.trend && visible.trend) drawCurve(u, models.trend.at, models.trend.from, models.trend.to, COLOURS.trend, 2.2);
        if (full) Object.assign(drawn, n);
        if (full) firstDraw();
      }],
      setScale: [linkScale],
      setCursor: [(u) => onCursor?.(u.cursor.idx, u)],
    },
  }, [data.x, data.low, data.high, data.raw, data.corrected, data.rejected], els.main);
  charts.push(main);

  function panel(el, ys, label, style, key) {
    const u = new uPlot({
      ...baseOptions(width, width < 600 ? 110 : 120, syncKey),
      scales: {x: {time: true}, y: {range: yRange(0.08)}},
      axes: [axis(null, {size: 30}), axis(label, {size: Y_AXIS_SIZE, labelSize: 18})],
      series: [{}, {label, paths: noPath, points: {show: false}}],
      hooks: {
        draw: [(p) => {
          const full = p.scales.x.min <= data.x[0] && p.scales.x.max >= data.x[data.x.length - 1];
          const n = drawPoints(p, data.x, ys, style);
          if (full) drawn[key] = n;
        }],
        setScale: [linkScale],
        setCursor: [(p) => onCursor?.(p.cursor.idx, p)],
      },
    }, [data.x, ys], el);
    charts.push(u);
    return u;
  }
  panel(els.water, data.water, 'water (m)', {shape: 'circle', r: 1.8, fill: COLOURS.water}, 'water');
  panel(els.wave, data.wave, 'wave (m)', {shape: 'triangle', r: 2.2, fill: COLOURS.wave}, 'wave');

  const observer = new ResizeObserver(() => {
    const w = Math.max(280, els.main.clientWidth);
    if (w === main.width) return;
    for (const u of charts) u.setSize({width: w, height: u === main ? (w < 600 ? 260 : 340) : (w < 600 ? 110 : 120)});
  });
  observer.observe(els.main);

  const fullMin = data.x[0], fullMax = data.x[data.x.length - 1];
  return {
    charts,
    drawn,
    drawnOnce,
    window: () => ({min: main.scales.x.min, max: main.scales.x.max}),
    setWindow(min, max) { main.setScale('x', {min, max}); },
    reset() { main.setScale('x', {min: fullMin, max: fullMax}); },
    isFull() { return main.scales.x.min <= fullMin && main.scales.x.max >= fullMax; },
    /** Shifts the window by `fraction` of its width, not past the record. */
    pan(fraction) {
      const {min, max} = main.scales.x;
      const span = max - min;
      let a = min + span * fraction;
      a = Math.min(Math.max(a, fullMin - span * 0.05), fullMax + span * 0.05 - span);
      main.setScale('x', {min: a, max: a + span});
    },
    /** Scales the window about its centre (factor < 1 zooms in). */
    zoom(factor) {
      const {min, max} = main.scales.x;
      const mid = (min + max) / 2, half = ((max - min) * factor) / 2;
      main.setScale('x', {min: Math.max(mid - half, fullMin - half * 0.1), max: Math.min(mid + half, fullMax + half * 0.1)});
    },
    setVisible(layer, on) {
      visible[layer] = on;
      const index = {bars: [1, 2], raw: [3], rejected: [5]}[layer];
      // Series that set the y range are shown or hidden through uPlot so the range follows.
      if (index) index.forEach((i) => main.setSeries(i, {show: on}));
      else main.redraw(false, false);
    },
    destroy() { observer.disconnect(); charts.forEach((u) => u.destroy()); },
  };
}
