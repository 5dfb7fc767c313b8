import { DomainError, toProblem, type Problem } from '../common/errors.js';

/**
 * A failure the input causes fails again on every retry, so it ends the job at once with its
 * problem; anything else (a crashed thread, a lost connection) is retried. Null for the latter.
 */
export function refusalOf(error: unknown): Problem | null {
  return error instanceof DomainError ? toProblem(error).problem : null;
}

/** The problem of a job whose every attempt failed for a reason outside its input. */
export function crashProblem(attempts: number, lastError: unknown): Problem {
  const reason = lastError instanceof Error ? lastError.message : String(lastError);
  return toProblem(new DomainError('worker-crashed', `the computation failed ${attempts} time(s); last error: ${reason}`)).problem;
}
