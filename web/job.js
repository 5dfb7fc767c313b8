// One job: its state live, then its recipe, input, warnings, result hash, plots and downloads.

import { download, ProblemError, request, requestJson, serverEvents } from './api.js';
import { facts, formatTime, h, percent, replace } from './dom.js';
import { labelList, stateBadge } from './list.js';

/** @typedef {import('./api.js').Job} Job */

/** Plot kinds by method; the plots route refuses a kind that does not fit the record. */
const PLOTS = /** @type {Record<string, string[]>} */ ({
  welch: ['psd', 'bands'],
  multitaper: ['psd', 'bands'],
  periodogram: ['psd', 'bands'],
  spectrogram: ['time-frequency'],
  morlet: ['time-frequency'],
  connectivity: ['connectivity'],
});
const PLOT_TITLES = /** @type {Record<string, string>} */ ({ psd: 'Power spectral density', bands: 'Band power per channel', 'time-frequency': 'Time–frequency power', connectivity: 'Connectivity' });
const TABLE_LEVELS = ['bands', 'features', 'spectra'];

/**
 * @param {HTMLElement} root
 * @param {string} id
 * @param {AbortSignal} signal aborted when the user leaves the view
 */
export async function showJob(root, id, signal) {
  const summary = h('section', { class: 'job-summary', 'aria-labelledby': 'job-heading' });
  const details = h('div', { class: 'job-details' });
  replace(root, h('p', {}, h('a', { href: '#/' }, '← All jobs')), h('h2', { id: 'job-heading', tabindex: '-1' }, `Job ${id}`), summary, details);
  /** @type {HTMLElement} */ (root.querySelector('#job-heading')).focus();
  /** @type {Job} */
  let job;
  try {
    job = await requestJson(`/v1/jobs/${encodeURIComponent(id)}`);
  } catch (error) {
    replace(summary, problemBox(error));
    return;
  }
  renderSummary(summary, job);
  let shownState = '';
  const settle = async (/** @type {Job} */ current) => {
    renderSummary(summary, current);
    if (current.state === shownState) return;
    shownState = current.state;
    await renderDetails(details, current, signal);
  };
  await settle(job);
  if (job.state !== 'queued' && job.state !== 'running') return;
  try {
    for await (const { event, data } of serverEvents(`/v1/jobs/${encodeURIComponent(id)}/events`, signal)) {
      if (event === 'state') await settle(/** @type {Job} */ (data));
    }
  } catch {
    // The view was left, or the stream dropped; reloading shows the current state.
  }
}

/**
 * @param {HTMLElement} summary
 * @param {Job} job
 */
function renderSummary(summary, job) {
  replace(
    summary,
    facts([
      ['State', stateBadge(job.state)],
      ['Progress', h('span', {}, h('progress', { max: '1', value: String(job.progress), 'aria-label': 'progress' }), ' ', percent(job.progress))],
      ['Method', job.method],
      ['Labels', labelList(job.labels)],
      ['Created', formatTime(job.createdAt)],
      ['Started', formatTime(job.startedAt)],
      ['Finished', formatTime(job.finishedAt)],
      ['Attempts', String(job.attempts)],
      ['Result hash', job.resultHash ? hashBox(job.resultHash) : '—'],
    ]),
    job.problem ? h('div', { class: 'problem general-problem', role: 'alert' }, h('strong', {}, job.problem.title), ' ', job.problem.detail) : null,
  );
}

/** The hash as selectable text and a button that copies it. @param {string} hash */
function hashBox(hash) {
  const note = h('span', { class: 'copy-note', role: 'status' });
  const code = h('code', { class: 'hash', id: 'result-hash' }, hash);
  const copy = h(
    'button',
    {
      type: 'button',
      class: 'small',
      'aria-describedby': 'result-hash',
      onclick: async () => {
        try {
          await navigator.clipboard.writeText(hash);
          note.textContent = 'copied';
        } catch {
          // No clipboard permission (e.g. not a secure context): select the text for Ctrl+C instead.
          const range = document.createRange();
          range.selectNodeContents(code);
          getSelection()?.removeAllRanges();
          getSelection()?.addRange(range);
          note.textContent = 'selected: press Ctrl+C to copy';
        }
      },
    },
    'Copy',
  );
  return h('span', { class: 'hash-box' }, code, ' ', copy, ' ', note);
}

