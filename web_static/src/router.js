// Hash routes, so every view has a shareable URL that the server never has to know:
//   #/                                  site list
//   #/sites/{site}                      site view      (?stat=, ?sort=, ?dir=)
//   #/sites/{site}/transects/{id}       transect view  (?from=, ?to= chart window)
//   #/sites/{site}/uploads              uploads view
// View state lives in the hash's query; changing it replaces the history entry
// instead of re-rendering.

export function parseHash(hash = location.hash) {
  const text = hash.replace(/^#/, '');
  const q = text.indexOf('?');
  const pathText = q < 0 ? text : text.slice(0, q);
  const query = new URLSearchParams(q < 0 ? '' : text.slice(q + 1));
  const parts = pathText.split('/').filter(Boolean).map((p) => {
    try { return decodeURIComponent(p); } catch { return p; }
  });
  return {parts, query};
}

export function matchRoute(parts) {
  if (parts.length === 0) return {name: 'sites', params: {}};
  if (parts[0] === 'sites' && parts.length === 2) return {name: 'site', params: {site: parts[1]}};
  if (parts[0] === 'sites' && parts.length === 3 && parts[2] === 'uploads') {
    return {name: 'uploads', params: {site: parts[1]}};
  }
  if (parts[0] === 'sites' && parts.length === 4 && parts[2] === 'transects') {
    return {name: 'transect', params: {site: parts[1], transect: parts[3]}};
  }
  return {name: 'not-found', params: {}};
}

function queryText(query) {
  const entries = Object.entries(query || {}).filter(([, v]) => v != null && v !== '');
  return entries.length ? '?' + new URLSearchParams(entries).toString() : '';
}

export const href = {
  sites: () => '#/',
  site: (site, query) => `#/sites/${encodeURIComponent(site)}${queryText(query)}`,
  transect: (site, transect, query) =>
    `#/sites/${encodeURIComponent(site)}/transects/${encodeURIComponent(transect)}${queryText(query)}`,
  uploads: (site) => `#/sites/${encodeURIComponent(site)}/uploads`,
};

/** Sets (or, with null, removes) query keys of the current hash without a re-render. */
export function replaceQuery(updates) {
  const {query} = parseHash();
  for (const [key, value] of Object.entries(updates)) {
    if (value == null || value === '') query.delete(key); else query.set(key, String(value));
  }
  const base = location.hash.replace(/^#/, '').split('?')[0] || '/';
  const text = query.toString();
  history.replaceState(history.state, '', `#${base}${text ? '?' + text : ''}`);
}

/** Calls render(route, query) now and on every hash change. */
export function startRouter(render) {
  const go = () => {
    const {parts, query} = parseHash();
    render(matchRoute(parts), query);
  };
  window.addEventListener('hashchange', go);
  go();
}
