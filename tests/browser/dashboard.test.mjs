// Browser test of the dashboard against a running `strandline serve --demo`, driving
// Debian's Chromium through playwright-core (no downloaded browser).
//   node tests/browser/dashboard.test.mjs BASE_URL OUT_DIR [WRITE_KEY]
// WRITE_KEY (or $STRANDLINE_WRITE_KEY) lets the test start a run from the page and,
// when no transect has an estimated slope yet, make one: it retracts the slopes
// upload and stores the slopes again for every transect but one. Prints "ok - ..." /
// "not ok - ..." per check, the closing "N passed, N failed" line, and exits 1 on
// any failure. Screenshots go to OUT_DIR.
import assert from 'node:assert/strict';
import {mkdirSync, mkdtempSync, readFileSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {chromium} from 'playwright-core';

const [base0, outDir, keyArg] = process.argv.slice(2);
if (!base0 || !outDir) {
  console.error('usage: node dashboard.test.mjs BASE_URL OUT_DIR [WRITE_KEY]');
  process.exit(2);
}
const BASE = base0.replace(/\/+$/, '');
const KEY = keyArg || process.env.STRANDLINE_WRITE_KEY || '';
const CHROMIUM = process.env.CHROMIUM || '/usr/bin/chromium';
const CURVE_STEP = 0.0025; // tan β step of the energy curve (slope step parameter curve_step)
mkdirSync(outDir, {recursive: true});

let passed = 0, failed = 0;
async function check(name, fn) {
  try {
    await fn();
    passed++;
    console.log(`ok - ${name}`);
  } catch (err) {
    failed++;
    console.log(`not ok - ${name}`);
    for (const line of String(err?.message ?? err).split('\n').slice(0, 12)) console.log(`  # ${line}`);
  }
}

async function api(path, init) {
  const response = await fetch(BASE + path, init);
  if (!response.ok) throw new Error(`${init?.method ?? 'GET'} ${path}: HTTP ${response.status} ${await response.text()}`);
  return response;
}
const apiJson = async (path, init) => (await api(path, init)).json();
const write = (method, path, body) => apiJson(path, {method,
  headers: {Authorization: `Bearer ${KEY}`, 'Content-Type': 'application/json'}, body: JSON.stringify(body)});

// --- what the server sends with the page
await check('GET / sends Content-Security-Policy and X-Content-Type-Options: nosniff', async () => {
  const response = await api('/');
  const csp = response.headers.get('content-security-policy');
  const nosniff = response.headers.get('x-content-type-options');
  const problems = [];
  if (!csp) problems.push('no Content-Security-Policy header');
  else {
    const directives = new Map(csp.split(';').map((d) => d.trim().split(/\s+/)).filter((d) => d[0]).map(([n, ...v]) => [n, v.join(' ')]));
    const want = {'default-src': "'self'", 'script-src': "'self'", 'style-src': "'self'", 'connect-src': "'self'",
      'object-src': "'none'", 'base-uri': "'none'", 'frame-ancestors': "'none'"};
    for (const [name, value] of Object.entries(want)) {
      if (directives.get(name) !== value) problems.push(`${name} is ${JSON.stringify(directives.get(name))}, expected ${value}`);
    }
  }
  if (nosniff?.toLowerCase() !== 'nosniff') problems.push(`X-Content-Type-Options is ${JSON.stringify(nosniff)}`);
  assert.equal(problems.length, 0, problems.join('; '));
});

// --- the demo's data, read from the API
const sites = (await apiJson('/v1/sites?limit=1000')).items;
const site = sites.find((s) => s.id === 'demo')?.id ?? sites[0]?.id;
assert.ok(site, 'the server holds no site');
const sitePath = `/v1/sites/${encodeURIComponent(site)}`;
const features = (await apiJson(`${sitePath}/transects`)).features;
const transectIds = features.map((f) => f.properties.transect_id);
let summary = await apiJson(`${sitePath}/summary`);
const summaryOf = (id) => summary.transects.find((t) => t.transect_id === id)?.summary;

// --- the browser and everything it does during the session
const profile = mkdtempSync(join(tmpdir(), 'strandline-chromium-'));
const browser = await chromium.launchPersistentContext(profile, {
  executablePath: CHROMIUM,
  headless: true,
  args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-quic', '--no-first-run',
    '--disable-component-update', '--disable-sync'],
  viewport: {width: 1280, height: 800},
  acceptDownloads: true,
});
const consoleProblems = [], pageErrors = [], failedRequests = [], badResponses = [], foreign = [];
const requested = [];
browser.on('request', (request) => {
  const url = request.url();
  requested.push(url);
  if (!(url === BASE || url.startsWith(`${BASE}/`) || url.startsWith('data:') || url.startsWith('blob:'))) foreign.push(url);
});
browser.on('requestfailed', (request) => failedRequests.push(`${request.url()}: ${request.failure()?.errorText}`));
const expectedErrors = new Set(); // URLs a check asks for knowing they are refused
browser.on('response', (response) => {
  if (response.status() >= 400 && !expectedErrors.has(response.url())) badResponses.push(`${response.status()} ${response.url()}`);
});
const page = browser.pages()[0] ?? await browser.newPage();
page.on('console', (message) => {
  if (message.type() !== 'error' && message.type() !== 'warning') return;
  // Chromium logs each refused request; those a check expects are not problems.
  if (expectedErrors.has(message.location()?.url) && /status of 4\d\d/.test(message.text())) return;
  consoleProblems.push(`${message.type()}: ${message.text()} (${message.location()?.url ?? ''})`);
});
page.on('pageerror', (err) => pageErrors.push(err.message));

