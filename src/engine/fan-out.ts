/**
 * Time–frequency channels spread over threads: the job's own thread and up to `threads − 1` helper
 * threads (tf-helper.ts) take channels one at a time from a shared counter until none are left.
 *
 * The job's thread stays synchronous: the samples go to the helpers once, in shared memory, each
 * helper reports a finished channel through its own message port, and the job's thread collects
 * those reports with `receiveMessageOnPort` while it waits on a shared completion counter. A channel
 * is computed by the same function on the same samples whichever thread takes it
 * (tf-channels.ts), so the outcome does not depend on the thread count.
 *
 * Helper threads are kept for the next job and end after {@link HELPER_IDLE_MS} without work. They
 * never keep the process alive.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { MessageChannel, receiveMessageOnPort, Worker, type MessagePort } from 'node:worker_threads';
import { channelView, type Signal } from '../signals/signal.js';
import { EngineInputError } from './errors.js';
import { computeChannel, type ChannelOutcome, type ChannelSetup, type ChannelWork } from './tf-channels.js';

/** Slots of the shared control array. */
export const NEXT = 0;
export const COMPLETED = 1;
export const TRIALS = 2;
export const ABORT = 3;
const CONTROL_SLOTS = 4;

/** Helper threads that have had no work for this long are ended. */
const HELPER_IDLE_MS = 30_000;
/** With no trial finished on any thread for this long, the helpers are taken to be lost. */
const STALL_MS = 120_000;
const POLL_MS = 50;

/** What the job's thread posts to a helper for one job. */
export interface HelperTask {
  setup: ChannelSetup;
  /** the signal's samples in [epoch][channel][sample] order, on a SharedArrayBuffer */
  data: Float64Array;
  control: Int32Array;
  port: MessagePort;
}

/** What a helper posts back: one finished channel, or why it stopped. */
export type HelperReport =
  | { c: number; outcome: ChannelOutcome }
  | { error: { name: string; message: string; code?: string; pointer?: string | null } };

export interface FanOutContext {
  /** threads for this job, the calling one included; 1 computes everything here */
  threads: number;
  onProgress?: (fraction: number) => void;
  /** called before each trial on this thread; throw from it to abandon the job */
  checkpoint?: () => void;
}

/**
 * Every channel's outcome, in channel order, and how many threads computed at least one channel
 * (a helper that is slow to start, or fails to, leaves its share to the others).
 *
 * @param setup - recipe, axes and the used epochs (plain data, posted to the helpers)
 * @param work - this thread's plan, from createChannelWork(setup)
 * @param signal - the prepared signal the epochs index into
 * @param context - thread count, progress (fraction of trials done on all threads) and checkpoint
 */
