// Entry module: the page frame (breadcrumbs, the caution notice) and the router that
// swaps views. Each view gets a context to set its title and breadcrumbs and to say
// when it has fully drawn (document.body.dataset.ready = "1", a test and benchmark hook).
import {h, errorBox, replace} from './dom.js';
import {ApiError} from './api.js';
import {startRouter, href} from './router.js';
import {NOTICE} from './cautions.js';
import {renderSitesView} from './sites_view.js';
import {renderSiteView} from './site_view.js';
import {renderTransectView} from './transect_view.js';
import {renderUploadsView} from './uploads_view.js';

const VIEWS = {
  sites: renderSitesView,
  site: renderSiteView,
  transect: renderTransectView,
  uploads: renderUploadsView,
};

const main = document.getElementById('view');
const crumbs = document.getElementById('crumbs');
document.getElementById('notice').textContent = NOTICE;

let generation = 0;
let current = {cleanup() {}};

function setCrumbs(items) {
  const trail = [h('li', {}, h('a', {href: href.sites()}, 'Sites'))];
  items.forEach((item, i) => {
    const last = i === items.length - 1;
    trail.push(h('li', {}, item.href && !last ? h('a', {href: item.href}, item.label)
      : h('span', {'aria-current': last ? 'page' : null}, item.label)));
  });
  replace(crumbs, ...trail);
}

async function render(route, query) {
  const mine = ++generation;
  try { current.cleanup?.(); } catch { /* a view's cleanup must not block the next view */ }
  current = {cleanup() {}};
  document.body.dataset.ready = '0';
  document.body.dataset.view = route.name;
  const ctx = {
    isCurrent: () => mine === generation,
    setTitle: (title) => { if (mine === generation) document.title = `${title} · Strandline`; },
    setCrumbs: (items) => { if (mine === generation) setCrumbs(items); },
    markReady: () => {
      if (mine !== generation) return;
      document.body.dataset.ready = '1';
      performance.mark(`strandline:ready:${route.name}`);
    },
  };
  replace(main, h('p', {class: 'loading', 'aria-live': 'polite'}, 'Loading…'));
  const view = VIEWS[route.name];
  if (!view) {
    ctx.setTitle('Not found');
    ctx.setCrumbs([{label: 'Not found'}]);
    replace(main, h('section', {class: 'panel'}, h('h1', {}, 'No such page'),
      h('p', {}, 'The address names no view of this dashboard. ', h('a', {href: href.sites()}, 'Back to the sites.'))));
    ctx.markReady();
    return;
  }
  try {
    const result = await view(main, route.params, query, ctx);
    if (mine === generation) current = result || current;
    else result?.cleanup?.();
  } catch (err) {
    if (mine !== generation) return;
    if (!(err instanceof ApiError)) console.error(err); // a bug, not a reply of the service
    replace(main, h('section', {class: 'panel'}, errorBox(err.message)));
    ctx.markReady();
  }
}

startRouter(render);
