// Benchmark (not a test): time to first draw of the dashboard's transect view for a
// 3,000-image series, in Debian's Chromium through playwright-core.
//   node tests/bench/dashboard_first_draw.mjs BASE_URL WRITE_KEY [LOADS]
// (run it with tests/browser/node_modules on the module path, e.g. from tests/browser:
//   cd tests/browser && node ../bench/dashboard_first_draw.mjs http://127.0.0.1:PORT sl_...)
// It creates a site of its own (bench-3k-<time>) with one transect, uploads 3,000
// synthetic observations with water levels around each image time, runs it (the slope
// is estimated), then loads the transect view LOADS times (default 7), each in a fresh
// browser context (no HTTP cache), and reports the median time from navigation start
// to the "strandline:chart-drawn" mark (all three time charts drawn).
import {createRequire} from 'node:module';
import {join, dirname} from 'node:path';
import {fileURLToPath} from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const require = createRequire(join(here, '../browser/package.json'));
const {chromium} = require('playwright-core');

const [base0, key, loadsArg] = process.argv.slice(2);
if (!base0 || !key) {
  console.error('usage: node tests/bench/dashboard_first_draw.mjs BASE_URL WRITE_KEY [LOADS]');
  process.exit(2);
}
const BASE = base0.replace(/\/+$/, '');
const LOADS = Number(loadsArg || 7);
const IMAGES = 3000;
const SITE = `bench-3k-${Date.now().toString(36)}`;

async function call(method, path, body, type = 'application/json') {
  const response = await fetch(BASE + path, {method,
    headers: {Authorization: `Bearer ${key}`, 'Content-Type': type}, body: body == null ? undefined : JSON.stringify(body)});
  if (!response.ok) throw new Error(`${method} ${path}: HTTP ${response.status} ${await response.text()}`);
  return response.json();
}

// --- a synthetic transect: trend, annual cycle, tide seen through a 0.08 slope, noise
let seed = 20261203;
const random = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
const gauss = () => Math.sqrt(-2 * Math.log(random() + 1e-12)) * Math.cos(2 * Math.PI * random());
const tide = (ms) => {
  const h = ms / 3_600_000;
  return 1.1 * Math.cos((2 * Math.PI * h) / 12.4206) + 0.4 * Math.cos((2 * Math.PI * h) / 12.0 + 1.0);
};
const SLOPE = 0.08, START = Date.UTC(2004, 0, 1, 10), STEP = 2.9 * 86_400_000;
const iso = (ms) => new Date(Math.round(ms / 1000) * 1000).toISOString().replace('.000Z', 'Z');
const observations = [], waterLevels = [];
for (let i = 0; i < IMAGES; i++) {
  const t = START + i * STEP + random() * 3_600_000;
  const years = (t - START) / (365.25 * 86_400_000);
  const truth = 220 + 0.6 * years + 8 * Math.cos(2 * Math.PI * years - 5.5);
  const outlier = random() < 0.015 ? (random() < 0.5 ? -1 : 1) * (40 + 60 * random()) : 0;
  observations.push({transect_id: 'T1', time: iso(t), sensor: 'sentinel2a', image_id: `bench_${i}`,
    chainage_m: (truth - tide(t) / SLOPE + 6 * gauss() + outlier).toFixed(2)});
  for (const dt of [-1_200_000, 1_200_000]) waterLevels.push({time: iso(t + dt), level_m: tide(t + dt).toFixed(3)});
}

console.log(`setting up site ${SITE}: ${IMAGES} observations, ${waterLevels.length} water levels`);
await call('POST', '/v1/sites', {id: SITE, name: 'Benchmark: 3,000 images', crs: 'EPSG:32631', reference_elevation_m: 0, default_slope: 0.1});
await call('PUT', `/v1/sites/${SITE}/transects`, {type: 'FeatureCollection',
  crs: {type: 'name', properties: {name: 'urn:ogc:def:crs:EPSG::32631'}},
  features: [{type: 'Feature', properties: {transect_id: 'T1', azimuth_deg: 180, length_m: 500},
    geometry: {type: 'Point', coordinates: [431000, 5902000]}}]});
await call('POST', `/v1/sites/${SITE}/water-levels`, {water_levels: waterLevels});
await call('POST', `/v1/sites/${SITE}/observations`, {observations});
let run = await call('POST', `/v1/sites/${SITE}/runs?transects=all`, {});
const deadline = Date.now() + 600_000;
while (run.state === 'queued' || run.state === 'running') {
  if (Date.now() > deadline) throw new Error(`run ${run.run_id} still ${run.state} after 600 s`);
  await new Promise((r) => setTimeout(r, 500));
  run = await (await fetch(`${BASE}/v1/runs/${run.run_id}`)).json();
}
if (run.state !== 'done') throw new Error(`run ${run.run_id} ${run.state}: ${run.reason}`);

// --- loads of the transect view
const browser = await chromium.launch({executablePath: process.env.CHROMIUM || '/usr/bin/chromium', headless: true,
  args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-quic', '--no-first-run',
    '--disable-component-update', '--disable-sync']});
const url = `${BASE}/#/sites/${SITE}/transects/T1`;
const times = [], drawTimes = [];
let drawn = null;
try {
  for (let i = 0; i <= LOADS; i++) {
    const context = await browser.newContext({viewport: {width: 1280, height: 800}});
    const page = await context.newPage();
    await page.goto(url);
    await page.waitForFunction(() => document.body.dataset.ready === '1' && document.body.dataset.view === 'transect', null, {timeout: 60_000});
    const [ms, afterData] = await page.evaluate(() => {
      const mark = performance.getEntriesByName('strandline:chart-drawn')[0]?.startTime;
      const series = performance.getEntriesByType('resource').find((e) => e.name.includes('/series?format=json'));
      return [mark, mark != null && series ? mark - series.responseEnd : null];
    });
    drawn = await page.evaluate(() => ({...document.querySelector('[data-testid="time-chart"]').dataset}));
    await context.close();
    if (ms == null) throw new Error('the page set no strandline:chart-drawn mark');
    if (i > 0) { times.push(ms); drawTimes.push(afterData); } // the first load warms the server's caches: not counted
  }
} finally {
  await browser.close();
}
const median = (list) => {
  const v = [...list].sort((a, b) => a - b);
  return v.length % 2 ? v[(v.length - 1) / 2] : (v[v.length / 2 - 1] + v[v.length / 2]) / 2;
};
times.sort((a, b) => a - b);
console.log(`series: ${drawn.rows} rows drawn (${drawn.pointsCorrected} corrected, ${drawn.pointsRejected} rejected)`);
console.log(`loads (ms): ${times.map((t) => t.toFixed(0)).join(', ')}`);
// From the series reply's last byte to the drawn charts: parsing, column arrays, the four charts.
console.log(`of which after the series reply arrived (parse, arrays, drawing): median ${median(drawTimes).toFixed(0)} ms`);
console.log(`dashboard first draw, ${IMAGES}-image series: median ${median(times).toFixed(0)} ms over ${times.length} loads ` +
  `(min ${times[0].toFixed(0)}, max ${times[times.length - 1].toFixed(0)}); site ${SITE} left on the server`);
