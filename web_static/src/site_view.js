// Site view: the plan with the chosen statistic, the latest run, the cautions and the
// sortable summary table. Statistic and sort order are kept in the URL.
import {h, s as svgEl, errorBox, replace} from './dom.js';
import {apiPath, getJson} from './api.js';
import {href, replaceQuery} from './router.js';
import {createPlan} from './plan_drawing.js';
import {summaryTable, sortKeyOrDefault} from './summary_table.js';
import {mountRunPanel} from './run_panel.js';
import {cautionList} from './cautions.js';
import {STATS, statOrDefault} from './stats.js';
import {num} from './format.js';

function legendSample(kind) {
  const svg = svgEl('svg', {width: 34, height: 14, viewBox: '0 0 34 14', 'aria-hidden': 'true', class: 'legend-sample'});
  if (kind === 'seaward') svg.append(svgEl('path', {class: 'glyph glyph-seaward', d: 'M2 5.4H24V2L32 7L24 12V8.6H2Z'}));
  else if (kind === 'landward') svg.append(svgEl('path', {class: 'glyph glyph-landward', d: 'M32 5.4H10V2L2 7L10 12V8.6H32Z'}));
  else if (kind === 'lollipop') svg.append(svgEl('g', {class: 'glyph glyph-current'}, svgEl('line', {x1: 2, y1: 7, x2: 27, y2: 7}), svgEl('circle', {cx: 28, cy: 7, r: 3.6})));
  else if (kind === 'ok') svg.append(svgEl('circle', {class: 'origin origin-ok', cx: 17, cy: 7, r: 3.8}));
  else if (kind === 'weak') svg.append(svgEl('circle', {class: 'origin origin-weak', cx: 17, cy: 7, r: 3.8}));
  else if (kind === 'none') svg.append(svgEl('path', {class: 'origin origin-none', d: 'M13.5 3.5L20.5 10.5M13.5 10.5L20.5 3.5'}));
  else if (kind === 'shore') svg.append(svgEl('line', {class: 'plan-shoreline', x1: 2, y1: 7, x2: 32, y2: 7}));
  else if (kind === 'novalue') svg.append(svgEl('rect', {class: 'glyph glyph-none', x: 14, y: 4, width: 6, height: 6}));
  return svg;
}

function planLegend(stat, plan) {
  const def = STATS[stat];
  const extreme = plan.extreme();
  const glyphs = def.signed
    ? [h('li', {}, legendSample('seaward'), 'seaward (advance)'), h('li', {}, legendSample('landward'), 'landward (retreat)')]
    : [h('li', {}, legendSample('lollipop'), def.label)];
  return h('div', {class: `plan-legend stat-${stat}`},
    h('p', {}, def.describe, extreme ? ` Longest: ${def.format(extreme.value)} (${extreme.id}).` : ''),
    h('ul', {class: 'legend-list'},
      glyphs,
      h('li', {}, legendSample('novalue'), 'no value'),
      h('li', {}, legendSample('shore'), 'mean shoreline (trend intercept)'),
      h('li', {}, legendSample('ok'), 'slope fixed or estimated'),
      h('li', {}, legendSample('weak'), 'default or not identifiable'),
      h('li', {}, legendSample('none'), 'no slope')));
}

