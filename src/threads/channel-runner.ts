/**
 * The channel runner that spreads a job's channels over threads: the calling thread and up to
 * `threads − 1` helper threads (channel-helper.ts) take channels one at a time from a shared counter
 * until none are left.
 *
 * The calling thread stays synchronous: the samples go to the helpers once, in shared memory, each
 * helper reports a finished channel through its own message port, and the calling thread collects
 * those reports with `receiveMessageOnPort` while it waits on a shared completion counter. A channel
 * is computed by the same kernel on the same samples whichever thread takes it
 * (engine/channel-runner.ts), so the outcome does not depend on the thread count.
 *
 * Helper threads are kept for the next job and end after {@link HELPER_IDLE_MS} without work. They
 * never keep the process alive.
 */
import { MessageChannel, receiveMessageOnPort, type MessagePort, type Worker } from 'node:worker_threads';
import { kernelOf, trialOf, type ChannelRunner, type ChannelTask } from '../engine/channel-runner.js';
import { EngineInputError } from '../engine/errors.js';
import { defaultThreadCount, takeHelperSlots, type ThreadBudget } from './budget.js';
import { startThread, threadEntry } from './entry.js';

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

/** What the calling thread posts to a helper for one job. */
export interface HelperTask {
  task: ChannelTask;
  /** the signal's samples in [epoch][channel][sample] order, on a SharedArrayBuffer */
  data: Float64Array;
  control: Int32Array;
  port: MessagePort;
}

/** What a helper posts back: one finished channel, or why it stopped. */
export type HelperReport = { c: number; outcome: unknown } | { error: { name: string; message: string; code?: string; pointer?: string | null } };

export interface ChannelRunnerOptions {
  /** threads one job may use, the calling one included. @defaultValue the CPU count */
  threads?: number;
  /** the process's thread budget; helpers are taken only from its free slots */
  budget?: ThreadBudget;
}

/**
 * A channel runner on up to `threads` threads, the calling one included. Give it to
 * `analyze(…, { channels })`; with `threads` 1 it computes everything on the calling thread.
 */
export function createChannelRunner(options: ChannelRunnerOptions = {}): ChannelRunner {
  const threads = Math.max(1, Math.floor(options.threads ?? options.budget?.threads ?? defaultThreadCount()));
  return {
    threads,
    run(task, signal, context, here) {
      const kernel = kernelOf(task);
      const { setup } = task;
      const work = here ?? kernel.prepare(setup);
      const C = setup.channels.length;
      const total = C * setup.used.length;
      const wanted = Math.max(0, Math.min(threads - 1, C - 1));
      const slots = options.budget ? takeHelperSlots(options.budget, wanted) : { count: wanted, release: () => {} };
      const helperCount = slots.count;
      // Without helpers the same loop runs on a private counter and nothing is copied or posted.
      const control = new Int32Array(helperCount > 0 ? new SharedArrayBuffer(CONTROL_SLOTS * 4) : new ArrayBuffer(CONTROL_SLOTS * 4));
      const data = helperCount > 0 ? sharedSamples(signal.data) : signal.data;
      const ports =
        helperCount === 0
          ? []
          : helperThreads(helperCount).map((worker) => {
              const { port1, port2 } = new MessageChannel();
              const message: HelperTask = { task, data, control, port: port2 };
              worker.postMessage(message, [port2]);
              return port1;
            });
      const outcomes: unknown[] = new Array(C);
      const reported = new Array<boolean>(C).fill(false);
      const contributed = new Set<MessagePort | null>();
      const drain = () => {
        for (const port of ports) {
          for (let m = receiveMessageOnPort(port); m !== undefined; m = receiveMessageOnPort(port)) {
            const report = m.message as HelperReport;
            if ('error' in report) throw rebuildError(report.error);
            outcomes[report.c] = report.outcome;
            reported[report.c] = true;
            contributed.add(port);
          }
        }
      };
      const progress = () => context.onProgress?.(Atomics.load(control, TRIALS) / total);
      try {
        for (let c = Atomics.add(control, NEXT, 1); c < C; c = Atomics.add(control, NEXT, 1)) {
          outcomes[c] = kernel.compute(setup, work, c, trialOf(setup, signal.data, c), () => {
            context.checkpoint?.();
            progress();
            Atomics.add(control, TRIALS, 1);
          });
          reported[c] = true;
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
            throw new Error(`channel helper threads made no progress for ${STALL_MS / 1000} s`);
          }
        }
        // A report is posted before its channel is counted, so every one is here; wait briefly anyway.
        for (let waited = 0; reported.includes(false) && waited < STALL_MS; waited += POLL_MS) {
          drain();
          if (reported.includes(false)) Atomics.wait(control, ABORT, 0, POLL_MS);
        }
        if (reported.includes(false)) throw new Error('a channel helper thread counted a channel it never reported');
        context.onProgress?.(1);
        return { outcomes, threads: contributed.size };
      } finally {
        // Stops the helpers at their next trial when this thread gave up (checkpoint or error).
        Atomics.store(control, ABORT, 1);
        for (const port of ports) port.close();
        slots.release();
        if (ports.length > 0) endHelpersWhenIdle();
      }
    },
  };
}

function sharedSamples(data: Float64Array): Float64Array {
  if (data.buffer instanceof SharedArrayBuffer) return data;
  const shared = new Float64Array(new SharedArrayBuffer(data.byteLength));
  shared.set(data);
  return shared;
}

function rebuildError(e: { name: string; message: string; code?: string; pointer?: string | null }): Error {
  if (e.name === 'EngineInputError') return new EngineInputError(e.code as 'no-usable-epochs' | 'non-finite', e.message, e.pointer ?? null);
  const error = new Error(`channel helper thread: ${e.message}`);
  error.name = e.name;
  return error;
}

const helpers: Worker[] = [];
let idleTimer: NodeJS.Timeout | undefined;

/** `count` helper threads, started when missing, kept until {@link HELPER_IDLE_MS} without work. */
function helperThreads(count: number): Worker[] {
  while (helpers.length < count) {
    const worker = startThread(threadEntry(import.meta.url, 'channel-helper'));
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

function endHelpersWhenIdle(): void {
  clearTimeout(idleTimer);
  idleTimer = setTimeout(() => {
    for (const worker of helpers.splice(0)) void worker.terminate();
  }, HELPER_IDLE_MS);
  idleTimer.unref();
}