export function computeChannels(setup: ChannelSetup, work: ChannelWork, signal: Signal, context: FanOutContext): { outcomes: ChannelOutcome[]; threads: number } {
  const C = setup.channels.length;
  const total = C * setup.used.length;
  const helperCount = Math.max(0, Math.min(Math.floor(context.threads) - 1, C - 1));
  // Without helpers the same loop runs on a private counter and nothing is copied or posted.
  const control = new Int32Array(helperCount > 0 ? new SharedArrayBuffer(CONTROL_SLOTS * 4) : new ArrayBuffer(CONTROL_SLOTS * 4));
  const data = helperCount > 0 ? sharedSamples(signal.data) : signal.data;
  const ports = helperCount === 0 ? [] : helperThreads(helperCount).map((worker) => {
    const { port1, port2 } = new MessageChannel();
    const task: HelperTask = { setup, data, control, port: port2 };
    worker.postMessage(task, [port2]);
    return port1;
  });
  const outcomes: (ChannelOutcome | undefined)[] = new Array(C);
  const contributed = new Set<MessagePort | null>();
  const drain = () => {
    for (const port of ports) {
      for (let m = receiveMessageOnPort(port); m !== undefined; m = receiveMessageOnPort(port)) {
        const report = m.message as HelperReport;
        if ('error' in report) throw rebuildError(report.error);
        outcomes[report.c] = report.outcome;
        contributed.add(port);
      }
    }
  };
  const progress = () => context.onProgress?.(Atomics.load(control, TRIALS) / total);
  try {
    for (let c = Atomics.add(control, NEXT, 1); c < C; c = Atomics.add(control, NEXT, 1)) {
      outcomes[c] = computeChannel(setup, work, c, (i) => channelView(signal, setup.used[i]!, c), () => {
        context.checkpoint?.();
        progress();
        Atomics.add(control, TRIALS, 1);
      });
      contributed.add(null);
      Atomics.add(control, COMPLETED, 1);
      drain();
    }
    let seenTrials = Atomics.load(control, TRIALS);
    let lastChange = performance.now();
    for (let completed = Atomics.load(control, COMPLETED); completed < C; completed = Atomics.load(control, COMPLETED)) {
      Atomics.wait(control, COMPLETED, completed, POLL_MS);
      drain();
      context.checkpoint?.();
      progress();
      const trials = Atomics.load(control, TRIALS);
      if (trials !== seenTrials) {
        seenTrials = trials;
        lastChange = performance.now();
      } else if (performance.now() - lastChange > STALL_MS) {
        throw new Error(`time–frequency helper threads made no progress for ${STALL_MS / 1000} s`);
      }
    }
    // A report is posted before its channel is counted, so every one is here; wait briefly anyway.
    for (let waited = 0; outcomes.includes(undefined) && waited < STALL_MS; waited += POLL_MS) {
      drain();
      if (outcomes.includes(undefined)) Atomics.wait(control, ABORT, 0, POLL_MS);
    }
    if (outcomes.includes(undefined)) throw new Error('a time–frequency helper thread counted a channel it never reported');
    context.onProgress?.(1);
    return { outcomes: outcomes as ChannelOutcome[], threads: contributed.size };
  } finally {
    // Stops the helpers at their next trial when this thread gave up (checkpoint or error).
    Atomics.store(control, ABORT, 1);
    for (const port of ports) port.close();
    if (ports.length > 0) endHelpersWhenIdle();
  }
}

function sharedSamples(data: Float64Array): Float64Array {
  if (data.buffer instanceof SharedArrayBuffer) return data;
  const shared = new Float64Array(new SharedArrayBuffer(data.byteLength));
  shared.set(data);
  return shared;
}

function rebuildError(e: { name: string; message: string; code?: string; pointer?: string | null }): Error {
  if (e.name === 'EngineInputError') return new EngineInputError(e.code as 'no-usable-epochs' | 'non-finite', e.message, e.pointer ?? null);
  const error = new Error(`time–frequency helper thread: ${e.message}`);
  error.name = e.name;
  return error;
}

const helpers: Worker[] = [];
let idleTimer: NodeJS.Timeout | undefined;

/** `count` helper threads, started when missing, kept until {@link HELPER_IDLE_MS} without work. */
function helperThreads(count: number): Worker[] {
  const fromSource = import.meta.url.endsWith('.ts');
  const entry = new URL(fromSource ? './tf-helper.ts' : './tf-helper.js', import.meta.url).href;
  while (helpers.length < count) {
    // From the sources (tsx, vitest) the entry goes through tsx's own importer: a `.ts` file given
    // as a worker's main module is loaded before any `--import` loader is in place.
    const worker = fromSource
      ? new Worker(`import(${JSON.stringify(tsxImporter())}).then(({ tsImport }) => tsImport(${JSON.stringify(entry)}, ${JSON.stringify(entry)}));`, { eval: true })
      : new Worker(new URL(entry));
    worker.unref();
    const forget = () => {
      const at = helpers.indexOf(worker);
      if (at >= 0) helpers.splice(at, 1);
    };
    worker.on('error', forget);
    worker.on('exit', forget);
    helpers.push(worker);
  }
  clearTimeout(idleTimer);
  return helpers.slice(0, count);
}

/** The URL of tsx's ESM API (`tsImport`), from its package manifest (sources only: tsx is a dev dependency). */
function tsxImporter(): string {
  const manifest = createRequire(import.meta.url).resolve('tsx/package.json');
  const { exports } = JSON.parse(readFileSync(manifest, 'utf8')) as { exports: Record<string, { import: { default: string } }> };
  return pathToFileURL(join(dirname(manifest), exports['./esm/api']!.import.default)).href;
}

function endHelpersWhenIdle(): void {
  clearTimeout(idleTimer);
  idleTimer = setTimeout(() => {
    for (const worker of helpers.splice(0)) void worker.terminate();
  }, HELPER_IDLE_MS);
  idleTimer.unref();
}
