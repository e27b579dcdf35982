// The slope search's energy curve: band energy against tan β, its minimum marked and
// the slope's 95% interval shaded. When the slope was given or no curve exists, a
// message says why instead.
import {h, clear, replace} from './dom.js';
import {COLOURS, axis, clipped, AXIS_FONT} from './chart_style.js';
import {num, range} from './format.js';

const uPlot = window.uPlot;

/** Index of the smallest energy (the curve as drawn). */
export function argMin(values) {
  let best = -1;
  for (let i = 0; i < values.length; i++) {
    if (values[i] != null && (best < 0 || values[i] < values[best])) best = i;
  }
  return best;
}

function message(container, state, text) {
  container.dataset.energyState = state;
  replace(container, h('p', {class: 'chart-message', 'data-testid': 'energy-message'}, text));
  return null;
}

/** Returns the uPlot instance (or null with a message). */
export function createEnergyChart(container, summary) {
  const details = summary?.slope_details;
  const curve = details?.energy_curve;
  if (!summary) return message(container, 'none', 'No result for this transect yet.');
  if (!curve || !Array.isArray(curve.tan_beta) || curve.tan_beta.length < 2) {
    if (summary.slope_source === 'fixed') {
      return message(container, 'fixed', `The slope was given (fixed: tan β = ${num(summary.slope, 3)}` +
        `${summary.slope_sigma != null ? ` ± ${num(summary.slope_sigma, 3)}` : ''}); ` +
        'no estimate was made, so there is no energy curve.');
    }
    const reasons = details?.reasons?.length ? ` Reasons: ${details.reasons.join(', ').replaceAll('_', ' ')}.` : '';
    return message(container, summary.slope_source || 'none',
      `No energy curve for this transect (slope source: ${summary.slope_source ?? 'none'}).${reasons}`);
  }

  const xs = Float64Array.from(curve.tan_beta);
  const ys = curve.energy.map((v) => (v == null ? null : Number(v)));
  const iMin = argMin(ys);
  const logY = ys.every((v) => v == null || v > 0);
  const estimate = details.tan_beta ?? summary.slope;
  const ci = summary.slope_source === 'estimated' ? summary.slope_ci95 : details.ci95;
  container.dataset.energyState = details.verdict || 'estimated';
  container.dataset.energyPoints = String(xs.length);
  container.dataset.energyMinTanBeta = iMin >= 0 ? String(xs[iMin]) : '';
  container.dataset.slope = summary.slope != null ? String(summary.slope) : '';

  const width = Math.max(260, container.clientWidth);
  clear(container);
  const u = new uPlot({
    width, height: 230,
    legend: {show: false},
    padding: [14, 16, 0, 0],
    cursor: {points: {show: false}, drag: {x: false, y: false}, y: false},
    // The curve spans orders of magnitude; a log axis keeps its minimum readable.
    scales: {x: {time: false}, y: logY ? {distr: 3, log: 10} : {range: (self, min, max) => [Math.min(0, min), max + (max - min) * 0.06]}},
    axes: [axis('tan β', {size: 40, labelSize: 16}),
      axis(`band energy (m²·cpd${logY ? ', log' : ''})`, {size: 62, labelSize: 18})],
    series: [{}, {label: 'energy', stroke: COLOURS.energy, width: 1.8, points: {show: true, size: 4, fill: COLOURS.energy, stroke: COLOURS.energy}}],
    hooks: {
      drawClear: [(self) => {
        if (!Array.isArray(ci) || ci[0] == null) return;
        clipped(self, (ctx) => {
          const a = self.valToPos(ci[0], 'x', true), b = self.valToPos(ci[1], 'x', true);
          ctx.fillStyle = COLOURS.ci;
          ctx.fillRect(a, self.bbox.top, b - a, self.bbox.height);
        });
      }],
      draw: [(self) => {
        const pr = window.devicePixelRatio || 1;
        clipped(self, (ctx) => {
          if (estimate != null) {
            const x = self.valToPos(estimate, 'x', true);
            ctx.strokeStyle = COLOURS.marker;
            ctx.lineWidth = 1.5 * pr;
            ctx.setLineDash([5 * pr, 4 * pr]);
            ctx.beginPath(); ctx.moveTo(x, self.bbox.top); ctx.lineTo(x, self.bbox.top + self.bbox.height); ctx.stroke();
            ctx.setLineDash([]);
            ctx.fillStyle = COLOURS.ink;
            ctx.font = AXIS_FONT.replace(/\d+px/, `${12 * pr}px`);
            const label = `tan β ${num(estimate, 4)}`;
            const right = x + ctx.measureText(label).width + 8 * pr < self.bbox.left + self.bbox.width;
            ctx.textAlign = right ? 'left' : 'right';
            ctx.fillText(label, x + (right ? 6 : -6) * pr, self.bbox.top + 14 * pr);
          }
          if (iMin >= 0) {
            const x = self.valToPos(xs[iMin], 'x', true), y = self.valToPos(ys[iMin], 'y', true);
            ctx.beginPath(); ctx.arc(x, y, 5.5 * pr, 0, 2 * Math.PI);
            ctx.strokeStyle = COLOURS.marker; ctx.lineWidth = 2 * pr; ctx.stroke();
          }
        });
      }],
    },
  }, [xs, ys], container);
  container.append(h('p', {class: 'chart-note'},
    `Minimum of the drawn curve at tan β ${num(xs[iMin], 4)} (ring); estimate ${num(estimate, 4)} (dashed line); ` +
    `shaded: 95% interval ${range(ci, 4)}. Verdict: ${(details.verdict || '').replaceAll('_', ' ') || 'not stated'}.`));
  return u;
}
