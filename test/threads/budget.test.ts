import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config.js';
import { createThreadBudget, takeHelperSlots, takeJobSlot } from '../../src/threads/budget.js';

describe('when jobs and their helpers share one thread budget', () => {
  it('should give helpers only the free slots and take them back once', () => {
    const budget = createThreadBudget(4);
    const job = takeJobSlot(budget);
    const helpers = takeHelperSlots(budget, 5);
    expect(helpers.count).toBe(3);
    expect(takeHelperSlots(budget, 1).count).toBe(0);
    helpers.release();
    helpers.release();
    job();
    expect(budget.free[0]).toBe(4);
  });

  it('should still give a job its own thread when helpers hold every slot', () => {
    const budget = createThreadBudget(2);
    const helpers = takeHelperSlots(budget, 2);
    const job = takeJobSlot(budget);
    expect(budget.free[0]).toBe(-1);
    helpers.release();
    job();
    expect(budget.free[0]).toBe(2);
  });
});

describe('when the thread settings are configured', () => {
  it('should use THREADS for jobs at once and threads per job, with no deprecation', () => {
    const config = loadConfig({ THREADS: '3' });
    expect(config).toMatchObject({ threads: 3, workerThreads: 3, jobThreads: 3, deprecations: [] });
  });

  it('should still honour WORKER_THREADS and JOB_THREADS for one version, each with a deprecation', () => {
    const config = loadConfig({ WORKER_THREADS: '2', JOB_THREADS: '4' });
    expect(config).toMatchObject({ threads: 4, workerThreads: 2, jobThreads: 4 });
    expect(config.deprecations).toHaveLength(2);
    expect(config.deprecations.join(' ')).toMatch(/WORKER_THREADS.*THREADS[\s\S]*JOB_THREADS/);
  });

  it('should let THREADS set the budget beside a deprecated cap', () => {
    expect(loadConfig({ THREADS: '8', JOB_THREADS: '2' })).toMatchObject({ threads: 8, workerThreads: 8, jobThreads: 2 });
  });
});
