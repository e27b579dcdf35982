// Element builders. Attributes go through setAttribute, events through
// addEventListener; a `style` attribute is refused because the Content-Security-Policy
// (style-src 'self') would block it: use classes, or el.style.prop from code.

const SVG_NS = 'http://www.w3.org/2000/svg';

function apply(el, attrs) {
  for (const [name, value] of Object.entries(attrs || {})) {
    if (value == null || value === false) continue;
    if (name === 'style') throw new Error('inline style attributes are not allowed (CSP)');
    if (name === 'on') {
      for (const [type, fn] of Object.entries(value)) el.addEventListener(type, fn);
    } else if (name === 'text') {
      el.textContent = value;
    } else {
      el.setAttribute(name, value === true ? '' : String(value));
    }
  }
}

function append(el, children) {
  for (const child of children.flat(Infinity)) {
    if (child == null || child === false) continue;
    el.append(child instanceof Node ? child : document.createTextNode(String(child)));
  }
}

/** h('a', {href: '#/', class: 'x'}, 'text', child, [more]) */
export function h(tag, attrs, ...children) {
  const el = document.createElement(tag);
  apply(el, attrs);
  append(el, children);
  return el;
}

/** The same for SVG elements. */
export function s(tag, attrs, ...children) {
  const el = document.createElementNS(SVG_NS, tag);
  apply(el, attrs);
  append(el, children);
  return el;
}

export function clear(el) {
  while (el.firstChild) el.removeChild(el.firstChild);
  return el;
}

/** Replaces el's children; arrays are flattened and null/false skipped, as in h(). */
export function replace(el, ...children) {
  clear(el);
  append(el, children);
  return el;
}

/** A message box for an error (role=alert so screen readers announce it). */
export function errorBox(message) {
  return h('p', {class: 'error', role: 'alert', 'data-testid': 'error'}, message);
}

/** Saves a Blob under a file name through a temporary object URL. */
export function saveBlob(blob, filename) {
  const url = URL.createObjectURL(blob);
  const a = h('a', {href: url, download: filename, class: 'hidden-link'});
  document.body.append(a);
  a.click();
  a.remove();
  // Revoke later: the download may read the URL after click() returns.
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
}