/**
 * @param {HTMLElement} details
 * @param {Job} job
 * @param {AbortSignal} signal
 */
async function renderDetails(details, job, signal) {
  if (job.state !== 'succeeded') {
    // Before the record exists, show what was asked: the pinned recipe and the stored signal.
    const [recipe, input] = await Promise.all([requestJson(`/v1/recipes/${job.recipe}`).catch(() => null), requestJson(`/v1/signals/${job.signal}`).catch(() => null)]);
    replace(
      details,
      section('Recipe', recipe ? jsonBlock(/** @type {{ recipe: unknown }} */ (recipe).recipe) : job.recipe),
      section('Input', input ? inputFacts(/** @type {Record<string, unknown>} */ (input)) : job.signal),
    );
    return;
  }
  /** @type {any} */
  let record;
  try {
    record = await requestJson(`/v1/jobs/${job.id}/record`, { signal });
  } catch (error) {
    replace(details, problemBox(error));
    return;
  }
  const warnings = /** @type {string[]} */ (record.result?.warnings ?? []);
  const attachments = /** @type {{ name: string, shape: number[], dtype: string }[]} */ (record.result?.timeFrequency?.attachments ?? record.attachments ?? []);
  const plots = h('div', { class: 'plots' });
  replace(
    details,
    section('Plots', plots),
    section(
      'Warnings',
      warnings.length === 0
        ? h('p', {}, 'None.')
        : h(
            'ul',
            { class: 'warnings' },
            warnings.map((w) => h('li', {}, w)),
          ),
    ),
    section(
      'Downloads',
      h(
        'ul',
        { class: 'downloads' },
        h('li', {}, downloadButton('Feature record (JSON)', `/v1/jobs/${job.id}/record`, `${job.id}.json`)),
        TABLE_LEVELS.map((level) => h('li', {}, downloadButton(`Table: ${level} (CSV)`, `/v1/jobs/${job.id}/table?level=${level}&format=csv`, `${job.id}-${level}.csv`))),
        attachments.map((a) => h('li', {}, downloadButton(`Attachment ${a.name} (${a.shape.join(' × ')}, ${a.dtype})`, `/v1/jobs/${job.id}/attachments/${a.name}`, `${job.id}-${a.name}.bin`))),
      ),
    ),
    section('Recipe', jsonBlock(record.recipe)),
    section('Input', inputFacts(record.input ?? {})),
  );
  for (const kind of PLOTS[job.method] ?? []) {
    const figure = await plotFigure(job.id, kind, signal);
    if (figure) plots.append(figure);
  }
  if (plots.childElementCount === 0) plots.append(h('p', { class: 'muted' }, 'This server draws no plot of this record.'));
}

/** @param {string} title @param {...import('./dom.js').Child} content */
function section(title, ...content) {
  const id = `section-${title.toLowerCase().replace(/[^a-z]+/g, '-')}`;
  return h('section', { class: 'job-section', 'aria-labelledby': id }, h('h3', { id }, title), ...content);
}

/** @param {Record<string, unknown>} input */
function inputFacts(input) {
  const channels = Array.isArray(input.channels) ? input.channels.join(', ') : null;
  return facts([
    ['Signal', /** @type {string} */ (input.signal ?? input.id ?? null)],
    ['SHA-256', input.sha256 ? h('code', { class: 'hash' }, String(input.sha256)) : null],
    ['Sampling rate', input.samplingRate !== undefined ? `${input.samplingRate} Hz` : null],
    ['Channels', channels],
    ['Unit', /** @type {string | null} */ (input.unit ?? null)],
    ['Epochs', input.epochCount !== undefined ? `${input.epochCount} × ${input.samplesPerEpoch} samples` : null],
    ['View', input.view ? JSON.stringify(input.view) : null],
  ]);
}

