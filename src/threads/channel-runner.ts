/**
 * The channel runner that spreads a job's channels over threads: the calling thread and up to
 * `threads − 1` helper threads (channel-helper.ts) compute channels until none are left.
 *
 * The calling thread stays synchronous and is the only one that reads samples: it reads a channel's
 * rows from the job's {@link ChannelSource} and posts them (a copy) to a helper that has fewer than
 * {@link QUEUED_PER_HELPER} channels waiting, or computes the channel itself when every helper is
 * busy. So a job holds at most (helpers × {@link QUEUED_PER_HELPER} + 1) channels' rows at once,
 * never the whole signal. Each helper reports a finished channel through its own message port, and
 * the calling thread collects those reports with `receiveMessageOnPort` (between its own trials, and
 * while it waits on a shared completion counter). A channel is computed by the same kernel on the
 * same samples whichever thread takes it (engine/channel-runner.ts), so the outcome does not depend
 * on the thread count.
 *
 * Helper threads are kept for the next job and end after {@link HELPER_IDLE_MS} without work. They
 * never keep the process alive.
 */
import { MessageChannel, receiveMessageOnPort, type MessagePort, type Worker } from 'node:worker_threads';
import { kernelOf, trialsOf, type ChannelRunner, type ChannelTask } from '../engine/channel-runner.js';
import { EngineInputError } from '../engine/errors.js';
import { defaultThreadCount, takeHelperSlots, type ThreadBudget } from './budget.js';
import { startThread, threadEntry } from './entry.js';

/** Slots of the shared control array. */
export const COMPLETED = 1;
export const TRIALS = 2;
export const ABORT = 3;
const CONTROL_SLOTS = 4;

/** Channels posted to a helper and not yet reported: one it computes and one waiting, so it never idles while the calling thread computes. */
const QUEUED_PER_HELPER = 2;
/** Helper threads that have had no work for this long are ended. */
const HELPER_IDLE_MS = 30_000;
/** With no trial finished on any thread for this long, the helpers are taken to be lost. */
const STALL_MS = 120_000;
const POLL_MS = 50;

/** What the calling thread posts to a helper once per job; channels follow on `port`. */
export interface HelperTask {
  task: ChannelTask;
  control: Int32Array;
  port: MessagePort;
}

/** One channel posted to a helper: its rows, [epoch][sample] for every epoch of the prepared signal. */
export interface HelperChannel {
  c: number;
  rows: Float64Array;
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
    run(task, source, context, here) {
      const kernel = kernelOf(task);
      const { setup } = task;
      const work = here ?? kernel.prepare(setup);
      const C = setup.channels.length;
      const total = C * setup.used.length;
      const wanted = Math.max(0, Math.min(threads - 1, C - 1));
      const slots = options.budget ? takeHelperSlots(options.budget, wanted) : { count: wanted, release: () => {} };
      const helperCount = slots.count;
      // Without helpers the same loop runs with a private control array and nothing is posted.
      const control = new Int32Array(helperCount > 0 ? new SharedArrayBuffer(CONTROL_SLOTS * 4) : new ArrayBuffer(CONTROL_SLOTS * 4));
      const ports =
        helperCount === 0
          ? []
          : helperThreads(helperCount).map((worker) => {
              const { port1, port2 } = new MessageChannel();
              const message: HelperTask = { task, control, port: port2 };
              worker.postMessage(message, [port2]);
              return port1;
            });
      const waiting = ports.map(() => 0);
      const outcomes: unknown[] = new Array(C);
      const reported = new Array<boolean>(C).fill(false);
      let reportedCount = 0;
      const contributed = new Set<number>();
      let next = 0;
      const drain = () => {
        ports.forEach((port, h) => {
          for (let m = receiveMessageOnPort(port); m !== undefined; m = receiveMessageOnPort(port)) {
            const report = m.message as HelperReport;
            if ('error' in report) throw rebuildError(report.error);
            outcomes[report.c] = report.outcome;
            reported[report.c] = true;
            reportedCount++;
            waiting[h]!--;
            contributed.add(h);
          }
        });
      };
      // Tops up every helper's queue; the rows are read here, on the calling thread, and posted as a copy.
      const handOut = () => {
        ports.forEach((port, h) => {
          while (waiting[h]! < QUEUED_PER_HELPER && next < C) {
            const message: HelperChannel = { c: next, rows: source.channel(next) };
            port.postMessage(message);
            waiting[h]!++;
            next++;
          }
        });
      };
      const progress = () => context.onProgress?.(Atomics.load(control, TRIALS) / total);
      try {
        handOut();
        while (next < C) {
          const c = next++;
          outcomes[c] = kernel.compute(setup, work, c, trialsOf(setup, source.channel(c)), () => {
            context.checkpoint?.();
            progress();
            Atomics.add(control, TRIALS, 1);
            if (ports.length > 0) {
              drain();
              handOut();
            }
          });
          reported[c] = true;
          reportedCount++;
          contributed.add(-1);
          drain();
          handOut();
        }
        let seenTrials = Atomics.load(control, TRIALS);
        let lastChange = performance.now();
        while (reportedCount < C) {
          Atomics.wait(control, COMPLETED, Atomics.load(control, COMPLETED), POLL_MS);
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
