import { createHash } from 'node:crypto';
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEpochs, toUploadJson } from '../../src/signals/demo-recording.js';
import { startTestApi } from '../helpers/app.js';

/**
 * Drives Debian's Chromium (package `chromium`) through playwright-core: a test tool's own browser
 * download does not work on the project's machines. Without the browser the suite is skipped with
 * the reason, except under CI, where that is a failure.
 */
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const HAVE_CHROMIUM = existsSync(CHROMIUM);
if (!HAVE_CHROMIUM && process.env.CI === 'true') throw new Error(`the browser test needs Chromium at ${CHROMIUM} under CI (apt-get install chromium; .ci/run does it)`);
if (!HAVE_CHROMIUM) console.warn(`[skip] browser test skipped: no Chromium at ${CHROMIUM} (apt-get install chromium, or set CHROMIUM_PATH; CI=true makes this an error)`);

const SHOTS = resolve(import.meta.dirname, '..', '..', 'test-output', 'e2e');

/**
 * An embedded-mode service on a random loopback port (fresh data directory) and a headless
 * Chromium with a fresh profile, on its page.
 */
async function startSession(env: Record<string, string> = {}) {
  const api = await startTestApi(env);
  const base = await api.app.listen({ port: 0, host: '127.0.0.1' });
  const work = await mkdtemp(join(tmpdir(), 'rhythmetric-e2e-'));
  const context = await chromium.launchPersistentContext(join(work, 'profile'), {
    executablePath: CHROMIUM,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    viewport: { width: 1280, height: 900 },
  });
  const page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (error) => console.error('page error:', error));
  await page.goto(`${base}/`);
  return {
    api,
    base,
    work,
    context,
    page,
    async close() {
      await context.close();
      await api.stop();
      await rm(work, { recursive: true, force: true });
    },
  };
}

let session: Awaited<ReturnType<typeof startSession>> | undefined;
let base: string;
let page: Page;
let demoFile: string;

