// Upload a recording and submit a recipe. The server is the one judge of a recipe: the form sends
// what was typed and shows each problem beside the field its JSON pointer names.

import { ProblemError, request, requestJson } from './api.js';
import { h, replace } from './dom.js';
import { recipeSchemas, simpleSettings, structuredSettings } from './schema.js';

/** @typedef {import('./api.js').Problem} Problem */
/** @typedef {import('./api.js').Job} Job */
/** @typedef {import('./schema.js').Setting} Setting */

/**
 * @param {HTMLElement} root
 * @param {{ announce: (message: string) => void, submitted: (job: Job) => void }} hooks
 */
export function createSubmitForm(root, hooks) {
  const file = h('input', { id: 'signal-file', name: 'file', type: 'file', accept: '.json,.edf,.bin,.f32,application/json', required: true });
  const format = h(
    'select',
    { id: 'signal-format', name: 'format' },
    h('option', { value: '' }, 'from the file name (.json, .edf, otherwise float32)'),
    h('option', { value: 'json' }, 'JSON'),
    h('option', { value: 'float32' }, 'float32, little-endian [epoch][channel][sample]'),
    h('option', { value: 'edf' }, 'EDF / EDF+'),
  );
  const samplingRate = h('input', { id: 'signal-samplingRate', name: 'samplingRate', type: 'text', inputmode: 'decimal', autocomplete: 'off' });
  const channels = h('input', { id: 'signal-channels', name: 'channels', type: 'text', autocomplete: 'off', spellcheck: 'false', placeholder: 'F3,F4,Cz' });
  const epochCount = h('input', { id: 'signal-epochCount', name: 'epochCount', type: 'text', inputmode: 'numeric', autocomplete: 'off', placeholder: '1' });
  const binaryFields = h(
    'div',
    { class: 'binary-fields', hidden: true },
    field(samplingRate, 'Sampling rate (Hz)', 'required for float32'),
    field(channels, 'Channel names', 'comma-separated, required for float32'),
    field(epochCount, 'Epochs in the file', 'default 1'),
  );
  const method = h('select', { id: 'recipe-method', name: 'method' });
  const settings = h('div', { class: 'settings', id: 'recipe-settings' });
  const extra = h('textarea', { id: 'recipe-extra', name: 'extra', rows: '3', spellcheck: 'false', placeholder: '{"ratios": [{"numerator": "theta", "denominator": "beta"}]}' });
  const extraHelp = h('span', {});
  const study = h('input', { id: 'job-study', name: 'study', type: 'text', autocomplete: 'off', spellcheck: 'false' });
  const general = h('div', { class: 'problem general-problem', id: 'submit-problem', role: 'alert', hidden: true });
  const status = h('p', { class: 'submit-status', id: 'submit-status', role: 'status' });
  const button = h('button', { type: 'submit', id: 'submit-button' }, 'Upload and submit');

  /** @type {Map<string, HTMLInputElement | HTMLSelectElement>} */
  let recipeInputs = new Map();
  /** @type {Map<string, import('./schema.js').JsonSchema>} */
  let schemas = new Map();

  const form = h(
    'form',
    { class: 'submit-form', 'aria-labelledby': 'submit-heading', novalidate: true, onsubmit: (/** @type {Event} */ e) => (e.preventDefault(), void submit()) },
    h('fieldset', {}, h('legend', {}, 'Recording'), field(file, 'Recording file', 'JSON as POST /v1/signals takes it, raw float32, or EDF/EDF+'), field(format, 'File format'), binaryFields),
    h(
      'fieldset',
      {},
      h('legend', {}, 'Recipe'),
      field(method, 'Method'),
      h('p', { class: 'hint' }, 'Leave a setting empty to use its default, shown beside it.'),
      settings,
      field(extra, 'Further settings (JSON object)', extraHelp),
    ),
    h('fieldset', {}, h('legend', {}, 'Labels'), field(study, 'Study label', 'optional; the job list can filter on it')),
    general,
    h('div', { class: 'actions' }, button),
    status,
  );
  replace(root, h('h2', { id: 'submit-heading' }, 'Submit an analysis'), form);

  const syncFormat = () => (binaryFields.hidden = formatOf() !== 'float32');
  file.addEventListener('change', syncFormat);
  format.addEventListener('change', syncFormat);
  method.addEventListener('change', () => showSettings(method.value));

  void recipeSchemas()
    .then((found) => {
      schemas = found;
      replace(
        method,
        [...found.keys()].map((m) => h('option', { value: m }, m)),
      );
      method.value = found.has('welch') ? 'welch' : (found.keys().next().value ?? '');
      showSettings(method.value);
    })
    .catch((error) => showGeneral(error));

  /** @param {string} name */
  function showSettings(name) {
    const schema = schemas.get(name);
    recipeInputs = new Map();
    if (!schema) return replace(settings);
    const list = simpleSettings(schema);
    replace(
      settings,
      list.map((setting) => settingField(setting)),
    );
    replace(extraHelp, `optional; for ${structuredSettings(schema).join(', ')}`);
  }

  /** @param {Setting} setting */
  function settingField(setting) {
    const id = `recipe-${setting.name}`;
    const shown = setting.default === undefined ? 'not set' : JSON.stringify(setting.default);
    /** @type {HTMLInputElement | HTMLSelectElement} */
    let control;
    if (setting.kind === 'choice' || setting.kind === 'boolean') {
      const choices = setting.kind === 'boolean' ? ['true', 'false'] : setting.choices;
      control = h(
        'select',
        { id, name: setting.name },
        h('option', { value: '' }, `default (${shown})`),
        choices.map((c) => h('option', { value: c }, c)),
      );
    } else {
      control = h('input', { id, name: setting.name, type: 'text', inputmode: setting.kind === 'integer' ? 'numeric' : 'decimal', autocomplete: 'off', placeholder: shown });
    }
    recipeInputs.set(setting.name, control);
    const range = setting.min !== null || setting.max !== null ? ` (${setting.min ?? '…'} to ${setting.max ?? '…'})` : '';
    const parts = [setting.default === undefined ? null : `default ${shown}`, setting.description ? `${setting.description}${range}` : range.trim() || null];
    return field(control, setting.name, parts.filter(Boolean).join(' · '));
  }

  /**
   * A labelled control with its help and a slot for a problem, both linked by aria-describedby.
   * @param {HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement} control
   * @param {string} label
   * @param {string | Node} [help]
   */
  function field(control, label, help) {
    const helpId = `${control.id}-help`;
    const problemId = `${control.id}-problem`;
    if (help) control.setAttribute('aria-describedby', helpId);
    return h(
      'div',
      { class: 'field' },
      h('label', { for: control.id }, label),
      control,
      help ? h('span', { class: 'hint', id: helpId }, help) : null,
      h('p', { class: 'problem', id: problemId, hidden: true }),
    );
  }

  function formatOf() {
    if (format.value) return format.value;
    const name = file.files?.[0]?.name.toLowerCase() ?? '';
    return name.endsWith('.json') ? 'json' : name.endsWith('.edf') ? 'edf' : 'float32';
  }

  function clearProblems() {
    for (const slot of form.querySelectorAll('.problem')) {
      slot.textContent = '';
      /** @type {HTMLElement} */ (slot).hidden = true;
    }
    for (const control of form.querySelectorAll('[aria-invalid]')) {
      control.removeAttribute('aria-invalid');
      control.setAttribute('aria-describedby', (control.getAttribute('aria-describedby') ?? '').replace(/\s*\S+-problem/g, '').trim());
    }
  }

  /**
   * @param {HTMLElement} control
   * @param {string} text
   */
  function showAt(control, text) {
    const slot = /** @type {HTMLElement | null} */ (form.querySelector(`#${control.id}-problem`));
    if (!slot) return showGeneral(new Error(text));
    slot.textContent = text;
    slot.hidden = false;
    control.setAttribute('aria-invalid', 'true');
    control.setAttribute('aria-describedby', `${control.getAttribute('aria-describedby') ?? ''} ${slot.id}`.trim());
    control.focus();
  }

  /** @param {unknown} error */
  function showGeneral(error) {
    const problem = error instanceof ProblemError ? error.problem : null;
    replace(
      general,
      h('strong', {}, problem ? problem.title : 'Something went wrong'),
      ' ',
      problem ? problem.detail : String(error),
      problem?.requestId ? h('span', { class: 'muted' }, ` (request ${problem.requestId})`) : null,
    );
    general.hidden = false;
  }

  /**
   * Puts a problem beside the field its pointer names.
   * @param {Problem} problem
   * @param {'upload' | 'job'} stage
   * @param {Set<string>} extraKeys settings given in the JSON field
   */
  function place(problem, stage, extraKeys) {
    const parts = (problem.pointer ?? '').split('/').slice(1);
    /** @type {HTMLElement | null} */
    let target = null;
    if (stage === 'upload') {
      const named = { samplingRate, channels, epochCount }[parts[0] === 'query' ? (parts[1] ?? '') : ''];
      target = named ?? file;
    } else if (parts[0] === 'recipe') {
      const name = parts[1] ?? 'method';
      target = recipeInputs.get(name) ?? (extraKeys.has(name) ? extra : name === 'method' ? method : extra);
    } else if (parts[0] === 'labels') {
      target = study;
    } else if (parts[0] === 'signal') {
      target = file;
    }
    if (target) showAt(target, problem.detail);
    else showGeneral(new ProblemError(problem));
  }

  async function submit() {
    clearProblems();
    general.hidden = true;
    const chosen = file.files?.[0];
    if (!chosen) return showAt(file, 'choose a recording file to upload');
    /** @type {Record<string, unknown>} */
    let further = {};
    if (extra.value.trim()) {
      try {
        further = JSON.parse(extra.value);
      } catch (error) {
        return showAt(extra, `not valid JSON: ${error instanceof Error ? error.message : String(error)}`);
      }
      if (!further || typeof further !== 'object' || Array.isArray(further)) return showAt(extra, 'give a JSON object, e.g. {"perEpoch": true}');
    }
    /** @type {Record<string, unknown>} */
    const recipe = { method: method.value, ...further };
    for (const [name, control] of recipeInputs) {
      const text = control.value.trim();
      if (!text) continue;
      // Numbers typed go as numbers; anything else goes as typed, for the server to refuse by name.
      recipe[name] = text === 'true' ? true : text === 'false' ? false : control instanceof HTMLSelectElement || Number.isNaN(Number(text)) ? text : Number(text);
    }
    button.disabled = true;
    let stage = /** @type {'upload' | 'job'} */ ('upload');
    try {
      status.textContent = `Uploading ${chosen.name}…`;
      const signal = await upload(chosen);
      status.textContent = `Stored ${signal.id}: ${signal.channels.length} channels at ${signal.samplingRate} Hz, ${signal.epochCount} × ${signal.samplesPerEpoch} samples. Submitting…`;
      stage = 'job';
      const labels = study.value.trim() ? { study: study.value.trim() } : undefined;
      const job = /** @type {Job} */ (
        await requestJson('/v1/jobs', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ signal: signal.id, recipe, ...(labels ? { labels } : {}) }) })
      );
      status.textContent = `Submitted ${job.id} (${job.state}).`;
      hooks.announce(`Job ${job.id} submitted.`);
      hooks.submitted(job);
    } catch (error) {
      status.textContent = 'Nothing was submitted.';
      if (error instanceof ProblemError) place(error.problem, stage, new Set(Object.keys(further)));
      else showGeneral(error);
    } finally {
      button.disabled = false;
    }
  }

  /**
   * @param {File} chosen
   * @returns {Promise<{ id: string, channels: string[], samplingRate: number, epochCount: number, samplesPerEpoch: number }>}
   */
  async function upload(chosen) {
    const kind = formatOf();
    if (kind === 'json') return requestJson('/v1/signals', { method: 'POST', headers: { 'content-type': 'application/json' }, body: chosen });
    const params = new URLSearchParams({ format: kind });
    if (kind === 'float32') {
      params.set('samplingRate', samplingRate.value.trim());
      params.set('channels', channels.value.trim());
      if (epochCount.value.trim()) params.set('epochCount', epochCount.value.trim());
    }
    const response = await request(`/v1/signals?${params}`, { method: 'POST', headers: { 'content-type': 'application/octet-stream' }, body: chosen });
    return response.json();
  }
}
