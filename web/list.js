// The job list: filters, cursor paging and live state over one server-sent event stream for all
// unfinished jobs on the page (one stream per job would hit the browser's connection limit).

import { requestJson, serverEvents } from './api.js';
import { formatTime, h, percent, replace } from './dom.js';
import { recipeSchemas } from './schema.js';

const PAGE_SIZE = 20;
const STATES = ['queued', 'running', 'succeeded', 'failed', 'canceled'];

/** @typedef {import('./api.js').Job} Job */

/**
 * @param {HTMLElement} root
 * @param {(message: string) => void} announce
 * @param {AbortSignal} leaving aborted when the user leaves the list; ends its event stream
 * @param {{ study?: string }} [initial] filters to start with
 */
export function createJobList(root, announce, leaving, initial = {}) {
  /** cursors of the pages before the current one; the current page's own cursor is the last */
  /** @type {(string | null)[]} */
  let cursors = [null];
  /** @type {string | null} */
  let nextCursor = null;
  /** @type {AbortController | null} */
  let live = null;

  const stateFilter = h(
    'select',
    { id: 'filter-state', name: 'state' },
    h('option', { value: '' }, 'any state'),
    STATES.map((s) => h('option', { value: s }, s)),
  );
  const methodFilter = h('select', { id: 'filter-method', name: 'method' }, h('option', { value: '' }, 'any method'));
  const studyFilter = h('input', { id: 'filter-study', name: 'study', type: 'text', autocomplete: 'off', spellcheck: 'false', value: initial.study ?? '' });
  const afterFilter = h('input', { id: 'filter-after', name: 'createdAfter', type: 'datetime-local', step: '1' });
  const beforeFilter = h('input', { id: 'filter-before', name: 'createdBefore', type: 'datetime-local', step: '1' });
  const filterProblem = h('p', { id: 'filter-problem', class: 'problem', hidden: true });
  const body = h('tbody');
  const status = h('p', { class: 'list-status', id: 'list-status' });
  const newer = h('button', { type: 'button', onclick: () => void go(cursors.length - 2) }, '← Newer');
  const older = h('button', { type: 'button', onclick: () => void go(cursors.length) }, 'Older →');

  const form = h(
    'form',
    { class: 'filters', 'aria-label': 'Filter jobs', onsubmit: (/** @type {Event} */ e) => (e.preventDefault(), void reload()) },
    field('State', stateFilter),
    field('Method', methodFilter),
    field('Study label', studyFilter),
    field('Created after', afterFilter),
    field('Created before', beforeFilter),
    h('div', { class: 'filter-actions' }, h('button', { type: 'submit' }, 'Apply filters'), h('button', { type: 'button', onclick: () => (form.reset(), void reload()) }, 'Clear')),
    filterProblem,
  );

  replace(
    root,
    h('h2', { id: 'jobs-heading' }, 'Jobs'),
    form,
    h(
      'div',
      { class: 'table-wrap' },
      h(
        'table',
        { class: 'jobs', 'aria-labelledby': 'jobs-heading', 'aria-describedby': 'list-status' },
        h(
          'thead',
          {},
          h(
            'tr',
            {},
            ['Created', 'Job', 'Method', 'Labels', 'State', 'Progress'].map((t) => h('th', { scope: 'col' }, t)),
          ),
        ),
        body,
      ),
    ),
    status,
    h('nav', { class: 'pager', 'aria-label': 'Job list pages' }, newer, older),
  );

  void recipeSchemas()
    .then((methods) => methodFilter.append(...[...methods.keys()].map((m) => h('option', { value: m }, m))))
    .catch(() => undefined);

  /** @param {string} label @param {HTMLElement} control */
  function field(label, control) {
    return h('div', { class: 'field' }, h('label', { for: control.id }, label), control);
  }

  /** @param {HTMLInputElement} input */
  function instant(input) {
    return input.value ? new Date(input.value).toISOString() : null;
  }

  function query() {
    const params = new URLSearchParams({ limit: String(PAGE_SIZE) });
    if (stateFilter.value) params.set('state', stateFilter.value);
    if (methodFilter.value) params.set('method', methodFilter.value);
    if (studyFilter.value.trim()) params.set('study', studyFilter.value.trim());
    const after = instant(afterFilter);
    const before = instant(beforeFilter);
    if (after) params.set('createdAfter', after);
    if (before) params.set('createdBefore', before);
    return params;
  }

  /** @param {number} index which page: 0 is the newest */
  async function go(index) {
    if (index < 0) return;
    const cursor = index < cursors.length ? cursors[index] : nextCursor;
    if (cursor === undefined || (index > 0 && cursor === null)) return;
    const params = query();
    if (cursor) params.set('cursor', cursor);
    live?.abort();
    filterProblem.hidden = true;
    status.textContent = 'Loading…';
    try {
      const page = /** @type {{ jobs: Job[], nextCursor: string | null }} */ (await requestJson(`/v1/jobs?${params}`));
      cursors = [...cursors.slice(0, index), cursor ?? null];
      nextCursor = page.nextCursor;
      replace(body, page.jobs.map(row));
      status.textContent = page.jobs.length === 0 ? 'No jobs match.' : `Page ${index + 1}: ${page.jobs.length} job${page.jobs.length === 1 ? '' : 's'}.`;
      newer.disabled = index === 0;
      older.disabled = nextCursor === null;
      watch(page.jobs);
    } catch (error) {
      const problem = /** @type {{ problem?: import('./api.js').Problem }} */ (error).problem;
      const pointer = problem?.pointer ?? '';
      filterProblem.textContent = problem ? `${problem.detail}` : String(error);
      filterProblem.hidden = false;
      status.textContent = 'The list could not be loaded.';
      const culprit = form.querySelector(`[name="${pointer.split('/')[2] ?? ''}"]`);
      if (culprit) culprit.setAttribute('aria-invalid', 'true');
    }
  }

  /** @param {Job} job */
  function row(job) {
    const progress = h('progress', { max: '1', value: String(job.progress), 'aria-label': `progress of ${job.id}` });
    return h(
      'tr',
      { 'data-job': job.id },
      h('td', {}, h('time', { datetime: job.createdAt }, formatTime(job.createdAt))),
      h('td', {}, h('a', { href: `#/jobs/${job.id}`, class: 'job-link' }, job.id)),
      h('td', {}, job.method),
      h('td', {}, labelList(job.labels)),
      h('td', { class: 'state-cell' }, stateBadge(job.state)),
      h('td', { class: 'progress-cell' }, progress, h('span', { class: 'progress-text' }, percent(job.progress))),
    );
  }

  /** @param {Job} job */
  function update(job) {
    const tr = body.querySelector(`tr[data-job="${job.id}"]`);
    if (!tr) return;
    const before = tr.querySelector('.state-cell')?.textContent;
    replace(/** @type {Element} */ (tr.querySelector('.state-cell')), stateBadge(job.state));
    const progress = tr.querySelector('progress');
    if (progress) progress.value = job.progress;
    const text = tr.querySelector('.progress-text');
    if (text) text.textContent = percent(job.progress);
    if (before !== job.state && (job.state === 'succeeded' || job.state === 'failed')) announce(`Job ${job.id} ${job.state}.`);
  }

  /** @param {Job[]} jobs */
  function watch(jobs) {
    const open = jobs.filter((j) => j.state === 'queued' || j.state === 'running').map((j) => j.id);
    if (open.length === 0) return;
    const controller = new AbortController();
    leaving.addEventListener('abort', () => controller.abort(), { once: true });
    live = controller;
    void (async () => {
      try {
        for await (const { event, data } of serverEvents(`/v1/jobs/events?ids=${open.join(',')}`, controller.signal)) {
          if (event === 'state') update(/** @type {Job} */ (data));
        }
      } catch {
        // Aborted by a new page, or the connection dropped: the next load shows the current states.
      }
    })();
  }

  function reload() {
    for (const input of form.querySelectorAll('[aria-invalid]')) input.removeAttribute('aria-invalid');
    cursors = [null];
    nextCursor = null;
    return go(0);
  }

  return { reload };
}

/** @param {Record<string, string>} labels */
export function labelList(labels) {
  const entries = Object.entries(labels ?? {});
  if (entries.length === 0) return h('span', { class: 'muted' }, '—');
  return h(
    'ul',
    { class: 'labels' },
    entries.map(([k, v]) => h('li', {}, `${k}: ${v}`)),
  );
}

/** State as text and shape, never by colour alone. @param {string} state */
export function stateBadge(state) {
  return h('span', { class: `state state-${state}` }, state);
}
