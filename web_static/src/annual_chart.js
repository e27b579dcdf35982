// The seasonal cycle folded onto one year: accepted corrected positions less the trend
// against the time of year, with the fitted cosine and its most seaward day.
import {h, clear, replace} from './dom.js';
import {COLOURS, axis, clipped, drawPoints} from './chart_style.js';
import {dayOfYear, num, SECONDS_PER_YEAR, EPOCH_2000} from './format.js';

const uPlot = window.uPlot;
const MONTH_STARTS = [0, 31, 59, 90, 120, 151, 181, 212, 243, 273, 304, 334];
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

export function createAnnualChart(container, data, models, summary) {
  const {trend, seasonal} = models;
  if (!seasonal || !trend) {
    container.dataset.annualState = 'none';
    replace(container, h('p', {class: 'chart-message'},
      'No seasonal fit for this transect (it needs at least 8 accepted points over more than a year).'));
    return null;
  }
  // Julian-year fraction of each accepted point, as the fit defines it (phase from 2000-01-01).
  const pts = [];
  for (let i = 0; i < data.x.length; i++) {
    const y = data.corrected[i];
    if (y == null) continue;
    const years = (data.x[i] - EPOCH_2000) / SECONDS_PER_YEAR;
    pts.push([(years - Math.floor(years)) * 365.25, y - trend.at(data.x[i])]);
  }
  pts.sort((a, b) => a[0] - b[0]);
  const xs = Float64Array.from(pts, (p) => p[0]);
  const ys = pts.map((p) => p[1]);
  const peak = summary.seasonal.most_seaward_day_of_year;
  container.dataset.annualState = 'drawn';
  container.dataset.annualPoints = String(xs.length);

  const width = Math.max(260, container.clientWidth);
  clear(container);
  const u = new uPlot({
    width, height: 230,
    legend: {show: false},
    padding: [14, 16, 0, 0],
    cursor: {points: {show: false}, drag: {x: false, y: false}, y: false},
    scales: {x: {time: false, range: () => [0, 365.25]}, y: {range: (self, min, max) => {
      const a = Math.max(Math.abs(min), Math.abs(max), seasonal.amplitude * 1.2);
      return [-a, a];
    }}},
    axes: [
      axis(null, {size: 30, splits: (self) => (self.width < 480 ? MONTH_STARTS.filter((d, i) => i % 2 === 0) : MONTH_STARTS), values: (self, splits) => splits.map((d) => MONTHS[MONTH_STARTS.indexOf(d)] ?? '')}),
      axis('position less trend (m)', {size: 62, labelSize: 18}),
    ],
    series: [{}, {label: 'detrended', paths: () => null, points: {show: false}}],
    hooks: {
      draw: [(self) => {
        const pr = window.devicePixelRatio || 1;
        clipped(self, (ctx) => {
          ctx.globalAlpha = 0.45;
          drawPoints(self, xs, ys, {shape: 'circle', r: 1.7, fill: COLOURS.corrected});
          ctx.globalAlpha = 1;
          ctx.beginPath();
          for (let d = 0; d <= 366; d += 2) {
            const px = self.valToPos(d, 'x', true), py = self.valToPos(seasonal.atFraction(d / 365.25), 'y', true);
            if (d === 0) ctx.moveTo(px, py); else ctx.lineTo(px, py);
          }
          ctx.strokeStyle = COLOURS.seasonal; ctx.lineWidth = 2.2 * pr; ctx.stroke();
          if (peak != null) {
            const x = self.valToPos(peak, 'x', true);
            ctx.setLineDash([5 * pr, 4 * pr]);
            ctx.strokeStyle = COLOURS.marker; ctx.lineWidth = 1.5 * pr;
            ctx.beginPath(); ctx.moveTo(x, self.bbox.top); ctx.lineTo(x, self.bbox.top + self.bbox.height); ctx.stroke();
            ctx.setLineDash([]);
          }
        });
      }],
    },
  }, [xs, ys], container);
  container.append(h('p', {class: 'chart-note'},
    `Amplitude ${num(summary.seasonal.amplitude_m, 1)} ± ${num(summary.seasonal.amplitude_sigma_m, 1)} m; ` +
    `most seaward around ${dayOfYear(peak)} (dashed line). Points: accepted positions less the trend.`));
  return u;
}
