// The site's latest run with live progress, the write-key field and "start a run".
// While a run is queued or running its state is polled once a second.
import {h, clear, errorBox, replace} from './dom.js';
import {apiPath, getJson, sendJson} from './api.js';
import {getKey, setKey, forgetKey, onKeyChange} from './key_store.js';
import {dateTime, pct} from './format.js';

const POLL_MS = 1000;
const ACTIVE = new Set(['queued', 'running']);

function fractionOf(run) {
  const p = run.progress || {};
  if (Number.isFinite(p.fraction)) return Math.min(Math.max(p.fraction, 0), 1);
  if (run.state === 'done') return 1;
  if (p.transects_total > 0) return p.transects_done / p.transects_total;
  return null;
}

function stageText(run) {
  const p = run.progress;
  if (!p || !p.stage) return null;
  // stage_index counts the run's stages from 1; queued, finished and failed runs are outside them.
  if (run.state === 'running' && Number.isInteger(p.stage_index) && p.stage_index >= 1 && p.stage_index <= p.stage_count) {
    return `stage ${p.stage_index} of ${p.stage_count}: ${p.stage}`;
  }
  return null;
}

function runSummary(run) {
  const p = run.progress || {};
  const fraction = fractionOf(run);
  const progress = h('progress', {max: '1', 'aria-label': `Run ${run.run_id} progress`, 'data-testid': 'run-progress'});
  if (run.state !== 'queued' && fraction != null) progress.value = fraction;
  const t = run.timings || {};
  const when = run.state === 'done' || run.state === 'failed'
    ? `finished ${dateTime(t.finished_at)}`
    : run.state === 'running' ? `started ${dateTime(t.started_at)}` : `queued ${dateTime(t.created_at)}`;
  return h('div', {class: 'run-summary'},
    h('p', {class: 'run-line'},
      h('span', {class: `state state-${run.state}`, 'data-testid': 'run-state'}, run.state),
      ` Run ${run.run_id} · ${run.scope || 'changed'} · ${when}`),
    progress,
    h('p', {class: 'run-detail'},
      p.transects_total != null ? `${p.transects_done ?? 0} of ${p.transects_total} transects` : '',
      fraction != null ? ` (${pct(fraction, 0)})` : '',
      stageText(run) ? ` · ${stageText(run)}` : '',
      run.requested_by ? ` · by ${run.requested_by}` : ''),
    run.state === 'failed' && run.reason ? errorBox(`Run failed: ${run.reason}`) : null);
}

/** Mounts the panel into `container`; onRunDone() after a watched run finishes. Returns cleanup. */
export function mountRunPanel(container, {site, onRunDone}) {
  let timer = null;
  let stopped = false;
  const status = h('div', {class: 'run-status', 'aria-live': 'polite'});
  const message = h('div', {class: 'run-message'});
  const keyInput = h('input', {type: 'password', id: 'write-key', autocomplete: 'off', spellcheck: 'false',
    placeholder: 'sl_…', 'data-testid': 'key-input'});
  const keyNote = h('p', {class: 'hint', 'data-testid': 'key-note'});
  const useKey = h('button', {type: 'submit', class: 'button'}, 'Keep for this tab');
  const forget = h('button', {type: 'button', class: 'button button-quiet', 'data-testid': 'forget-key',
    on: {click: () => { forgetKey(); keyInput.value = ''; }}}, 'Forget key');
  const start = h('button', {type: 'button', class: 'button button-primary', 'data-testid': 'start-run'}, 'Start a run (all transects)');

  const keyForm = h('form', {class: 'key-form', on: {submit: (e) => { e.preventDefault(); setKey(keyInput.value); keyInput.value = ''; }}},
    h('label', {for: 'write-key'}, 'Write key'),
    h('div', {class: 'key-row'}, keyInput, useKey, forget),
    keyNote);

  function showKeyState(key) {
    start.disabled = !key;
    forget.disabled = !key;
    keyNote.textContent = key
      ? 'A key is kept for this browser tab only (session storage); it is sent with writes.'
      : 'Enter a write key to start runs. It is kept for this tab only and never put in the URL.';
    start.title = key ? '' : 'needs a write key';
  }

  function show(run) {
    clear(status);
    container.dataset.runState = run ? run.state : 'none';
    container.dataset.runId = run ? String(run.run_id) : '';
    status.append(run ? runSummary(run) : h('p', {class: 'hint'}, 'No run yet for this site.'));
  }

  function watch(run) {
    clearTimeout(timer);
    show(run);
    if (!ACTIVE.has(run.state)) return;
    timer = setTimeout(async () => {
      if (stopped) return;
      try {
        const next = await getJson(apiPath('v1', 'runs', String(run.run_id)));
        if (stopped) return;
        if (ACTIVE.has(next.state)) { watch(next); return; }
        show(next);
        onRunDone?.(next);
      } catch (err) {
        if (!stopped) { replace(message, errorBox(err.message)); watch(run); }
      }
    }, POLL_MS);
  }

  start.addEventListener('click', async () => {
    const key = getKey();
    if (!key) return;
    start.disabled = true;
    clear(message);
    try {
      const run = await sendJson('POST', `${apiPath('v1', 'sites', site, 'runs')}?transects=all`, {}, key);
      if (!stopped) watch(run);
    } catch (err) {
      replace(message, errorBox(err.message));
    } finally {
      start.disabled = !getKey();
    }
  });

  const unsubscribe = onKeyChange(showKeyState);
  showKeyState(getKey());
  replace(container, 
    h('h2', {class: 'panel-title'}, 'Processing runs'),
    status, start, message, keyForm);

  const ready = getJson(`${apiPath('v1', 'sites', site, 'runs')}?limit=5`).then((page) => {
    if (stopped) return;
    const latest = page.items[0];
    if (latest) watch(latest); else show(null);
  }).catch((err) => { replace(status, errorBox(err.message)); });

  return {
    ready,
    cleanup() { stopped = true; clearTimeout(timer); unsubscribe(); },
  };
}
