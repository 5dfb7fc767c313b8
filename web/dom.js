// Small DOM helpers: elements are built with textContent and attributes only, never from HTML
// strings, so text from the server (labels, problem details) cannot become markup.

/**
 * @typedef {Record<string, string | number | boolean | null | undefined | EventListener>} Attributes
 * @typedef {Node | string | number | null | undefined | false} Child
 */

/**
 * Creates an element. `on…` attributes given functions become listeners; `false`/`null` skip.
 * @template {keyof HTMLElementTagNameMap} K
 * @param {K} tag
 * @param {Attributes} [attributes]
 * @param {...(Child | Child[])} children
 * @returns {HTMLElementTagNameMap[K]}
 */
export function h(tag, attributes = {}, ...children) {
  const element = document.createElement(tag);
  for (const [name, value] of Object.entries(attributes)) {
    if (value === null || value === undefined || value === false) continue;
    if (typeof value === 'function') element.addEventListener(name.slice(2), value);
    else if (value === true) element.setAttribute(name, '');
    else element.setAttribute(name, String(value));
  }
  append(element, children);
  return element;
}

/**
 * @param {Element} parent
 * @param {(Child | Child[])[]} children
 */
export function append(parent, children) {
  for (const child of children.flat()) {
    if (child === null || child === undefined || child === false) continue;
    parent.append(typeof child === 'number' ? String(child) : child);
  }
}

/**
 * Replaces an element's children.
 * @param {Element} parent
 * @param {...(Child | Child[])} children
 */
export function replace(parent, ...children) {
  parent.replaceChildren();
  append(parent, children);
}

/**
 * A definition list from label/value pairs; null values are left out.
 * @param {[string, Child][]} pairs
 */
export function facts(pairs) {
  return h(
    'dl',
    { class: 'facts' },
    pairs.filter(([, value]) => value !== null && value !== undefined).flatMap(([label, value]) => [h('dt', {}, label), h('dd', {}, value)]),
  );
}

/** @param {string | null} iso */
export function formatTime(iso) {
  if (!iso) return '—';
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : date.toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'medium' });
}

/** @param {number} fraction 0..1 */
export function percent(fraction) {
  return `${Math.round(fraction * 100)} %`;
}