/** @param {unknown} value */
function jsonBlock(value) {
  return h('pre', { class: 'json', tabindex: '0', 'aria-label': 'JSON' }, JSON.stringify(value, null, 2));
}

/**
 * @param {string} label
 * @param {string} path
 * @param {string} name
 */
function downloadButton(label, path, name) {
  const note = h('span', { class: 'muted', role: 'status' });
  return h(
    'span',
    {},
    h(
      'button',
      {
        type: 'button',
        class: 'link-button',
        onclick: () =>
          download(path, name).then(
            () => (note.textContent = ''),
            (error) => (note.textContent = ` ${error instanceof ProblemError ? error.problem.detail : String(error)}`),
          ),
      },
      label,
    ),
    note,
  );
}

/**
 * The plot as inline SVG: its text stays real text for screen readers and tests, and the page's
 * policy still forbids scripts in it. Null when the server has no such plot kind (or no plots).
 * @param {string} jobId
 * @param {string} kind
 * @param {AbortSignal} signal
 * @returns {Promise<HTMLElement | null>}
 */
async function plotFigure(jobId, kind, signal) {
  const caption = h('figcaption', {}, PLOT_TITLES[kind] ?? kind);
  const figure = h('figure', { class: `plot plot-${kind}`, 'data-plot': kind }, caption);
  try {
    const response = await request(`/v1/jobs/${jobId}/plots/${kind}?width=880&height=420`, { signal });
    figure.prepend(importSvg(await response.text(), `plot-${kind}`));
  } catch (error) {
    if (error instanceof ProblemError && /\/(unknown-plot-kind|not-found)$/.test(error.problem.type)) return null;
    figure.append(h('p', { class: 'muted' }, `No plot: ${error instanceof ProblemError ? error.problem.detail : String(error)}`));
  }
  return figure;
}

/**
 * Parses SVG text into an element without scripts or event attributes, with its ids prefixed so
 * that several plots on one page keep their title/description references apart.
 * @param {string} text
 * @param {string} prefix
 * @returns {Element}
 */
export function importSvg(text, prefix) {
  const parsed = new DOMParser().parseFromString(text, 'image/svg+xml');
  const svg = parsed.documentElement;
  if (svg.nodeName !== 'svg') throw new Error('the plot is not SVG');
  for (const bad of svg.querySelectorAll('script, foreignObject')) bad.remove();
  const ids = new Set();
  for (const element of [svg, ...svg.querySelectorAll('*')]) {
    for (const attribute of [...element.attributes]) {
      if (/^on/i.test(attribute.name) || /^\s*javascript:/i.test(attribute.value)) element.removeAttribute(attribute.name);
    }
    if (element.id) ids.add(element.id);
  }
  for (const element of [svg, ...svg.querySelectorAll('*')]) {
    if (element.id) element.id = `${prefix}-${element.id}`;
    for (const name of ['aria-labelledby', 'aria-describedby']) {
      const value = element.getAttribute(name);
      if (value)
        element.setAttribute(
          name,
          value
            .split(/\s+/)
            .map((ref) => (ids.has(ref) ? `${prefix}-${ref}` : ref))
            .join(' '),
        );
    }
    for (const attribute of [...element.attributes]) {
      if (attribute.value.includes('#'))
        element.setAttribute(
          attribute.name,
          attribute.value.replace(/#([A-Za-z][\w.-]*)/g, (whole, ref) => (ids.has(ref) ? `#${prefix}-${ref}` : whole)),
        );
    }
  }
  return document.importNode(svg, true);
}

/** @param {unknown} error */
function problemBox(error) {
  const problem = error instanceof ProblemError ? error.problem : null;
  return h('div', { class: 'problem general-problem', role: 'alert' }, h('strong', {}, problem?.title ?? 'Error'), ' ', problem?.detail ?? String(error));
}
