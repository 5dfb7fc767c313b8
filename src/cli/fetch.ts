import { EXIT, UsageError, writeFileAtomic } from './output.js';
import { requireClient, type ServerOptions } from './sources.js';

async function deliver(bytes: Uint8Array | string, out: string | undefined, binary: boolean): Promise<number> {
  if (out) {
    await writeFileAtomic(out, bytes);
    return EXIT.ok;
  }
  if (binary && process.stdout.isTTY) throw new UsageError('this is a binary file: give --out PATH, or redirect standard output');
  process.stdout.write(bytes);
  return EXIT.ok;
}

/** `rhythmetric record JOB`: the record as the server stores it. */
export async function runRecord(job: string, options: ServerOptions & { out?: string }): Promise<number> {
  const text = await requireClient(options).getRecordText(job);
  return deliver(text.endsWith('\n') ? text : text + '\n', options.out, false);
}

/** `rhythmetric plot JOB KIND`: a picture of a job's record, drawn by the server. */
export async function runPlot(job: string, kind: string, options: ServerOptions & { out?: string; channels?: string; width?: number; height?: number }): Promise<number> {
  const query = { channels: options.channels, width: options.width, height: options.height };
  const file = await requireClient(options).getJobFile('/v1/jobs/{id}/plots/{kind}', { id: job, kind }, query);
  return deliver(file.bytes, options.out, !file.contentType.startsWith('image/svg'));
}

/** `rhythmetric table JOB`: a job's record as a table (CSV or Parquet), made by the server. */
export async function runTable(job: string, options: ServerOptions & { out?: string; level?: string; format: string }): Promise<number> {
  const bytes = await requireClient(options).getJobTable(job, { ...(options.level ? { level: options.level } : {}), format: options.format });
  return deliver(bytes, options.out, options.format !== 'csv');
}
