/**
 * Entry of a channel helper thread (started by channel-runner.ts). For each posted job it takes
 * channels from the shared counter until none are left, and reports each finished channel on the
 * job's port before counting it as completed.
 */
import { parentPort } from 'node:worker_threads';
import { kernelOf, trialOf } from '../engine/channel-runner.js';
import { ABORT, COMPLETED, NEXT, TRIALS, type HelperReport, type HelperTask } from './channel-runner.js';

/** Thrown inside a trial loop when the calling thread has given up; ends the task quietly. */
class Abandoned extends Error {}

function run({ task, data, control, port }: HelperTask): void {
  try {
    const kernel = kernelOf(task);
    const { setup } = task;
    const C = setup.channels.length;
    const work = kernel.prepare(setup);
    for (let c = Atomics.add(control, NEXT, 1); c < C && Atomics.load(control, ABORT) === 0; c = Atomics.add(control, NEXT, 1)) {
      const shared = trialOf(setup, data, c);
      // Each trial is copied out of shared memory first: the estimators ran about half as fast on a
      // SharedArrayBuffer-backed array as on a copy (Welch, 300 000 samples: 15 vs 8 ms, measured),
      // and a copy of one trial costs a fraction of that. The values, and so the outcome, are the same.
      const outcome = kernel.compute(
        setup,
        work,
        c,
        (i) => shared(i).slice(),
        () => {
          if (Atomics.load(control, ABORT) !== 0) throw new Abandoned();
          Atomics.add(control, TRIALS, 1);
        },
      );
      const report: HelperReport = { c, outcome };
      // Copied, not transferred: detaching an ArrayBuffer makes V8 drop an assumption its optimized
      // typed-array code relies on for the rest of the thread's life, and this thread's FFTs ran
      // about 20 % slower after its first transfer (measured). A copy of a channel's outcome is
      // a fraction of a millisecond.
      port.postMessage(report);
      Atomics.add(control, COMPLETED, 1);
      Atomics.notify(control, COMPLETED);
    }
  } catch (error) {
    if (error instanceof Abandoned) return;
    const e = error instanceof Error ? error : new Error(String(error));
    const details = e as Error & { code?: string; pointer?: string | null };
    const report: HelperReport = {
      error: { name: e.name, message: e.message, ...(details.code !== undefined ? { code: details.code } : {}), ...(details.pointer !== undefined ? { pointer: details.pointer } : {}) },
    };
    port.postMessage(report);
    Atomics.notify(control, COMPLETED);
  } finally {
    port.close();
  }
}

parentPort?.on('message', run);
