// Transect view: the facts of the latest summary, the time charts (positions, water
// level, wave term), the slope energy curve and the folded seasonal cycle, with zoom,
// pan, CSV and PNG downloads. The chart window and hidden layers live in the URL.
import {h, s as svgEl, errorBox, saveBlob, replace} from './dom.js';
import {apiPath, getJson, getBlob, ApiError} from './api.js';
import {href, replaceQuery} from './router.js';
import {buildSeries, trendModel, seasonalModel, SIGMA_FACTOR} from './series_data.js';
import {createTimeCharts, LAYERS} from './time_charts.js';
import {createEnergyChart} from './energy_chart.js';
import {createAnnualChart} from './annual_chart.js';
import {composePng} from './png_export.js';
import {COLOURS} from './chart_style.js';
import {cautionList, NOTICE} from './cautions.js';
import {flagSeverity, flagReason, sortFlags} from './flags.js';
import {num, signed, range, count, pct, date, dateTime, dayOfYear, DASH} from './format.js';

function facts(summary, props) {
  const s = summary || {};
  const t = s.trend;
  const rejected = s.n_observations != null ? s.n_observations - s.n_accepted : null;
  const item = (term, value, testid) => [h('dt', {}, term), h('dd', {'data-testid': testid}, value)];
  return h('dl', {class: 'facts', 'data-testid': 'facts'},
    item('Slope tan β', summary ? `${num(s.slope, 4)} (${s.slope_source}${s.slope_identifiable === false ? ', not identifiable' : ''}); 95% ${range(s.slope_ci95, 4)}` : DASH, 'fact-slope'),
    item('Trend', t ? `${signed(t.rate_m_per_yr, 2)} m/yr; 95% ${range(t.ci95_with_slope_m_per_yr || t.ci95_m_per_yr, 2, signed)} (with slope term)` : DASH, 'fact-trend'),
    item('Seasonal cycle', s.seasonal ? `amplitude ${num(s.seasonal.amplitude_m, 1)} ± ${num(s.seasonal.amplitude_sigma_m, 1)} m; most seaward around ${dayOfYear(s.seasonal.most_seaward_day_of_year)}` : DASH, 'fact-seasonal'),
    item('Observations', summary ? `${count(s.n_observations)}; accepted ${count(s.n_accepted)}; rejected ${count(rejected)} (${pct(rejected / s.n_observations, 1)})` : DASH, 'fact-counts'),
    item('Accepted record', summary ? `${date(s.first_accepted)} to ${date(s.last_accepted)}; mean interval ${num(s.mean_interval_days, 1)} days` : DASH, 'fact-record'),
    item('Transect', props ? `length ${num(props.length_m, 0)} m; azimuth ${num(props.azimuth_deg, 1)}°; z_ref ${num(s.z_ref_m, 2)} m` : DASH, 'fact-geometry'));
}

function keySymbol(layer) {
  const svg = svgEl('svg', {width: 22, height: 12, viewBox: '0 0 22 12', 'aria-hidden': 'true', class: 'key-symbol'});
  const add = (el) => svg.append(el);
  if (layer === 'raw') add(svgEl('rect', {x: 8.5, y: 3.5, width: 5, height: 5, fill: COLOURS.raw, 'fill-opacity': '0.7'}));
  if (layer === 'corrected') add(svgEl('circle', {cx: 11, cy: 6, r: 3, fill: COLOURS.corrected}));
  if (layer === 'rejected') add(svgEl('path', {d: 'M7.5 2.5L14.5 9.5M7.5 9.5L14.5 2.5', stroke: COLOURS.rejected, 'stroke-width': 1.6}));
  if (layer === 'bars') add(svgEl('path', {d: 'M7 1V11M11 2V10M15 0.5V11.5', stroke: COLOURS.bars, 'stroke-width': 1.6}));
  if (layer === 'trend') add(svgEl('path', {d: 'M1 8L21 4', stroke: COLOURS.trend, 'stroke-width': 2.2}));
  if (layer === 'fan') add(svgEl('path', {d: 'M1 10L21 2V6L1 6Z', fill: COLOURS.fan}));
  if (layer === 'seasonal') add(svgEl('path', {d: 'M1 6C4 0 7 0 10 6S17 12 21 6', stroke: COLOURS.seasonal, 'stroke-width': 1.6, fill: 'none'}));
  return svg;
}

