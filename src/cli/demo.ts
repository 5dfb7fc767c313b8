import { mkdir, writeFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { demoEpochs, demoRecording, toUploadJson, type DemoCondition, type DemoShift } from '../signals/demo-recording.js';

/**
 * `rhythmetric demo [--out DIR]`: writes the invented night-shift study as upload-ready JSON:
 * one continuous recording with block events, and 2 s-epoch files per condition and shift.
 */
export async function runDemoCommand(args: string[]): Promise<number> {
  const at = args.indexOf('--out');
  const out = resolve(at >= 0 && args[at + 1] ? args[at + 1]! : 'demo-data');
  await mkdir(out, { recursive: true });
  const files: string[] = [];
  const write = async (name: string, body: unknown) => {
    await writeFile(join(out, name), JSON.stringify(body));
    files.push(join(out, name));
  };
  await write('night-shift-recording.json', toUploadJson(demoRecording()));
  let seed = 1000;
  for (const shift of ['early', 'late'] as DemoShift[]) {
    for (const condition of ['eyes-open', 'eyes-closed'] as DemoCondition[]) {
      await write(`${condition}-${shift}.json`, toUploadJson(demoEpochs(condition, shift, 10, 4, seed++)));
    }
  }
  process.stdout.write(`wrote the invented night-shift demo study:\n${files.map((f) => `  ${f}`).join('\n')}\n`);
  return 0;
}
