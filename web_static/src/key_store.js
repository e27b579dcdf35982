// The write key lives only in sessionStorage: it ends with the tab, never goes to
// localStorage or into a URL.

const NAME = 'strandline.writeKey';
const listeners = new Set();

export function getKey() {
  try { return sessionStorage.getItem(NAME) || ''; } catch { return ''; }
}

export function setKey(key) {
  const value = key.trim();
  if (value) sessionStorage.setItem(NAME, value); else sessionStorage.removeItem(NAME);
  listeners.forEach((fn) => fn(getKey()));
}

export function forgetKey() {
  setKey('');
}

/** Calls fn(key) on every change; returns the unsubscribe function. */
export function onKeyChange(fn) {
  listeners.add(fn);
  return () => listeners.delete(fn);
}