export async function renderSiteView(main, {site}, query, ctx) {
  let stat = statOrDefault(query.get('stat'));
  let sort = sortKeyOrDefault(query.get('sort'));
  let dir = query.get('dir') === 'desc' ? 'desc' : 'asc';

  const [siteObj, transects, summary] = await Promise.all([
    getJson(apiPath('v1', 'sites', site)),
    getJson(apiPath('v1', 'sites', site, 'transects')),
    getJson(apiPath('v1', 'sites', site, 'summary')).catch((err) => (err.status === 404 ? null : Promise.reject(err))),
  ]);
  if (!ctx.isCurrent()) return {};
  ctx.setTitle(siteObj.name || site);
  ctx.setCrumbs([{label: siteObj.name || site}]);

  const features = transects.features || [];
  let summaries = new Map((summary?.transects || []).map((t) => [t.transect_id, t.summary]));
  const hrefOf = (id) => href.transect(site, id);

  const select = h('select', {id: 'stat-select', 'data-testid': 'stat-select'},
    Object.entries(STATS).map(([key, def]) => h('option', {value: key, selected: key === stat}, def.label)));
  const planBox = h('div', {class: 'plan', 'data-testid': 'plan'});
  const legendBox = h('div', {});
  const tableBox = h('div', {});
  const runBox = h('section', {class: 'panel run-panel', 'data-testid': 'run-panel', 'aria-label': 'Processing runs'});
  const cautionBox = h('div', {});
  const latest = h('p', {class: 'hint'});

  replace(main, 
    h('header', {class: 'view-head'},
      h('div', {},
        h('h1', {}, siteObj.name || site),
        h('p', {class: 'subtle'}, `Site ${site} · ${siteObj.crs} · reference elevation ${num(siteObj.reference_elevation_m, 2)} m · ` +
          `${features.length} transects`)),
      h('nav', {class: 'view-tabs', 'aria-label': 'Site pages'},
        h('a', {href: href.site(site), 'aria-current': 'page'}, 'Overview'),
        h('a', {href: href.uploads(site)}, 'Uploads'))),
    h('div', {class: 'site-grid'},
      h('section', {class: 'panel plan-panel', 'aria-label': 'Plan of the transects'},
        h('div', {class: 'panel-head'},
          h('h2', {class: 'panel-title'}, 'Plan'),
          h('label', {class: 'inline-field', for: 'stat-select'}, 'Show ', select)),
        planBox, legendBox),
      h('div', {class: 'side-column'}, runBox, cautionBox)),
    h('section', {class: 'panel', 'aria-label': 'Summary per transect'},
      h('div', {class: 'panel-head'}, h('h2', {class: 'panel-title'}, 'Summary per transect'), latest),
      tableBox));

  if (features.length === 0) {
    planBox.append(h('p', {class: 'hint'}, 'This site has no transects yet.'));
  }
  const plan = features.length ? createPlan(planBox, {features, summaries, stat, hrefOf}) : null;

  function drawLegend() { if (plan) replace(legendBox, planLegend(stat, plan)); }
  function drawTable() {
    const order = new Map(features.map((f, i) => [f.properties.transect_id, i]));
    const ids = new Set([...order.keys(), ...summaries.keys()]);
    const rows = [...ids].map((id) => ({id, order: order.get(id) ?? order.size, s: summaries.get(id)}));
    replace(tableBox, ...summaryTable({rows, sort, dir, hrefOf,
      onSort: (key, nextDir) => { sort = key; dir = nextDir; replaceQuery({sort, dir}); drawTable(); },
      onHover: (id) => plan?.highlight(id)}));
  }
  function drawCautions(doc) {
    replace(cautionBox, cautionList('Cautions for this site', doc?.cautions, 'site-cautions'));
    latest.textContent = doc?.latest_run != null ? `Latest run: ${doc.latest_run}` : 'No finished run yet.';
  }

  select.addEventListener('change', () => {
    stat = statOrDefault(select.value);
    replaceQuery({stat});
    plan?.setStat(stat);
    drawLegend();
  });

  drawLegend();
  drawTable();
  drawCautions(summary);
  main.dataset.summaryRun = String(summary?.latest_run ?? '');

  const runs = mountRunPanel(runBox, {site, onRunDone: async () => {
    try {
      const doc = await getJson(apiPath('v1', 'sites', site, 'summary'));
      if (!ctx.isCurrent()) return;
      summaries = new Map(doc.transects.map((t) => [t.transect_id, t.summary]));
      plan?.setSummaries(summaries);
      drawLegend(); drawTable(); drawCautions(doc);
      main.dataset.summaryRun = String(doc.latest_run ?? '');
    } catch (err) {
      runBox.append(errorBox(err.message));
    }
  }});
  await runs.ready;
  ctx.markReady();
  return {cleanup() { runs.cleanup(); plan?.destroy(); }};
}
