// Site list. With a single site there is nothing to choose: go straight to it
// (replacing the history entry so Back does not bounce).
import {h, replace} from './dom.js';
import {getAllPages} from './api.js';
import {href} from './router.js';

export async function renderSitesView(main, params, query, ctx) {
  const sites = await getAllPages('/v1/sites?limit=1000');
  if (!ctx.isCurrent()) return {};
  if (sites.length === 1) {
    location.replace(href.site(sites[0].id));
    return {};
  }
  ctx.setTitle('Sites');
  ctx.setCrumbs([]);
  replace(main, 
    h('header', {class: 'view-head'}, h('h1', {}, 'Sites')),
    sites.length === 0
      ? h('p', {class: 'panel hint'}, 'No site is stored yet. Sites are created through the API (POST /v1/sites).')
      : h('ul', {class: 'site-list', 'data-testid': 'site-list'}, sites.map((site) =>
        h('li', {class: 'panel'},
          h('a', {href: href.site(site.id), class: 'site-link'}, site.name || site.id),
          h('p', {class: 'subtle'}, `${site.id} · ${site.crs}`)))));
  ctx.markReady();
  return {};
}