async function waitReady(view, timeout = 30_000) {
  await page.waitForFunction((v) => document.body.dataset.ready === '1' && document.body.dataset.view === v, view, {timeout});
}
/** Runs action (a navigation) and waits until the view `view` has fully drawn again. */
async function navigate(view, action) {
  await page.evaluate(() => { document.body.dataset.ready = 'stale'; });
  await action();
  await waitReady(view);
}
// Setting the hash it already has fires no hashchange: reload then.
const goHash = (view, h) => navigate(view, async () => {
  if (await page.evaluate(() => location.hash) === h) await page.reload();
  else await page.evaluate((x) => { location.hash = x; }, h);
});
const hash = () => page.evaluate(() => location.hash);
const attr = (selector, name) => page.locator(selector).first().getAttribute(name);
const noOverflow = () => page.evaluate(() => ({scroll: document.documentElement.scrollWidth, inner: innerWidth}));
const shot = (name) => page.screenshot({path: join(outDir, name), fullPage: true});

try {
  // --- site view
  await check('the root address opens the only site (or lists the sites)', async () => {
    await page.goto(`${BASE}/`);
    if (sites.length === 1) {
      await waitReady('site');
      assert.equal(await hash(), `#/sites/${site}`);
    } else {
      await waitReady('sites');
      await navigate('site', () => page.click(`a[href="#/sites/${site}"]`));
    }
  });

  await check(`the site view draws every transect (${transectIds.length}) in the plan and the table`, async () => {
    const drawn = await page.$$eval('[data-testid="plan"] .transect', (els) => els.map((e) => e.dataset.transectId));
    assert.deepEqual([...drawn].sort(), [...transectIds].sort());
    const rows = await page.$$eval('[data-testid="summary-table"] tbody tr', (els) => els.map((e) => e.dataset.transectId));
    assert.deepEqual([...rows].sort(), [...transectIds].sort());
    assert.equal(await attr('[data-testid="plan"]', 'data-transects'), String(transectIds.length));
    assert.ok(await page.locator('[data-testid="scale-bar"]').count(), 'no scale bar');
    assert.ok(await page.locator('.north-arrow').count(), 'no north arrow');
  });

  await check('the caution notice and the site cautions are shown', async () => {
    const notice = await page.textContent('[data-testid="notice"]');
    for (const part of ['validate against field surveys', 'not a substitute for site investigation',
      'defer to local coastal-management codes and licensed professional practice']) assert.ok(notice.includes(part), `notice lacks "${part}"`);
    const items = await page.$$eval('[data-testid="site-cautions"] li', (els) => els.map((e) => e.textContent));
    assert.deepEqual(items, summary.cautions);
  });
  await shot('site-1280.png');

  await check('the statistic selector redraws the plan and is kept in the URL', async () => {
    for (const stat of ['slope', 'rejected', 'seasonal', 'trend']) {
      await page.selectOption('[data-testid="stat-select"]', stat);
      assert.equal(await attr('[data-testid="plan"]', 'data-stat'), stat);
      assert.ok((await hash()).includes(`stat=${stat}`), `hash ${await hash()} lacks stat=${stat}`);
    }
    await page.selectOption('[data-testid="stat-select"]', 'seasonal');
    await page.reload();
    await waitReady('site');
    assert.equal(await page.inputValue('[data-testid="stat-select"]'), 'seasonal');
    assert.equal(await attr('[data-testid="plan"]', 'data-stat'), 'seasonal');
  });

  await check('the summary table sorts by a column both ways (kept in the URL)', async () => {
    const values = () => page.$$eval('[data-testid="summary-table"] tbody tr', (els) => els.map((e) => e.dataset.sortValue));
    await page.click('button.sort[data-sort="trend"]');
    const up = (await values()).filter((v) => v !== '').map(Number);
    assert.deepEqual(up, [...up].sort((a, b) => a - b));
    await page.click('button.sort[data-sort="trend"]');
    const down = (await values()).filter((v) => v !== '').map(Number);
    assert.deepEqual(down, [...down].sort((a, b) => b - a));
    assert.ok((await hash()).includes('sort=trend') && (await hash()).includes('dir=desc'), await hash());
    const expected = summary.transects.map((t) => t.summary.trend?.rate_m_per_yr).filter((v) => v != null).sort((a, b) => b - a);
    assert.deepEqual(down, expected);
  });

  // --- a run from the page (needs the write key)
  let rejectedUpload = null;
  await check('with a write key (kept in sessionStorage only) the page starts a run and follows it to done', async () => {
    assert.ok(KEY, 'no write key given (third argument or STRANDLINE_WRITE_KEY)');
    assert.ok(await page.isDisabled('[data-testid="start-run"]'), 'start is enabled without a key');
    if (!summary.transects.some((t) => t.summary.slope_source === 'estimated')) {
      // Keep every transect's slope but the first one's, so the next run estimates that one.
      const uploads = (await apiJson(`${sitePath}/uploads?limit=1000`)).items;
      for (const u of uploads.filter((x) => x.kind === 'slopes' && !x.retraction && x.inserted > 0)) {
        await api(`${sitePath}/uploads/${u.upload_id}?reason=${encodeURIComponent('browser test: estimate one slope')}`,
          {method: 'DELETE', headers: {Authorization: `Bearer ${KEY}`}});
      }
      const slopes = summary.transects.slice(1).filter((t) => t.summary.slope_source === 'fixed')
        .map((t) => ({transect_id: t.transect_id, slope: t.summary.slope, slope_sigma: t.summary.slope_sigma}));
      if (slopes.length) await write('POST', `${sitePath}/slopes`, {slopes});
    }
    // An upload with rejected rows, for the uploads view.
    const report = await write('POST', `${sitePath}/slopes?on_invalid=skip`,
      {slopes: [{transect_id: 'NO-SUCH-TRANSECT', slope: 0.1}, {transect_id: transectIds[0], slope: -1}]});
    rejectedUpload = report.upload_id;

    const before = Number(await attr('[data-testid="run-panel"]', 'data-run-id')) || 0;
    await page.fill('[data-testid="key-input"]', KEY);
    await page.press('[data-testid="key-input"]', 'Enter');
    assert.equal(await page.evaluate(() => sessionStorage.getItem('strandline.writeKey')), KEY);
    const local = await page.evaluate(() => Object.keys(localStorage).map((k) => localStorage.getItem(k)).join('\n'));
    assert.ok(!local.includes(KEY), 'the key is in localStorage');
    assert.ok(!page.url().includes(KEY), 'the key is in the URL');
    assert.equal(await page.inputValue('[data-testid="key-input"]'), '', 'the key stays in the field');
    await page.click('[data-testid="start-run"]');
    await page.waitForFunction((b) => Number(document.querySelector('[data-testid="run-panel"]').dataset.runId) > b, before, {timeout: 10_000});
    const runId = Number(await attr('[data-testid="run-panel"]', 'data-run-id'));
    await page.waitForFunction(() => ['done', 'failed'].includes(document.querySelector('[data-testid="run-panel"]').dataset.runState),
      null, {timeout: 180_000});
    assert.equal(await attr('[data-testid="run-panel"]', 'data-run-state'), 'done', await page.textContent('[data-testid="run-panel"]'));
    assert.equal(await page.$eval('[data-testid="run-progress"]', (p) => p.value), 1);
    await page.waitForFunction((id) => document.getElementById('view').dataset.summaryRun === String(id), runId, {timeout: 10_000});
    summary = await apiJson(`${sitePath}/summary`);
    assert.equal(summary.latest_run, runId);
  });

  await check('"Forget key" clears the key and disables starting runs', async () => {
    await page.click('[data-testid="forget-key"]');
    assert.equal(await page.evaluate(() => sessionStorage.getItem('strandline.writeKey')), null);
    assert.ok(await page.isDisabled('[data-testid="start-run"]'));
  });

  // --- transect view
  const estimated = summary.transects.find((t) => t.summary.slope_source === 'estimated' && t.summary.slope_details?.energy_curve);
  const fixed = summary.transects.find((t) => t.summary.slope_source === 'fixed');
  const target = estimated?.transect_id ?? transectIds[0];
  const seriesPath = `${sitePath}/transects/${encodeURIComponent(target)}/series`;
  const rows = (await apiJson(`${seriesPath}?format=json`)).rows;

  await check(`a click on ${target} in the plan opens its transect view`, async () => {
    await navigate('transect', () => page.click(`[data-testid="plan"] .transect[data-transect-id="${target}"] .transect-hit`, {force: true}));
    assert.equal(await hash(), `#/sites/${site}/transects/${target}`);
  });

  await check(`the time chart draws every row of the series (${rows.length}) and each rejected row once`, async () => {
    const chart = '[data-testid="time-chart"]';
    assert.equal(Number(await attr(chart, 'data-rows')), rows.length);
    assert.equal(Number(await attr(chart, 'data-points-raw')), rows.filter((r) => r.chainage_raw_m != null).length);
    const rejected = rows.filter((r) => r.accepted === false).length;
    assert.ok(rejected > 0, 'the series has no rejected row to check');
    assert.equal(Number(await attr(chart, 'data-points-rejected')), rejected);
    assert.equal(Number(await attr(chart, 'data-points-corrected')), rows.filter((r) => r.accepted && r.chainage_m != null).length);
    assert.equal(Number(await attr('[data-testid="water-chart"]', 'data-points')), rows.filter((r) => r.water_level_m != null).length);
    assert.equal(Number(await attr('[data-testid="wave-chart"]', 'data-points')), rows.filter((r) => r.wave_level_m != null).length);
    assert.equal(await page.locator(`${chart} canvas`).count(), 1);
  });

  await check('hovering a rejected point shows its reasons (chart window from the URL)', async () => {
    // A window of ±30 days around the point (shared through the URL) spreads the points apart.
    const point = rows.find((r) => !r.accepted && r.flags.some((f) => f !== 'tide_predicted'));
    const day = 86400_000, t = Date.parse(point.time);
    const from = Math.floor((t - 30 * day) / day) * day, to = Math.floor((t + 30 * day) / day) * day;
    const iso = (ms) => new Date(ms).toISOString().slice(0, 10);
    await goHash('transect', `#/sites/${site}/transects/${target}?from=${iso(from)}&to=${iso(to)}`);
    assert.equal(await page.textContent('[data-testid="window-text"]'), `${iso(from)} to ${iso(to)}`);
    await page.locator('[data-testid="time-chart"]').scrollIntoViewIfNeeded();
    const box = await page.locator('[data-testid="time-chart"] .u-over').boundingBox();
    await page.mouse.move(box.x + ((t - from) / (to - from)) * box.width, box.y + box.height / 2);
    await page.waitForSelector('[data-testid="chart-tip"]:not([hidden])', {timeout: 5000});
    const text = await page.textContent('[data-testid="chart-tip"]');
    assert.ok(text.includes('rejected') && text.includes(point.image_id), text);
    for (const flag of point.flags) assert.ok(text.includes(flag.replaceAll('_', ' ')), `tooltip lacks ${flag}: ${text}`);
    await page.mouse.move(2, 2);
    await goHash('transect', `#/sites/${site}/transects/${target}`);
  });

  await check('the energy curve\'s drawn minimum is at the estimated slope (within one curve step)', async () => {
    assert.ok(estimated, 'no transect has an estimated slope with an energy curve');
    const s = estimated.summary;
    const atMin = Number(await attr('[data-testid="energy-chart"]', 'data-energy-min-tan-beta'));
    assert.equal(Number(await attr('[data-testid="energy-chart"]', 'data-energy-points')), s.slope_details.energy_curve.tan_beta.length);
    assert.ok(Math.abs(atMin - s.slope) <= CURVE_STEP + 1e-9, `minimum at ${atMin}, slope ${s.slope}`);
    assert.equal(await page.locator('[data-testid="energy-chart"] canvas').count(), 1);
  });

  await check('zoom and pan change the chart window, which the URL keeps', async () => {
    const full = await page.textContent('[data-testid="window-text"]');
    await page.click('[data-testid="zoom-in"]');
    await page.click('[data-testid="pan-left"]');
    const zoomed = await page.textContent('[data-testid="window-text"]');
    assert.notEqual(zoomed, full);
    await page.waitForFunction(() => location.hash.includes('from=') && location.hash.includes('to='), null, {timeout: 5000});
    const counted = Number(await attr('[data-testid="time-chart"]', 'data-points-rejected'));
    await page.reload();
    await waitReady('transect');
    assert.equal(await page.textContent('[data-testid="window-text"]'), zoomed);
    assert.equal(Number(await attr('[data-testid="time-chart"]', 'data-points-rejected')), counted, 'counts are of the whole record');
    await page.click('[data-testid="zoom-reset"]');
    await page.waitForFunction(() => !location.hash.includes('from='), null, {timeout: 5000});
    assert.equal(await page.textContent('[data-testid="window-text"]'), full);
  });

  await check('"Download CSV" saves exactly the bytes of series?format=csv', async () => {
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-testid="download-csv"]')]);
    assert.equal(download.suggestedFilename(), `${site}-${target}.csv`);
    const saved = readFileSync(await download.path());
    const served = Buffer.from(await (await api(`${seriesPath}?format=csv`)).arrayBuffer());
    assert.ok(served.length > 0);
    assert.ok(saved.equals(served), `saved ${saved.length} bytes, the service sends ${served.length}`);
  });

  await check('"Download PNG" saves a PNG of the charts', async () => {
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-testid="download-png"]')]);
    assert.equal(download.suggestedFilename(), `${site}-${target}.png`);
    const png = readFileSync(await download.path());
    await download.saveAs(join(outDir, 'transect-download.png'));
    assert.ok(png.subarray(0, 8).equals(Buffer.from([137, 80, 78, 71, 13, 10, 26, 10])), 'not a PNG');
    const width = png.readUInt32BE(16), height = png.readUInt32BE(20);
    const chartWidth = (await page.locator('[data-testid="time-chart"] canvas').boundingBox()).width;
    assert.ok(width >= chartWidth && height > 500, `${width}×${height}`);
  });
  await shot('transect-1280.png');

  await check('a transect with a given (fixed) slope says so instead of drawing an energy curve', async () => {
    assert.ok(fixed, 'no transect with a fixed slope');
    await goHash('transect', `#/sites/${site}/transects/${fixed.transect_id}`);
    assert.equal(await attr('[data-testid="energy-chart"]', 'data-energy-state'), 'fixed');
    assert.ok((await page.textContent('[data-testid="energy-message"]')).includes('given'));
    assert.equal(await page.locator('[data-testid="energy-chart"] canvas').count(), 0);
  });

  // --- uploads view
  const uploads = (await apiJson(`${sitePath}/uploads?limit=50`)).items;
  await check(`the uploads view lists the recent uploads (${uploads.length}) with their counts and retractions`, async () => {
    await goHash('site', `#/sites/${site}`);
    await navigate('uploads', () => page.click('nav.view-tabs a[href$="/uploads"]'));
    const shown = await page.$$eval('[data-testid="uploads-table"] tbody tr[data-upload-id]', (els) =>
      els.map((e) => ({id: Number(e.dataset.uploadId), text: e.textContent})));
    assert.deepEqual(shown.map((r) => r.id), uploads.map((u) => u.upload_id));
    for (const u of uploads) {
      const text = shown.find((r) => r.id === u.upload_id).text;
      assert.ok(text.includes(u.inserted.toLocaleString('en-GB')), `upload ${u.upload_id}: inserted ${u.inserted} not shown`);
      if (u.retraction) assert.ok(text.includes('retracted') && text.includes(u.retraction.reason), `upload ${u.upload_id}: retraction not shown`);
    }
  });

  await check('an upload with rejected rows expands to its rejected rows', async () => {
    const withRejected = uploads.find((u) => u.upload_id === rejectedUpload) ?? uploads.find((u) => u.rejected > 0);
    assert.ok(withRejected, 'no upload with rejected rows');
    const detail = await apiJson(`${sitePath}/uploads/${withRejected.upload_id}`);
    const row = `tr[data-upload-id="${withRejected.upload_id}"]`;
    await page.click(`${row} [data-testid="expand-upload"]`);
    const cell = page.locator(`${row} + tr [data-testid="upload-detail"]`);
    await cell.and(page.locator('[data-loaded="1"]')).waitFor({timeout: 10_000});
    const listed = Array.isArray(detail.rejected_rows) ? detail.rejected_rows : [];
    assert.equal(Number(await cell.getAttribute('data-rejected-shown')), listed.length);
    assert.equal(await cell.locator('[data-testid="rejected-rows"] tbody tr').count(), listed.length);
    for (const r of listed) assert.ok((await cell.textContent()).includes(r.reason), `reason "${r.reason}" not shown`);
    if (!listed.length) assert.ok((await cell.textContent()).includes('does not list them'), await cell.textContent());
  });

  await check('GET …/uploads/{id} lists the rejected rows of an upload (rejected_rows)', async () => {
    assert.ok(rejectedUpload, 'no upload with rejected rows was made (needs the write key)');
    const detail = await apiJson(`${sitePath}/uploads/${rejectedUpload}`);
    assert.equal(detail.rejected_rows?.length, detail.rejected, JSON.stringify(detail));
  });
  await shot('uploads-1280.png');

  await check('Back returns to the previous view', async () => {
    await navigate('site', () => page.goBack());
    assert.equal(await hash(), `#/sites/${site}`);
  });

  await check('an unknown site or transect shows the service\'s problem as "title: detail"', async () => {
    for (const tail of ['', '/transects', '/summary']) expectedErrors.add(`${BASE}/v1/sites/no-such-site${tail}`);
    await goHash('site', '#/sites/no-such-site');
    const siteProblem = await (await fetch(`${BASE}/v1/sites/no-such-site`)).json();
    assert.equal(await page.textContent('[data-testid="error"]'), `${siteProblem.title}: ${siteProblem.detail}`);
    expectedErrors.add(`${BASE}${sitePath}/transects/NO-SUCH-TRANSECT/series?format=json`);
    await goHash('transect', `#/sites/${site}/transects/NO-SUCH-TRANSECT`);
    assert.match(await page.textContent('[data-testid="error"]'), /^Not found: transect "NO-SUCH-TRANSECT"/);
  });

  // --- phone width
  await page.setViewportSize({width: 390, height: 844});
  for (const [view, h, name] of [['site', `#/sites/${site}`, 'site-390.png'],
    ['transect', `#/sites/${site}/transects/${target}`, 'transect-390.png'],
    ['uploads', `#/sites/${site}/uploads`, 'uploads-390.png']]) {
    await check(`at 390×844 the ${view} view has no horizontal overflow`, async () => {
      await goHash(view, h);
      await page.waitForTimeout(200); // charts follow the width through a ResizeObserver
      const {scroll, inner} = await noOverflow();
      assert.ok(scroll <= inner, `scrollWidth ${scroll} > innerWidth ${inner}`);
      await shot(name);
    });
  }
} finally {
  // --- the whole session
  await check('no console error or warning, no uncaught error', async () => {
    assert.deepEqual([...consoleProblems, ...pageErrors], []);
  });
  await check('no failed request and no reply with status >= 400', async () => {
    assert.deepEqual([...failedRequests, ...badResponses], []);
  });
  await check(`no request left the server (${requested.length} requests)`, async () => {
    assert.ok(requested.length > 0);
    assert.deepEqual(foreign, []);
  });
  await browser.close();
  rmSync(profile, {recursive: true, force: true});
  console.log(`${passed} passed, ${failed} failed`);
  process.exitCode = failed ? 1 : 0;
}
