// Studies: the list, and one study with its runs: progress, failed entries with their problems,
// the run table and the mean PSD per condition.

import { download, ProblemError, request, requestJson } from './api.js';
import { facts, formatTime, h, percent, replace } from './dom.js';
import { importSvg } from './job.js';
import { stateBadge } from './list.js';

/**
 * @typedef {{ id: string, name: string, description: string | null, entryCount: number, createdAt: string, updatedAt: string }} Study
 * @typedef {{ total: number, waiting: number, queued: number, running: number, succeeded: number, failed: number, canceled: number, reused: number }} Counts
 * @typedef {{ entryId: string, signal: string, metadata: Record<string, string | number>, job: string, problem: import('./api.js').Problem | null }} FailedEntry
 * @typedef {{ id: string, state: string, recipe: { id: string, method: string }, progress: number, counts: Counts, failed: FailedEntry[],
 *   createdAt: string, finishedAt: string | null, filter: Record<string, unknown> | null }} Run
 */

const POLL_MS = 2000;
const SPECTRAL = new Set(['welch', 'multitaper', 'periodogram']);

/** @param {HTMLElement} root */
export async function showStudies(root) {
  const body = h('tbody');
  const status = h('p', { id: 'studies-status' }, 'Loading…');
  replace(
    root,
    h(
      'section',
      { class: 'panel', 'aria-labelledby': 'studies-heading' },
      h('h2', { id: 'studies-heading' }, 'Studies'),
      h(
        'div',
        { class: 'table-wrap' },
        h(
          'table',
          { class: 'jobs', 'aria-labelledby': 'studies-heading' },
          h(
            'thead',
            {},
            h(
              'tr',
              {},
              ['Name', 'Entries', 'Created', 'Updated'].map((t) => h('th', { scope: 'col' }, t)),
            ),
          ),
          body,
        ),
      ),
      status,
    ),
  );
  try {
    /** @type {Study[]} */
    const all = [];
    /** @type {string | null} */
    let after = null;
    // A lab has tens of studies, not thousands: read every page.
    do {
      const page = /** @type {{ studies: Study[], next: string | null }} */ (await requestJson(`/v1/studies?limit=100${after ? `&after=${encodeURIComponent(after)}` : ''}`));
      all.push(...page.studies);
      after = page.next;
    } while (after && all.length < 1000);
    replace(
      body,
      all.map((s) =>
        h('tr', {}, h('td', {}, h('a', { href: `#/studies/${s.id}` }, s.name)), h('td', {}, String(s.entryCount)), h('td', {}, formatTime(s.createdAt)), h('td', {}, formatTime(s.updatedAt))),
      ),
    );
    status.textContent = all.length === 0 ? 'No studies yet: create one through the API (see the README).' : `${all.length} stud${all.length === 1 ? 'y' : 'ies'}.`;
  } catch (error) {
    replace(status, problemText(error));
  }
}

/**
 * @param {HTMLElement} root
 * @param {string} id
 * @param {AbortSignal} signal aborted when the user leaves the view
 */
export async function showStudy(root, id, signal) {
  const heading = h('h2', { id: 'study-heading', tabindex: '-1' }, `Study ${id}`);
  const summary = h('section', { class: 'job-summary', 'aria-labelledby': 'study-heading' });
  const runs = h('div', { class: 'runs' });
  replace(root, h('p', {}, h('a', { href: '#/studies' }, '← All studies')), heading, summary, runs);
  heading.focus();
  /** @type {Study} */
  let study;
  try {
    study = await requestJson(`/v1/studies/${encodeURIComponent(id)}`);
  } catch (error) {
    replace(summary, h('p', { class: 'problem general-problem', role: 'alert' }, problemText(error)));
    return;
  }
  heading.textContent = `Study: ${study.name}`;
  document.title = `${study.name} · rhythmetric`;
  replace(
    summary,
    facts([
      ['Id', h('code', { class: 'hash' }, study.id)],
      ['Description', study.description],
      ['Entries', String(study.entryCount)],
      ['Created', formatTime(study.createdAt)],
      ['Jobs', h('a', { href: `#/?study=${encodeURIComponent(study.id)}` }, "this study's jobs in the job list")],
    ]),
  );
  const shape = await entryShape(id);
  /** @type {Map<string, HTMLElement>} */
  const shown = new Map();
  while (!signal.aborted) {
    /** @type {Run[]} */
    let list;
    try {
      list = /** @type {{ runs: Run[] }} */ (await requestJson(`/v1/studies/${encodeURIComponent(id)}/runs`, { signal })).runs;
    } catch (error) {
      if (!signal.aborted) replace(runs, h('p', { class: 'problem general-problem' }, problemText(error)));
      return;
    }
    if (list.length === 0) replace(runs, h('p', { class: 'muted' }, 'No runs yet.'));
    for (const run of [...list].reverse()) {
      const before = shown.get(run.id);
      const key = JSON.stringify([run.state, run.counts]);
      if (before?.dataset.key === key) continue;
      const card = runCard(id, run, shape);
      card.dataset.key = key;
      if (before) before.replaceWith(card);
      else runs.append(card);
      shown.set(run.id, card);
    }
    if (list.every((r) => r.state !== 'running')) return;
    await new Promise((r) => setTimeout(r, POLL_MS));
  }
}

/**
 * The channels and metadata keys of the study's first entry, for the plot's choices.
 * @param {string} id
 * @returns {Promise<{ channels: string[], keys: string[] }>}
 */
