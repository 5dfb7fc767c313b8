/**
 * Entry of a channel helper thread (started by channel-runner.ts). For each job it receives the
 * task once, then channels on the job's port, one message each with that channel's rows; it
 * computes each and reports it on the port before counting it as completed.
 */
import { parentPort } from 'node:worker_threads';
import { kernelOf, trialsOf } from '../engine/channel-runner.js';
import { ABORT, COMPLETED, TRIALS, type HelperChannel, type HelperReport, type HelperTask } from './channel-runner.js';

/** Thrown inside a trial loop when the calling thread has given up; ends the task quietly. */
class Abandoned extends Error {}

function start({ task, control, port }: HelperTask): void {
  const kernel = kernelOf(task);
  const { setup } = task;
  let work: unknown;
  let failed = false;
  port.on('message', ({ c, rows }: HelperChannel) => {
    if (failed || Atomics.load(control, ABORT) !== 0) return;
    try {
      work ??= kernel.prepare(setup);
      // The rows arrive as this thread's own copy (not shared memory, on which the estimators ran
      // about half as fast), so trials are read from them in place.
      const outcome = kernel.compute(setup, work, c, trialsOf(setup, rows), () => {
        if (Atomics.load(control, ABORT) !== 0) throw new Abandoned();
        Atomics.add(control, TRIALS, 1);
      });
      const report: HelperReport = { c, outcome };
      // Copied, not transferred: detaching an ArrayBuffer makes V8 drop an assumption its optimized
      // typed-array code relies on for the rest of the thread's life, and this thread's FFTs ran
      // about 20 % slower after its first transfer (measured). A copy of a channel's outcome is
      // a fraction of a millisecond.
      port.postMessage(report);
      Atomics.add(control, COMPLETED, 1);
      Atomics.notify(control, COMPLETED);
    } catch (error) {
      if (error instanceof Abandoned) return;
      failed = true;
      const e = error instanceof Error ? error : new Error(String(error));
      const details = e as Error & { code?: string; pointer?: string | null };
      const report: HelperReport = {
        error: { name: e.name, message: e.message, ...(details.code !== undefined ? { code: details.code } : {}), ...(details.pointer !== undefined ? { pointer: details.pointer } : {}) },
      };
      port.postMessage(report);
      Atomics.add(control, COMPLETED, 1);
      Atomics.notify(control, COMPLETED);
    }
  });
}

parentPort?.on('message', start);
