// Uploads view: the site's recent uploads with their row counts and retraction state;
// a row expands to its details and rejected rows (fetched on first expansion).
import {h, errorBox, replace} from './dom.js';
import {apiPath, getJson} from './api.js';
import {href} from './router.js';
import {count, dateTime, DASH} from './format.js';

const PAGE = 50;

function statusCell(u) {
  if (u.retraction) {
    const r = u.retraction;
    return h('div', {class: 'stack'},
      h('span', {class: 'badge badge-warn'}, 'retracted'),
      h('span', {class: 'ci'}, `${dateTime(r.at)} by ${r.by ?? DASH}`),
      h('span', {class: 'reason'}, `“${r.reason ?? ''}”`),
      u.purged_at ? h('span', {class: 'ci'}, `rows purged ${dateTime(u.purged_at)}`) : null);
  }
  return h('span', {class: 'badge'}, 'live');
}

function rejectedTable(rows) {
  return h('div', {class: 'table-scroll'},
    h('table', {class: 'data rejected-table', 'data-testid': 'rejected-rows'},
      h('thead', {}, h('tr', {}, ['Where', 'Field', 'Value', 'Reason'].map((t) => h('th', {scope: 'col'}, t)))),
      h('tbody', {}, rows.map((r) => h('tr', {},
        h('td', {}, r.line != null ? `line ${r.line}` : (r.pointer ?? r.crossing ?? DASH)),
        h('td', {}, r.field ?? DASH),
        h('td', {class: 'value'}, r.value == null ? DASH : String(r.value)),
        h('td', {class: 'wrap'}, r.reason ?? DASH))))));
}

async function details(u, cell) {
  const doc = await getJson(apiPath('v1', 'sites', u.site, 'uploads', String(u.upload_id)));
  const rows = Array.isArray(doc.rejected_rows) ? doc.rejected_rows : null;
  cell.dataset.rejectedShown = String(rows ? rows.length : 0);
  replace(cell, 
    h('dl', {class: 'facts facts-compact'},
      h('dt', {}, 'Content type'), h('dd', {}, doc.content_type ?? DASH),
      h('dt', {}, 'SHA-256'), h('dd', {class: 'hash'}, doc.sha256 ?? DASH),
      h('dt', {}, 'Uploaded by'), h('dd', {}, doc.uploaded_by ?? DASH)),
    doc.rejected > 0 && rows && rows.length
      ? [h('p', {}, rows.length < doc.rejected
        ? `Rejected rows (the first ${count(rows.length)} of ${count(doc.rejected)}):` : `Rejected rows (${count(rows.length)}):`),
      rejectedTable(rows)]
      : h('p', {class: 'hint'}, doc.rejected > 0
        ? `${count(doc.rejected)} rows were rejected; this reply does not list them.`
        : 'No row of this upload was rejected.'));
}

function uploadRows(u, site) {
  u.site = site;
  const detailCell = h('td', {colspan: 10, class: 'detail-cell', 'data-testid': 'upload-detail'});
  const detailRow = h('tr', {class: 'detail-row', hidden: true}, detailCell);
  let loaded = false;
  const toggle = h('button', {type: 'button', class: 'expander', 'aria-expanded': 'false',
    'aria-label': `Details of upload ${u.upload_id}`, 'data-testid': 'expand-upload'}, '▸');
  toggle.addEventListener('click', async () => {
    const open = toggle.getAttribute('aria-expanded') !== 'true';
    toggle.setAttribute('aria-expanded', String(open));
    toggle.textContent = open ? '▾' : '▸';
    detailRow.hidden = !open;
    if (open && !loaded) {
      loaded = true;
      detailCell.append(h('p', {class: 'loading'}, 'Loading…'));
      try { await details(u, detailCell); } catch (err) { loaded = false; replace(detailCell, errorBox(err.message)); }
      detailCell.dataset.loaded = '1';
    }
  });
  const main = h('tr', {'data-upload-id': u.upload_id, class: u.retraction ? 'is-retracted' : null},
    h('td', {}, toggle),
    h('th', {scope: 'row', class: 'num'}, String(u.upload_id)),
    h('td', {}, u.kind.replaceAll('_', ' ')),
    h('td', {}, dateTime(u.received_at)),
    h('td', {}, u.uploaded_by ?? DASH),
    h('td', {class: 'num'}, count(u.received)),
    h('td', {class: 'num'}, count(u.inserted)),
    h('td', {class: 'num'}, count(u.duplicates)),
    h('td', {class: u.rejected > 0 ? 'num has-rejected' : 'num', 'data-rejected': u.rejected}, count(u.rejected)),
    h('td', {class: 'wrap'}, statusCell(u)));
  return [main, detailRow];
}

export async function renderUploadsView(main, {site}, query, ctx) {
  const base = apiPath('v1', 'sites', site);
  const [siteObj, first] = await Promise.all([getJson(base), getJson(`${base}/uploads?limit=${PAGE}`)]);
  if (!ctx.isCurrent()) return {};
  const siteName = siteObj.name || site;
  ctx.setTitle(`Uploads · ${siteName}`);
  ctx.setCrumbs([{label: siteName, href: href.site(site)}, {label: 'Uploads'}]);

  const body = h('tbody', {});
  const more = h('button', {type: 'button', class: 'button', hidden: true, 'data-testid': 'more-uploads'}, 'Load older uploads');
  let cursor = null;
  const add = (page) => {
    page.items.forEach((u) => body.append(...uploadRows(u, site)));
    cursor = page.next_cursor;
    more.hidden = !cursor;
  };
  more.addEventListener('click', async () => {
    more.disabled = true;
    try { add(await getJson(`${base}/uploads?limit=${PAGE}&cursor=${encodeURIComponent(cursor)}`)); } catch (err) { more.after(errorBox(err.message)); }
    more.disabled = false;
  });

  replace(main, 
    h('header', {class: 'view-head'},
      h('div', {}, h('h1', {}, 'Uploads'), h('p', {class: 'subtle'}, `${siteName} · newest first`)),
      h('nav', {class: 'view-tabs', 'aria-label': 'Site pages'},
        h('a', {href: href.site(site)}, 'Overview'),
        h('a', {href: href.uploads(site), 'aria-current': 'page'}, 'Uploads'))),
    h('section', {class: 'panel', 'aria-label': 'Uploads'},
      first.items.length === 0 ? h('p', {class: 'hint'}, 'No upload yet for this site.') : null,
      h('p', {class: 'table-note'}, 'Rows received, inserted, duplicates (already stored, unchanged) and rejected (invalid) per upload. ' +
        'A retracted upload\'s rows leave future runs. Expand a row for its details and rejected rows.'),
      h('div', {class: 'table-scroll', tabindex: '0', 'aria-label': 'Uploads (scrolls sideways)'},
        h('table', {class: 'data uploads-table', 'data-testid': 'uploads-table'},
          h('caption', {class: 'sr-only'}, 'Uploads, newest first'),
          h('thead', {}, h('tr', {}, ['', 'Upload', 'Kind', 'Received at', 'By', 'Rows', 'Inserted', 'Duplicates', 'Rejected', 'Status']
            .map((t) => h('th', {scope: 'col'}, t)))),
          body)),
      more));
  add(first);
  ctx.markReady();
  return {};
}