// Generous: the suite shares two cores with the rest of `npm test`; no check here is about speed.
describe.skipIf(!HAVE_CHROMIUM)('when a person uses the dashboard page in a real browser', { timeout: 90_000 }, () => {
  beforeAll(async () => {
    session = await startSession();
    ({ base, page } = session);
    await mkdir(SHOTS, { recursive: true });
    // The invented demo study: ten 4-s epochs with the eyes closed, late in the shift.
    demoFile = join(session.work, 'eyes-closed-late.json');
    await writeFile(demoFile, JSON.stringify(toUploadJson(demoEpochs('eyes-closed', 'late', 10, 4, 1003))));
    await page.locator('#recipe-method option[value="welch"]').waitFor({ state: 'attached' });
    await page.locator('#recipe-overlap').waitFor();
  }, 60_000);

  afterAll(async () => {
    await session?.close();
  });

  it('should say visibly that it is research software, not a medical device', async () => {
    const footer = page.locator('footer');
    await expect.poll(() => footer.isVisible()).toBe(true);
    const text = await footer.innerText();
    // The project's caution (DESIGN.md "Cautions"), as the README words it.
    expect(text).toMatch(/research software/i);
    expect(text).toMatch(/not a medical device/i);
    expect(text).toMatch(/local regulations and licensed practice/i);
  });

  it('should give every control an accessible name and let Tab reach the submit button', async () => {
    const unnamed = await page.evaluate(() =>
      [...document.querySelectorAll('input, select, textarea, button')]
        .filter((el) => {
          const control = el as HTMLInputElement;
          const byLabel = control.labels && [...control.labels].some((l) => l.textContent!.trim() !== '');
          const byAria = control.getAttribute('aria-label') || control.getAttribute('aria-labelledby');
          const byText = el.tagName === 'BUTTON' && el.textContent!.trim() !== '';
          return !(byLabel || byAria || byText);
        })
        .map((el) => el.outerHTML.slice(0, 80)),
    );
    // WCAG 2.2 success criterion 4.1.2 (name, role, value): common practice for forms.
    expect(unnamed).toEqual([]);

    await page.locator('body').focus();
    const visited: string[] = [];
    for (let i = 0; i < 80; i++) {
      await page.keyboard.press('Tab');
      const id = await page.evaluate(() => document.activeElement?.id || document.activeElement?.tagName || '');
      visited.push(id);
      if (id === 'submit-button') break;
    }
    expect(visited).toContain('signal-file');
    expect(visited).toContain('recipe-overlap');
    expect(visited.at(-1)).toBe('submit-button');
    // Focus order follows the form: the file before the recipe, the recipe before the button.
    expect(visited.indexOf('signal-file')).toBeLessThan(visited.indexOf('recipe-overlap'));
    await page.screenshot({ path: join(SHOTS, '1-form.png'), fullPage: true });
  });

  it('should show a validation problem beside the field it points at, and queue nothing', async () => {
    await page.setInputFiles('#signal-file', demoFile);
    await page.fill('#recipe-overlap', '50');
    // Submitted from the keyboard.
    await page.focus('#submit-button');
    await page.keyboard.press('Enter');
    const problem = page.locator('#recipe-overlap-problem');
    await problem.waitFor({ state: 'visible' });
    // The server's own words: overlap is a fraction below 1 (README, Recipes).
    expect(await problem.innerText()).toMatch(/overlap|1/);
    expect(await page.getAttribute('#recipe-overlap', 'aria-invalid')).toBe('true');
    expect(await page.getAttribute('#recipe-overlap', 'aria-describedby')).toContain('recipe-overlap-problem');
    // Beside its field: in the same field group, right under the input.
    const sameField = await page.evaluate(() => document.getElementById('recipe-overlap-problem')!.parentElement === document.getElementById('recipe-overlap')!.parentElement);
    expect(sameField).toBe(true);
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('recipe-overlap');
    await page.screenshot({ path: join(SHOTS, '2-problem.png'), fullPage: true });
    const jobs = (await (await fetch(`${base}/v1/jobs`)).json()) as { jobs: unknown[] };
    expect(jobs.jobs).toEqual([]);
  });

  it("should put a binary upload's problem beside the upload setting it names", async () => {
    // 2 channels × 256 little-endian float32 samples, but no sampling rate given.
    const raw = join(session!.work, 'two-channels.f32');
    await writeFile(raw, Buffer.from(new Float32Array(512).map((_, i) => Math.sin(i / 5)).buffer));
    await page.setInputFiles('#signal-file', raw);
    await page.fill('#recipe-overlap', '');
    expect(await page.isVisible('#signal-samplingRate')).toBe(true);
    await page.fill('#signal-channels', 'C3,C4');
    await page.click('#submit-button');
    const problem = page.locator('#signal-samplingRate-problem');
    await problem.waitFor({ state: 'visible' });
    expect(await problem.innerText()).toMatch(/samplingRate/);
    expect(await page.getAttribute('#signal-samplingRate', 'aria-invalid')).toBe('true');
    await page.setInputFiles('#signal-file', demoFile);
    expect(await page.isVisible('#signal-samplingRate')).toBe(false);
  });

  it('should upload the demo recording, submit a Welch recipe and show the job reach succeeded live', async () => {
    await page.evaluate(() => ((window as unknown as { marker: string }).marker = 'not reloaded'));
    // Record every state the list shows, to see the job change without a reload.
    await page.evaluate(() => {
      const seen: string[] = [];
      (window as unknown as { seenStates: string[] }).seenStates = seen;
      new MutationObserver(() => {
        const text = document.querySelector('tbody tr .state-cell')?.textContent;
        if (text && seen.at(-1) !== text) seen.push(text);
      }).observe(document.querySelector('tbody')!, { subtree: true, childList: true, characterData: true });
    });
    await page.fill('#recipe-overlap', '');
    await page.selectOption('#recipe-method', 'welch');
    await page.fill('#job-study', 'night-shift-demo');
    await page.click('#submit-button');
    await expect.poll(() => page.locator('#submit-status').innerText(), { timeout: 20_000 }).toMatch(/Submitted job_[0-9a-f]{32}/);
    const row = page.locator('tbody tr').first();
    await expect.poll(() => row.locator('.state-cell').innerText(), { timeout: 30_000 }).toMatch(/succeeded/);
    expect(await row.innerText()).toMatch(/welch/);
    expect(await row.innerText()).toMatch(/study: night-shift-demo/);
    expect(await page.evaluate(() => (window as unknown as { marker: string }).marker)).toBe('not reloaded');
    const seen = await page.evaluate(() => (window as unknown as { seenStates: string[] }).seenStates);
    expect(seen.at(-1)).toMatch(/succeeded/);
    await page.screenshot({ path: join(SHOTS, '3-list.png'), fullPage: true });
  });

  it('should open the job view with a copyable result hash and a drawn PSD plot', async () => {
    const link = page.locator('tbody tr .job-link').first();
    const jobId = await link.innerText();
    await link.focus();
    await page.keyboard.press('Enter');
    await page.locator('#result-hash').waitFor();
    const job = (await (await fetch(`${base}/v1/jobs/${jobId}`)).json()) as { resultHash: string };
    expect(await page.locator('#result-hash').innerText()).toBe(job.resultHash);
    expect(await page.getByRole('button', { name: 'Copy' }).count()).toBe(1);

    const plot = page.locator('figure[data-plot="psd"] svg');
    await plot.waitFor({ timeout: 20_000 });
    const texts = await plot.locator('text').allTextContents();
    // Axis labels: frequency in Hz, power with its unit (the plots route's contract, issue 13).
    expect(
      texts.some((t) => /Hz/.test(t) && /frequency/i.test(t)),
      texts.join(' | '),
    ).toBe(true);
    expect(
      texts.some((t) => /dB|log/i.test(t) && /\//.test(t)),
      texts.join(' | '),
    ).toBe(true);

    const shot = await plot.screenshot({ path: join(SHOTS, '4-psd.png') });
    // The browser decodes its own screenshot; a blank or white plot has no ink pixels.
    const ink = await page.evaluate(async (base64) => {
      // An <img> with a data: URL (the page's policy allows data: images but not fetching them).
      const image = new Image();
      image.src = `data:image/png;base64,${base64}`;
      await image.decode();
      const bitmap = await createImageBitmap(image);
      const canvas = new OffscreenCanvas(bitmap.width, bitmap.height);
      const context2d = canvas.getContext('2d')!;
      context2d.drawImage(bitmap, 0, 0);
      const { data } = context2d.getImageData(0, 0, bitmap.width, bitmap.height);
      let dark = 0;
      let coloured = 0;
      for (let i = 0; i < data.length; i += 4) {
        const [r, g, b] = [data[i]!, data[i + 1]!, data[i + 2]!];
        if (r + g + b < 600) dark++;
        if (Math.max(r, g, b) - Math.min(r, g, b) > 60) coloured++;
      }
      return { dark, coloured, total: data.length / 4 };
    }, shot.toString('base64'));
    expect(ink.total).toBeGreaterThan(10_000);
    expect(ink.dark / ink.total).toBeGreaterThan(0.01);
    // The spectrum is drawn in colour, not only the grey frame.
    expect(ink.coloured).toBeGreaterThan(200);
    await page.screenshot({ path: join(SHOTS, '5-job.png'), fullPage: true });
  });
  it("should show a study run's progress, its table and its mean PSD per condition", async () => {
    const post = async (path: string, body: unknown) => {
      const res = await fetch(`${base}${path}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
      expect(res.status, await res.clone().text()).toBeLessThan(300);
      return (await res.json()) as { id: string };
    };
    const open = await post('/v1/signals', toUploadJson(demoEpochs('eyes-open', 'late', 4, 4, 1002)));
    const closed = await post('/v1/signals', toUploadJson(demoEpochs('eyes-closed', 'late', 4, 4, 1004)));
    const study = await post('/v1/studies', { name: 'late-shift rest blocks' });
    await post(`/v1/studies/${study.id}/entries`, {
      entries: [
        { signal: open.id, metadata: { subject: 'p01', condition: 'eyes-open' } },
        { signal: closed.id, metadata: { subject: 'p01', condition: 'eyes-closed' } },
      ],
    });
    const run = await post(`/v1/studies/${study.id}/runs`, { recipe: { method: 'welch' } });

    await page.goto(`${base}/#/studies`);
    await page.getByRole('link', { name: 'late-shift rest blocks' }).click();
    const card = page.locator('section.run').first();
    await expect.poll(() => card.locator('.state').first().innerText(), { timeout: 30_000 }).toMatch(/succeeded/);
    expect(await card.innerText()).toMatch(/2 in all: 2 succeeded, 0 failed/);
    expect(await card.locator('h3').innerText()).toContain(run.id);
    const plot = card.locator('figure[data-plot="run-psd"] svg');
    await plot.waitFor({ timeout: 20_000 });
    const texts = (await plot.locator('text').allTextContents()).join(' | ');
    // One group per condition of the entries' metadata.
    expect(texts).toContain('eyes-open');
    expect(texts).toContain('eyes-closed');
    expect(await page.getByRole('button', { name: /Run table/ }).count()).toBe(1);
    await page.screenshot({ path: join(SHOTS, '6-study.png'), fullPage: true });
  });
});

describe.skipIf(!HAVE_CHROMIUM)('when the service asks for API keys', { timeout: 90_000 }, () => {
  const KEY = 'e2e-key-4b1f0c7d9a';
  let keyed: Awaited<ReturnType<typeof startSession>> | undefined;

  beforeAll(async () => {
    keyed = await startSession({ API_KEYS: `lab-e2e:submit:${createHash('sha256').update(KEY).digest('hex')}:browser` });
  }, 60_000);

  afterAll(async () => {
    await keyed?.close();
  });

  it('should say that a key is needed, then use a typed key kept in session storage only', async () => {
    const tab = keyed!.page;
    await expect.poll(() => tab.locator('#filter-problem').innerText(), { timeout: 20_000 }).toMatch(/API key/);
    await tab.fill('#api-key', KEY);
    await tab.press('#api-key', 'Enter');
    await expect.poll(() => tab.locator('#list-status').innerText(), { timeout: 20_000 }).toBe('No jobs match.');
    const storage = await tab.evaluate(() => ({ session: Object.entries(sessionStorage), local: Object.entries(localStorage), field: (document.getElementById('api-key') as HTMLInputElement).value }));
    expect(storage.session).toEqual([['rhythmetric.apiKey', KEY]]);
    expect(storage.local).toEqual([]);
    expect(storage.field).toBe('');
    await tab.click('#forget-key');
    expect(await tab.evaluate(() => sessionStorage.length)).toBe(0);
  });
});
