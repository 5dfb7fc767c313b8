// Entry point: the API key box, the hash routes (#/ for the list and the form, #/jobs/<id> for a
// job) and a polite live region that announces what changed off-screen.

import { apiKey, requestJson, setApiKey } from './api.js';
import { h, replace } from './dom.js';
import { showJob } from './job.js';
import { createJobList } from './list.js';
import { showStudies, showStudy } from './study.js';
import { createSubmitForm } from './submit.js';

const main = /** @type {HTMLElement} */ (document.getElementById('main'));
const announcer = /** @type {HTMLElement} */ (document.getElementById('announcer'));
const keyForm = /** @type {HTMLFormElement} */ (document.getElementById('key-form'));
const keyInput = /** @type {HTMLInputElement} */ (document.getElementById('api-key'));
const keyState = /** @type {HTMLElement} */ (document.getElementById('key-state'));
const modeNote = /** @type {HTMLElement} */ (document.getElementById('mode'));

/** @param {string} message */
function announce(message) {
  announcer.textContent = message;
}

function showKeyState() {
  keyState.textContent = apiKey() ? 'A key is set for this tab.' : 'No key set: enough for a server in open mode; a server with keys asks for one.';
}

keyForm.addEventListener('submit', (event) => {
  event.preventDefault();
  setApiKey(keyInput.value.trim() || null);
  keyInput.value = '';
  showKeyState();
  void route();
});
/** @type {HTMLButtonElement} */ (document.getElementById('forget-key')).addEventListener('click', () => {
  setApiKey(null);
  showKeyState();
  void route();
});

/** @type {AbortController | null} */
let leaving = null;

async function route() {
  leaving?.abort();
  leaving = new AbortController();
  const hash = location.hash;
  markCurrent(hash.startsWith('#/studies') ? 'studies' : 'jobs');
  const job = /^#\/jobs\/([\w-]{1,200})$/.exec(hash);
  if (job?.[1]) {
    document.title = `Job ${job[1]} · rhythmetric`;
    await showJob(main, job[1], leaving.signal);
    return;
  }
  const study = /^#\/studies\/([\w-]{1,200})$/.exec(hash);
  if (study?.[1]) {
    document.title = 'Study · rhythmetric';
    await showStudy(main, study[1], leaving.signal);
    return;
  }
  if (hash === '#/studies') {
    document.title = 'Studies · rhythmetric';
    await showStudies(main);
    return;
  }
  document.title = 'Jobs · rhythmetric';
  const submitArea = h('section', { class: 'panel', id: 'submit' });
  const listArea = h('section', { class: 'panel', id: 'jobs' });
  replace(main, submitArea, listArea);
  // #/?study=… opens the list filtered by a study (the study view links there).
  const query = new URLSearchParams(hash.split('?')[1] ?? '');
  const list = createJobList(listArea, announce, leaving.signal, { study: query.get('study') ?? '' });
  createSubmitForm(submitArea, { announce, submitted: () => void list.reload() });
  await list.reload();
}

/** @param {'jobs' | 'studies'} current */
function markCurrent(current) {
  for (const link of document.querySelectorAll('nav.site a')) {
    if (link.getAttribute('data-view') === current) link.setAttribute('aria-current', 'page');
    else link.removeAttribute('aria-current');
  }
}

showKeyState();
window.addEventListener('hashchange', () => void route());
void route();
void requestJson('/healthz')
  .then((health) => {
    const { mode, engineVersion } = /** @type {{ mode: string, engineVersion: string }} */ (health);
    modeNote.textContent = `${mode} mode · engine ${engineVersion}`;
  })
  .catch(() => (modeNote.textContent = 'the service does not answer'));
