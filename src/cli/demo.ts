import { mkdir, writeFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { createRandom } from '../common/random.js';
import { signalIdFromHash, signalSha256 } from '../signals/content-hash.js';
import { decodeJsonSignal, type JsonSignalBody } from '../signals/decode-json.js';
import { demoEpochs, demoRecording, toUploadJson, type DemoCondition, type DemoShift } from '../signals/demo-recording.js';
import { DEFAULT_SIGNAL_LIMITS } from '../signals/limits.js';

const CONDITIONS: DemoCondition[] = ['eyes-open', 'eyes-closed'];
const SHIFTS: DemoShift[] = ['early', 'late'];

/**
 * The invented study: 12 invented participants × eyes open/closed × early/late in the shift, one
 * short recording each (five 2 s epochs), and its manifest. The manifest names each recording by
 * the signal id it gets when `tenant` uploads it (ids follow from content and tenant), and
 * `recordings.csv` maps the files to the same rows for pipelines that upload first.
 */
async function writeDemoStudy(out: string, tenant: string): Promise<string[]> {
  const dir = join(out, 'study');
  await mkdir(join(dir, 'recordings'), { recursive: true });
  const random = createRandom(20261203);
  const manifest = ['signal,subject,session,condition,age:number'];
  const files = ['file,subject,session,condition,age:number'];
  let seed = 5000;
  for (let p = 1; p <= 12; p++) {
    const subject = `p${String(p).padStart(2, '0')}`;
    const age = 22 + Math.floor(random.uniform() * 30);
    for (const session of SHIFTS) {
      for (const condition of CONDITIONS) {
        const text = JSON.stringify(toUploadJson(demoEpochs(condition, session, 5, 2, seed++)));
        const name = `${subject}-${session}-${condition}.json`;
        await writeFile(join(dir, 'recordings', name), text);
        // The id the server will give this upload: the hash of the samples as it decodes the file's
        // text (which has lost, for one, the sign of a rounded -0).
        const id = signalIdFromHash(signalSha256(decodeJsonSignal(JSON.parse(text) as JsonSignalBody, DEFAULT_SIGNAL_LIMITS)), tenant);
        manifest.push(`${id},${subject},${session},${condition},${age}`);
        files.push(`recordings/${name},${subject},${session},${condition},${age}`);
      }
    }
  }
  await writeFile(join(dir, 'manifest.csv'), `${manifest.join('\r\n')}\r\n`);
  await writeFile(join(dir, 'recordings.csv'), `${files.join('\r\n')}\r\n`);
  return [join(dir, 'manifest.csv'), join(dir, 'recordings.csv'), join(dir, 'recordings', `(${manifest.length - 1} files)`)];
}

/**
 * `rhythmetric demo [--out DIR] [--tenant NAME]`: writes the invented night-shift study as
 * upload-ready JSON: one continuous recording with block events, 2 s-epoch files per condition and
 * shift, and a small study of 48 recordings with its manifest (signal ids for `--tenant`, default
 * the open-mode tenant "public").
 */
export async function runDemoCommand(args: string[]): Promise<number> {
  const option = (name: string) => {
    const at = args.indexOf(name);
    return at >= 0 ? args[at + 1] : undefined;
  };
  const out = resolve(option('--out') ?? 'demo-data');
  const tenant = option('--tenant') ?? 'public';
  await mkdir(out, { recursive: true });
  const files: string[] = [];
  const write = async (name: string, body: unknown) => {
    await writeFile(join(out, name), JSON.stringify(body));
    files.push(join(out, name));
  };
  await write('night-shift-recording.json', toUploadJson(demoRecording()));
  let seed = 1000;
  for (const shift of SHIFTS) {
    for (const condition of CONDITIONS) {
      await write(`${condition}-${shift}.json`, toUploadJson(demoEpochs(condition, shift, 10, 4, seed++)));
    }
  }
  files.push(...(await writeDemoStudy(out, tenant)));
  process.stdout.write(`wrote the invented night-shift demo study:\n${files.map((f) => `  ${f}`).join('\n')}\n`);
  return 0;
}
