// The service's JSON API. Errors are RFC 7807 problem documents: the message shown
// to the user is "title: detail".

export class ApiError extends Error {
  constructor(status, title, detail, problem) {
    super(detail ? `${title}: ${detail}` : title);
    this.status = status;
    this.problem = problem;
  }
}

/** Path from segments, each percent-encoded: apiPath('v1', 'sites', id). */
export function apiPath(...segments) {
  return '/' + segments.map(encodeURIComponent).join('/');
}

async function problemOf(response) {
  let body = null;
  const type = response.headers.get('Content-Type') || '';
  if (type.includes('json')) {
    try { body = await response.json(); } catch { body = null; }
  }
  const title = (body && body.title) || `HTTP ${response.status}`;
  const detail = (body && body.detail) || response.statusText || '';
  return new ApiError(response.status, title, detail, body);
}

async function request(path, init) {
  let response;
  try {
    response = await fetch(path, init);
  } catch (err) {
    throw new ApiError(0, 'Network error', `the service did not answer (${err.message})`, null);
  }
  if (!response.ok) throw await problemOf(response);
  return response;
}

export async function getJson(path) {
  const response = await request(path, {headers: {Accept: 'application/json'}});
  return response.json();
}

/** The reply's exact bytes (for downloads that must equal the service's document). */
export async function getBlob(path) {
  const response = await request(path, {});
  return response.blob();
}

/** A write: JSON body, Bearer key. */
export async function sendJson(method, path, body, key) {
  const response = await request(path, {
    method,
    headers: {'Content-Type': 'application/json', Accept: 'application/json', Authorization: `Bearer ${key}`},
    body: JSON.stringify(body ?? {}),
  });
  return response.json();
}

/** Every item of a paged list (follows next_cursor), at most `cap` items. */
export async function getAllPages(path, cap = 5000) {
  const items = [];
  let cursor = null;
  do {
    const sep = path.includes('?') ? '&' : '?';
    const page = await getJson(cursor ? `${path}${sep}cursor=${encodeURIComponent(cursor)}` : path);
    items.push(...page.items);
    cursor = page.next_cursor;
  } while (cursor && items.length < cap);
  return items;
}