function tooltipContent(row) {
  const flags = sortFlags(row.flags || []);
  return [
    h('p', {class: 'tip-head'}, h('strong', {}, dateTime(row.time)), ` · ${row.sensor ?? ''}`),
    h('p', {class: row.accepted ? 'tip-status ok' : 'tip-status rejected'}, row.accepted ? 'accepted' : 'rejected'),
    h('dl', {class: 'tip-values'},
      h('dt', {}, 'raw'), h('dd', {}, `${num(row.chainage_raw_m, 2)} m`),
      h('dt', {}, 'corrected'), h('dd', {}, row.chainage_m == null ? 'not corrected' : `${num(row.chainage_m, 2)} ± ${num(row.sigma_m, 1)} m (1σ)`),
      h('dt', {}, 'water level'), h('dd', {}, `${num(row.water_level_m, 2)} m`),
      h('dt', {}, 'wave term'), h('dd', {}, `${num(row.wave_level_m, 2)} m`)),
    flags.length ? h('ul', {class: 'tip-flags'}, flags.map((f) =>
      h('li', {class: `sev-${flagSeverity(f)}`}, h('strong', {}, f.replaceAll('_', ' ')), `: ${flagReason(f)}`))) : null,
    h('p', {class: 'tip-image'}, row.image_id ?? ''),
  ];
}

/**
 * The marker nearest the pointer (in both directions) among the points within a few
 * pixels of the cursor's time, so a rejected point among dense accepted ones can be
 * hovered. Returns {idx, y}.
 */
function nearestMarker(u, data, cursorIdx) {
  const cx = u.cursor.left, cy = u.cursor.top;
  const reach = 8; // css px either side
  let best = {idx: cursorIdx, y: data.corrected[cursorIdx] ?? data.rejected[cursorIdx] ?? data.raw[cursorIdx], d: Infinity};
  const consider = (i) => {
    const px = u.valToPos(data.x[i], 'x');
    if (Math.abs(px - cx) > reach) return false;
    for (const ys of [data.rejected, data.corrected, data.raw]) {
      const y = ys[i];
      if (y == null) continue;
      const d = Math.hypot(px - cx, u.valToPos(y, 'y') - cy);
      if (d < best.d) best = {idx: i, y, d};
    }
    return true;
  };
  for (let i = cursorIdx; i >= 0 && consider(i); i--);
  for (let i = cursorIdx + 1; i < data.x.length && consider(i); i++);
  return best;
}

function parseDay(text) {
  const t = Date.parse(`${text}T00:00:00Z`);
  return Number.isFinite(t) ? t / 1000 : null;
}

function dayText(ts) { return new Date(ts * 1000).toISOString().slice(0, 10); }

