// Cautions: the fixed notice on every view, the site's list from the summary and a
// transect's own list where they apply.
import {h} from './dom.js';

export const NOTICE = 'Corrected shorelines are estimates: validate against field surveys before use; ' +
  'not a substitute for site investigation; defer to local coastal-management codes and licensed ' +
  'professional practice.';

/** The site's (or a transect's) cautions as a list panel; nothing when empty. */
export function cautionList(title, items, testid) {
  if (!Array.isArray(items) || items.length === 0) return null;
  return h('section', {class: 'panel cautions', 'aria-label': title, 'data-testid': testid},
    h('h2', {class: 'panel-title'}, title),
    h('ul', {}, items.map((text) => h('li', {}, text))));
}