async function entryShape(id) {
  try {
    const { entries } = /** @type {{ entries: { signal: string, view: { channels?: string[] } | null, metadata: Record<string, unknown> }[] }} */ (
      await requestJson(`/v1/studies/${encodeURIComponent(id)}/entries?limit=1`)
    );
    const first = entries[0];
    if (!first) return { channels: [], keys: [] };
    const info = /** @type {{ channels: string[] }} */ (await requestJson(`/v1/signals/${first.signal}`));
    return { channels: first.view?.channels ?? info.channels, keys: Object.keys(first.metadata) };
  } catch {
    return { channels: [], keys: [] };
  }
}

/**
 * @param {string} studyId
 * @param {Run} run
 * @param {{ channels: string[], keys: string[] }} shape
 */
function runCard(studyId, run, shape) {
  const base = `/v1/studies/${encodeURIComponent(studyId)}/runs/${run.id}`;
  const c = run.counts;
  const headingId = `run-${run.id}`;
  return h(
    'section',
    { class: 'job-section run', 'aria-labelledby': headingId },
    h('h3', { id: headingId }, `Run ${run.id} · ${run.recipe.method}`),
    facts([
      ['State', stateBadge(run.state)],
      ['Progress', h('span', {}, h('progress', { max: '1', value: String(run.progress), 'aria-label': `progress of run ${run.id}` }), ' ', percent(run.progress))],
      [
        'Entries',
        `${c.total} in all: ${c.succeeded} succeeded, ${c.failed} failed, ${c.canceled} canceled, ${c.running} running, ${c.queued} queued, ${c.waiting} waiting (${c.reused} reused existing records)`,
      ],
      ['Filter', run.filter ? JSON.stringify(run.filter) : null],
      ['Recipe', h('code', {}, run.recipe.id)],
      ['Started', formatTime(run.createdAt)],
      ['Finished', formatTime(run.finishedAt)],
    ]),
    run.failed.length > 0
      ? h(
          'div',
          { class: 'table-wrap' },
          h(
            'table',
            { class: 'jobs' },
            h('caption', {}, 'Failed entries'),
            h(
              'thead',
              {},
              h(
                'tr',
                {},
                ['Entry', 'Metadata', 'Job', 'Problem'].map((t) => h('th', { scope: 'col' }, t)),
              ),
            ),
            h(
              'tbody',
              {},
              run.failed.map((f) =>
                h(
                  'tr',
                  {},
                  h('td', {}, f.entryId),
                  h(
                    'td',
                    {},
                    Object.entries(f.metadata)
                      .map(([k, v]) => `${k}: ${v}`)
                      .join(', '),
                  ),
                  h('td', {}, h('a', { href: `#/jobs/${f.job}`, class: 'job-link' }, f.job)),
                  h('td', {}, f.problem ? `${f.problem.title}: ${f.problem.detail}` : '—'),
                ),
              ),
            ),
          ),
        )
      : null,
    h(
      'p',
      {},
      h(
        'button',
        { type: 'button', class: 'link-button', onclick: () => void download(`${base}/table?level=bands&format=csv`, `${run.id}-bands.csv`).catch(() => undefined) },
        'Run table: bands (CSV)',
      ),
    ),
    c.succeeded > 0 && SPECTRAL.has(run.recipe.method) && shape.channels.length > 0 ? conditionPlot(base, run.id, shape) : null,
  );
}

/**
 * The run's mean PSD per group of entries, for a chosen channel and metadata key.
 * @param {string} base
 * @param {string} runId
 * @param {{ channels: string[], keys: string[] }} shape
 */
function conditionPlot(base, runId, shape) {
  const channel = h(
    'select',
    { id: `plot-channel-${runId}` },
    shape.channels.map((c) => h('option', { value: c }, c)),
  );
  const by = h(
    'select',
    { id: `plot-by-${runId}` },
    shape.keys.map((k) => h('option', { value: k }, k)),
  );
  if (shape.keys.includes('condition')) by.value = 'condition';
  const holder = h('div', { class: 'plots' });
  const draw = async () => {
    replace(holder, h('p', { class: 'muted' }, 'Drawing…'));
    try {
      const text = await (await request(`${base}/plots/psd?channel=${encodeURIComponent(channel.value)}&by=${encodeURIComponent(by.value)}&width=880&height=420`)).text();
      replace(holder, h('figure', { class: 'plot', 'data-plot': 'run-psd' }, importSvg(text, `run-${runId}`), h('figcaption', {}, `Mean PSD of ${channel.value} by ${by.value}`)));
    } catch (error) {
      replace(holder, h('p', { class: 'muted' }, error instanceof ProblemError && /\/not-found$/.test(error.problem.type) ? 'This server draws no study plots.' : `No plot: ${problemText(error)}`));
    }
  };
  channel.addEventListener('change', () => void draw());
  by.addEventListener('change', () => void draw());
  void draw();
  return h(
    'div',
    {},
    h('div', { class: 'filters' }, h('div', { class: 'field' }, h('label', { for: channel.id }, 'Channel'), channel), h('div', { class: 'field' }, h('label', { for: by.id }, 'Group by'), by)),
    holder,
  );
}

/** @param {unknown} error */
function problemText(error) {
  return error instanceof ProblemError ? `${error.problem.title}: ${error.problem.detail}` : String(error);
}