export async function renderTransectView(main, {site, transect}, query, ctx) {
  const base = apiPath('v1', 'sites', site);
  const seriesPath = `${apiPath('v1', 'sites', site, 'transects', transect, 'series')}`;
  const [siteObj, transects, summaryDoc, series] = await Promise.all([
    getJson(base),
    getJson(`${base}/transects`),
    getJson(`${base}/summary`).catch((err) => (err.status === 404 ? null : Promise.reject(err))),
    getJson(`${seriesPath}?format=json`).catch((err) => ({error: err})),
  ]);
  if (!ctx.isCurrent()) return {};
  const siteName = siteObj.name || site;
  ctx.setTitle(`${transect} · ${siteName}`);
  ctx.setCrumbs([{label: siteName, href: href.site(site)}, {label: transect}]);

  const features = transects.features || [];
  const index = features.findIndex((f) => f.properties.transect_id === transect);
  if (index < 0) throw new ApiError(404, 'Not found', `transect "${transect}" is not defined for site "${site}"`, null);
  const props = features[index].properties;
  const entry = summaryDoc?.transects.find((t) => t.transect_id === transect);
  const summary = entry?.summary;
  const neighbour = (k) => (features[k] ? features[k].properties.transect_id : null);
  const prev = neighbour(index - 1), next = neighbour(index + 1);

  const head = h('header', {class: 'view-head'},
    h('div', {},
      h('h1', {}, `Transect ${transect}`),
      h('p', {class: 'subtle'}, `${siteName} · result of run ${entry?.run_id ?? DASH}`)),
    h('nav', {class: 'view-tabs', 'aria-label': 'Neighbouring transects'},
      prev ? h('a', {href: href.transect(site, prev), rel: 'prev'}, `← ${prev}`) : null,
      h('a', {href: href.site(site)}, 'Site'),
      next ? h('a', {href: href.transect(site, next), rel: 'next'}, `${next} →`) : null));

  // The transect's own cautions sit by its facts; the site's follow the charts.
  const siteCautions = cautionList('Cautions for this site', summaryDoc?.cautions, 'site-cautions');
  replace(main, head, h('section', {class: 'panel', 'aria-label': 'Summary'}, facts(summary, props)),
    cautionList('Cautions for this transect', summary?.cautions, 'transect-cautions'));

  if (series.error || !series.rows || series.rows.length === 0) {
    main.append(h('section', {class: 'panel'}, series.error ? errorBox(series.error.message)
      : h('p', {class: 'hint'}, 'This transect has no rows in its latest result.')));
    if (siteCautions) main.append(siteCautions);
    ctx.markReady();
    return {};
  }

  const data = buildSeries(series.rows);
  const models = {trend: trendModel(summary), seasonal: seasonalModel(summary)};
  const hidden = new Set((query.get('hide') || '').split(',').filter((k) => Object.hasOwn(LAYERS, k)));
  const visible = Object.fromEntries(Object.keys(LAYERS).map((k) => [k, !hidden.has(k)]));

  const mainEl = h('div', {class: 'chart chart-main', 'data-testid': 'time-chart'});
  const waterEl = h('div', {class: 'chart chart-panel', 'data-testid': 'water-chart'});
  const waveEl = h('div', {class: 'chart chart-panel', 'data-testid': 'wave-chart'});
  const tip = h('div', {class: 'chart-tip', hidden: true, 'data-testid': 'chart-tip', role: 'status'});
  const ring = h('div', {class: 'hover-ring', hidden: true});
  const windowText = h('span', {class: 'window-text', 'data-testid': 'window-text'});
  const status = h('span', {class: 'download-status', 'aria-live': 'polite'});
  const energyEl = h('div', {class: 'chart chart-small', 'data-testid': 'energy-chart'});
  const annualEl = h('div', {class: 'chart chart-small', 'data-testid': 'annual-chart'});

  const button = (label, testid, onClick, title) =>
    h('button', {type: 'button', class: 'button', 'data-testid': testid, title, 'aria-label': title, on: {click: onClick}}, label);

  let charts = null;
  const toggles = Object.entries(LAYERS).map(([layer, def]) => {
    const box = h('input', {type: 'checkbox', checked: visible[layer], 'data-layer': layer});
    box.addEventListener('change', () => {
      charts.setVisible(layer, box.checked);
      if (box.checked) hidden.delete(layer); else hidden.add(layer);
      replaceQuery({hide: [...hidden].join(',')});
    });
    return h('label', {class: 'key-item'}, box, keySymbol(layer), def.label);
  });

  const toolbar = h('div', {class: 'toolbar', role: 'toolbar', 'aria-label': 'Chart window and downloads'},
    h('div', {class: 'button-group'},
      button('◀', 'pan-left', () => charts.pan(-0.5), 'Earlier (pan left)'),
      button('▶', 'pan-right', () => charts.pan(0.5), 'Later (pan right)'),
      button('Zoom in', 'zoom-in', () => charts.zoom(0.5)),
      button('Zoom out', 'zoom-out', () => charts.zoom(2)),
      button('Reset', 'zoom-reset', () => charts.reset())),
    windowText,
    h('div', {class: 'button-group'},
      button('Download CSV', 'download-csv', async () => {
        status.textContent = 'Preparing CSV…';
        try {
          saveBlob(await getBlob(`${seriesPath}?format=csv`), `${site}-${transect}.csv`);
          status.textContent = '';
        } catch (err) { status.textContent = err.message; }
      }),
      button('Download PNG', 'download-png', async () => {
        status.textContent = 'Preparing PNG…';
        try {
          const canvases = (list) => list.filter(Boolean).map((u) => u.ctx.canvas);
          const blob = await composePng({
            title: `${siteName} · transect ${transect} · run ${entry?.run_id ?? DASH}`,
            rows: [canvases([charts.charts[0]]), canvases([charts.charts[1]]), canvases([charts.charts[2]]), canvases([energy, annual])],
            key: [
              {label: 'raw', shape: 'square', fill: COLOURS.raw},
              {label: 'corrected', shape: 'circle', fill: COLOURS.corrected},
              {label: 'rejected', shape: 'cross', stroke: COLOURS.rejected},
              {label: `± ${SIGMA_FACTOR}σ`, line: COLOURS.bars, width: 4},
              {label: 'trend', line: COLOURS.trend},
              {label: 'trend 95%', band: COLOURS.fan},
              {label: 'trend + seasonal', line: COLOURS.seasonal, width: 1.5},
              {label: 'water level', shape: 'circle', fill: COLOURS.water},
              {label: 'wave term', shape: 'triangle', fill: COLOURS.wave},
            ],
            notice: NOTICE,
          });
          saveBlob(blob, `${site}-${transect}.png`);
          status.textContent = '';
        } catch (err) { status.textContent = err.message; }
      })),
    status);

  main.append(
    h('section', {class: 'panel chart-panel-box', 'aria-label': 'Positions over time'},
      h('div', {class: 'panel-head'}, h('h2', {class: 'panel-title'}, 'Shoreline position over time')),
      toolbar,
      h('div', {class: 'key', 'aria-label': 'Layers'}, toggles),
      h('div', {class: 'chart-stack'}, mainEl, waterEl, waveEl, tip),
      h('p', {class: 'chart-note'},
        `Bars: corrected position ± ${SIGMA_FACTOR}σ (σ = total 1σ uncertainty of the point). Rejected rows are crosses at their ` +
        'corrected position (raw if uncorrected); hover for the reasons. Trend interval: 95%, including the slope term. ' +
        'Below, on the same time axis: the water level and the wave term (the wave part of the waterline) at each image. ' +
        'Drag across a chart to zoom in time; double-click or Reset for the whole record.')),
    h('div', {class: 'two-up'},
      h('section', {class: 'panel', 'aria-label': 'Slope energy curve'},
        h('h2', {class: 'panel-title'}, 'Slope estimate: energy curve'), energyEl),
      h('section', {class: 'panel', 'aria-label': 'Seasonal cycle'},
        h('h2', {class: 'panel-title'}, 'Seasonal cycle'), annualEl)));
  if (siteCautions) main.append(siteCautions);

  let urlTimer = null;
  const showWindow = (min, max) => {
    windowText.textContent = `${dayText(min)} to ${dayText(max)}`;
    clearTimeout(urlTimer);
    urlTimer = setTimeout(() => {
      if (!ctx.isCurrent()) return;
      replaceQuery(charts.isFull() ? {from: null, to: null} : {from: dayText(min), to: dayText(max)});
    }, 250);
  };

  charts = createTimeCharts({main: mainEl, water: waterEl, wave: waveEl}, data, models, visible, {
    syncKey: `transect-${site}-${transect}`,
    onWindow: showWindow,
    onCursor: (cursorIdx, u) => {
      if (cursorIdx == null || u.cursor.left < 0) { tip.hidden = true; ring.hidden = true; return; }
      const {idx, y} = u === charts?.charts[0] ? nearestMarker(u, data, cursorIdx) : {idx: cursorIdx, y: null};
      const row = data.rows[data.rowOf[idx]];
      replace(tip, ...tooltipContent(row).filter(Boolean));
      tip.hidden = false;
      // Beside the cursor, flipped to the left in the right half of the chart.
      const stack = tip.parentElement.getBoundingClientRect();
      const over = u.over.getBoundingClientRect();
      const left = over.left - stack.left + u.cursor.left;
      const right = left > stack.width / 2;
      tip.style.left = right ? '' : `${left + 14}px`;
      tip.style.right = right ? `${stack.width - left + 14}px` : '';
      tip.style.top = `${over.top - stack.top + 6}px`;
      if (y != null) {
        u.over.append(ring);
        ring.style.left = `${u.valToPos(data.x[idx], 'x')}px`;
        ring.style.top = `${u.valToPos(y, 'y')}px`;
        ring.hidden = false;
      } else ring.hidden = true;
    },
  });
  for (const el of [mainEl, waterEl, waveEl]) el.addEventListener('mouseleave', () => { tip.hidden = true; ring.hidden = true; });

  const energy = createEnergyChart(energyEl, summary);
  const annual = createAnnualChart(annualEl, data, models, summary);
  const smallObserver = new ResizeObserver(() => {
    for (const [u, el] of [[energy, energyEl], [annual, annualEl]]) {
      if (u && el.clientWidth && Math.abs(u.width - el.clientWidth) > 1) u.setSize({width: el.clientWidth, height: u.height});
    }
  });
  smallObserver.observe(energyEl);
  smallObserver.observe(annualEl);

  await charts.drawnOnce;
  if (!ctx.isCurrent()) { charts.destroy(); smallObserver.disconnect(); return {}; }
  mainEl.dataset.rows = String(data.counts.rows);
  mainEl.dataset.pointsRaw = String(charts.drawn.raw ?? 0);
  mainEl.dataset.pointsCorrected = String(charts.drawn.corrected ?? 0);
  mainEl.dataset.pointsRejected = String(charts.drawn.rejected ?? 0);
  waterEl.dataset.points = String(charts.drawn.water ?? 0);
  waveEl.dataset.points = String(charts.drawn.wave ?? 0);
  const {min, max} = charts.window();
  showWindow(min, max);

  const from = parseDay(query.get('from') || ''), to = parseDay(query.get('to') || '');
  if (from != null && to != null && to > from) charts.setWindow(from, to);
  performance.mark('strandline:chart-drawn');
  ctx.markReady();

  return {
    cleanup() {
      clearTimeout(urlTimer);
      smallObserver.disconnect();
      charts.destroy();
      energy?.destroy();
      annual?.destroy();
    },
  };
}
