import { z } from 'zod';
import { JOB_STATES } from '../jobs/spec.js';
import { RecipeSchema } from '../recipes/schema.js';

export const ProblemSchema = z
  .looseObject({
    type: z.string().describe('stable URI of the problem kind, e.g. /problems/invalid-recipe (GET it for documentation)'),
    title: z.string(),
    status: z.number().int(),
    detail: z.string().describe('what is wrong, in words'),
    pointer: z.string().optional().describe('RFC 6901 JSON pointer to the offending input (/query/… for query parameters)'),
    requestId: z.string().optional().describe('the x-request-id of the answer'),
    accepted: z.array(z.string()).optional().describe('unsupported-media-type: the content types the route reads'),
    allowed: z.array(z.string()).optional().describe('method-not-allowed: the methods the path answers (also in Allow)'),
  })
  .meta({ id: 'Problem', description: 'RFC 9457 problem details; further members (extensions) may appear, as RFC 9457 §3.2 allows.' });

export function problemResponse(description: string) {
  return { description, content: { 'application/problem+json': { schema: ProblemSchema } } };
}

export const EventSchema = z.strictObject({
  onset: z.number().describe('seconds from the start'),
  duration: z.number().min(0).nullable().describe('seconds, or null for a marker'),
  label: z.string().min(1).max(200),
});

/** Events of a signal, as every upload form takes them. */
export const EventListSchema = z.array(EventSchema).max(100_000);

/** A binary upload's events: the same list as in a JSON upload, as JSON text in one query parameter. */
const EventsQuery = z
  .string()
  .transform((text, ctx) => {
    try {
      return JSON.parse(text) as unknown;
    } catch (error) {
      ctx.addIssue({ code: 'custom', message: `events must be a JSON array of {onset, duration, label}: ${(error as Error).message}` });
      return z.NEVER;
    }
  })
  .pipe(EventListSchema);

const SampleRows = z.array(z.array(z.number().nullable()));

/** The documented upload body. */
export const SignalUploadSchema = z
  .strictObject({
    samplingRate: z.number().positive().describe('Hz'),
    channels: z.array(z.string()).min(1).describe('channel names, e.g. 10–20 labels'),
    unit: z.string().min(1).max(32).optional().describe('physical unit of the samples: nV, uV (µV), mV or V, stored as uV; any other unit needs "voltage": false; default uV'),
    voltage: z.boolean().optional().describe('false when the samples are not a voltage: the unit is then kept as given and nothing is converted; default true'),
    data: SampleRows.optional().describe('continuous chunk, channel × sample'),
    epochs: z.array(SampleRows).optional().describe('epoch × channel × sample'),
    events: EventListSchema.optional(),
    nonFinite: z.enum(['reject', 'keep']).optional().describe('null samples: refuse (default) or keep as gaps'),
  })
  .meta({ id: 'SignalUpload' });

/**
 * One channel's samples, checked only for being an array: an element-wise zod pass over a small
 * job's 16 000 samples cost more than a millisecond per request, and the decoder checks them all.
 */
const SampleRowEnvelope = z.custom<unknown[]>((row) => Array.isArray(row), 'Invalid input: expected array (one channel of samples)');

/**
 * What the upload route validates with zod: everything but the sample arrays, which can hold
 * millions of numbers and are checked element by element by the decoder instead.
 */
export const SignalUploadEnvelope = SignalUploadSchema.extend({
  data: z.array(SampleRowEnvelope).optional(),
  epochs: z.array(z.array(SampleRowEnvelope)).optional(),
});

export const BinaryUploadQuery = z.strictObject({
  samplingRate: z.coerce.number().positive().describe('Hz'),
  channels: z
    .string()
    .min(1)
    .transform((s) => s.split(',').map((c) => c.trim()))
    .describe('comma-separated channel names'),
  epochCount: z.coerce.number().int().min(1).default(1),
  unit: z.string().min(1).max(32).optional(),
  voltage: z
    .enum(['true', 'false'])
    .transform((v) => v === 'true')
    .optional(),
  nonFinite: z.enum(['reject', 'keep']).optional(),
  format: z.literal('float32').optional().describe('binary layout; float32 little-endian [epoch][channel][sample]'),
  events: EventsQuery.optional(),
});

/** Query of an EDF/EDF+ upload: optional selection of channels (by label) or of one sampling rate. */
export const EdfUploadQuery = z.strictObject({
  format: z.literal('edf'),
  channels: z
    .string()
    .min(1)
    .transform((s) => s.split(',').map((c) => c.trim()))
    .optional()
    .describe('comma-separated labels to keep; default all ordinary signals'),
  samplingRate: z.coerce.number().positive().optional().describe('keep the signals of this rate (files with several rates)'),
});

export const UploadQueryDoc = z
  .object({
    format: z.enum(['float32', 'edf']).optional().describe('binary body: float32 (default) or an EDF/EDF+ file'),
    samplingRate: z.coerce.number().positive().optional().describe('float32: Hz (required); edf: select the signals of this rate'),
    channels: z.string().optional().describe('float32: comma-separated names (required); edf: labels to keep'),
    epochCount: z.coerce.number().int().min(1).optional().describe('float32: epochs in the body, default 1'),
    unit: z.string().optional().describe('float32: nV, uV (µV), mV or V, stored as uV; any other unit needs voltage=false; default uV'),
    voltage: z.enum(['true', 'false']).optional().describe('float32: false when the samples are not a voltage; default true'),
    nonFinite: z.enum(['reject', 'keep']).optional().describe('float32: NaN/±Inf samples refused (default) or kept as gaps'),
    events: z
      .string()
      .optional()
      .describe(
        'float32: the events as a URL-encoded JSON array [{"onset": s, "duration": s or null, "label": "…"}], as in a JSON upload (EDF+ files bring theirs as annotations); for lists too long for a URL, start a resumable upload with `events` in its body',
      ),
  })
  .describe('describes a binary (application/octet-stream) body');

export const SignalInfoSchema = z
  .object({
    id: z.string(),
    sha256: z.string(),
    samplingRate: z.number(),
    channels: z.array(z.string()),
    unit: z.string(),
    epochCount: z.number().int(),
    samplesPerEpoch: z.number().int(),
    nonFiniteSamples: z.number().int(),
    events: z.array(EventSchema),
    bytes: z.number().int().describe('size of the samples as stored, what MAX_STORE_BYTES counts: 2 bytes a sample for EDF uploads, 4 for float32, 8 for JSON'),
    storedAt: z.string(),
    warnings: z.array(z.string()).optional().describe('what the upload checks noticed but let through, e.g. an amplitude far outside the EEG range for the unit'),
  })
  .meta({ id: 'SignalInfo' });

export const PinnedRecipeSchema = z
  .object({ id: z.string(), hash: z.string(), recipe: RecipeSchema })
  .meta({ id: 'PinnedRecipe', description: 'A recipe with every default filled in, its hash and id.' });

export const IdParams = z.object({ id: z.string().min(1).max(200) });

export const SignalReferenceSchema = z
  .strictObject({
    signal: z.string().min(1).describe('id of a stored signal'),
    start: z.number().min(0).optional().describe('seconds from the start of a continuous signal'),
    end: z.number().positive().optional().describe('seconds, excluded'),
    channels: z.array(z.string().min(1)).min(1).max(1024).optional().describe('channel names to keep, in this order'),
    badSpans: z
      .array(z.tuple([z.number(), z.number()]))
      .max(100_000)
      .optional()
      .describe('[start, end] seconds from the signal start, left out of the analysis'),
  })
  .meta({ id: 'SignalReference', description: 'A window, channel subset and bad spans of a stored signal, without uploading it again.' });

const importFields = {
  format: z.enum(['edf', 'float32']).default('edf').describe('layout of the file'),
  samplingRate: z.number().positive().optional().describe('float32: Hz (required); edf: keep the signals of this rate'),
  channels: z.array(z.string().min(1)).min(1).max(1024).optional().describe('float32: names (required); edf: labels to keep'),
  epochCount: z.number().int().min(1).optional().describe('float32 only; default 1'),
  unit: z.string().min(1).max(32).optional().describe('float32 only: nV, uV (µV), mV or V, stored as uV; default uV'),
  voltage: z.boolean().optional().describe('float32 only: false when the samples are not a voltage (the unit is kept as given)'),
  events: EventListSchema.optional().describe('float32 only: events, as in a JSON upload'),
};

export const ImportSourceSchema = z
  .union([
    z.strictObject({ file: z.string().min(1).max(4096).describe("path relative to the server's DATA_ROOT"), ...importFields }),
    z.strictObject({ url: z.string().min(1).max(4096).describe('http(s) URL on a host of FETCH_ALLOWED_HOSTS'), ...importFields }),
  ])
  .meta({ id: 'ImportSource', description: 'A recording the server reads itself: a file under its data root, or an allow-listed URL. Both are off unless configured.' });

/** Labels a client attaches to a job (e.g. `study`); listed with it and filterable, never hashed. */
export const JobLabelsSchema = z
  .record(z.string().regex(/^[A-Za-z][A-Za-z0-9_.-]{0,63}$/, 'a label name starts with a letter and holds at most 64 letters, digits, "_", "." or "-"'), z.string().max(256))
  .refine((labels) => Object.keys(labels).length <= 32, 'at most 32 labels')
  .describe('free labels, e.g. {"study": "…", "condition": "eyes-closed"}; GET /v1/jobs?study= filters on the study label; an identical job keeps the labels it was first submitted with');

export const JobRequestSchema = z
  .strictObject({
    signal: z.union([z.string().describe('id of a stored signal'), SignalReferenceSchema, ImportSourceSchema, SignalUploadSchema]),
    recipe: z.union([z.string().describe('id of a pinned recipe'), RecipeSchema]),
    labels: JobLabelsSchema.optional(),
  })
  .meta({ id: 'JobRequest' });

/**
 * The signal of a job request, parsed once into a tagged union: the branches differ by their keys
 * (an id string; `signal`; `file` or `url`; `samplingRate`), so each is a strict object.
 */
export const JobSignalSchema = z.union([
  z
    .string()
    .min(1)
    .transform((id) => ({ kind: 'stored' as const, id })),
  SignalReferenceSchema.transform(({ signal, ...view }) => ({ kind: 'view' as const, id: signal, view })),
  ImportSourceSchema.transform((source) => ({ kind: 'import' as const, source })),
  SignalUploadEnvelope.transform((upload) => ({ kind: 'upload' as const, upload })),
]);

export const JobRequestEnvelope = z.strictObject({
  signal: JobSignalSchema,
  recipe: z.union([z.string().min(1), z.record(z.string(), z.unknown())]),
  labels: JobLabelsSchema.optional(),
});
export type JobRequest = z.output<typeof JobRequestEnvelope>;

export const JobViewSchema = z
  .object({
    id: z.string(),
    state: z.enum(JOB_STATES),
    progress: z.number().min(0).max(1),
    signal: z.string(),
    recipe: z.string(),
    method: z.string().describe("the recipe's method"),
    labels: z.record(z.string(), z.string()).describe('labels given at submission'),
    resultHash: z.string().nullable(),
    attempts: z.number().int(),
    createdAt: z.string(),
    startedAt: z.string().nullable(),
    finishedAt: z.string().nullable(),
    problem: ProblemSchema.nullable().describe('why a failed job failed'),
    tenant: z.string().optional().describe('the tenant the job belongs to (sent by the event stream)'),
    links: z.object({ self: z.string(), record: z.string() }),
  })
  .meta({ id: 'Job' });

const BandPowerSchema = z.object({
  name: z.string(),
  low: z.number(),
  high: z.number(),
  absolute: z.number().describe('unit², Σ PSD·Δf over low ≤ f < high'),
  relative: z.number().nullable(),
  decibels: z.number().nullable().describe('10·log10(absolute)'),
  bins: z.number().int(),
});

const ChannelFeaturesSchema = z.object({
  name: z.string(),
  psd: z.array(z.number()).describe('one-sided PSD, unit²/Hz'),
  bands: z.array(BandPowerSchema),
  ratios: z.array(z.object({ name: z.string(), numerator: z.string(), denominator: z.string(), value: z.number().nullable() })),
});

export const FeatureRecordSchema = z
  .object({
    schema: z.string(),
    engineVersion: z.string(),
    recipe: z.looseObject({ id: z.string(), hash: z.string(), method: z.string(), derived: z.looseObject({}) }),
    input: z.looseObject({ signal: z.string(), sha256: z.string() }),
    result: z.looseObject({
      units: z.looseObject({}),
      frequencies: z.array(z.number()),
      channels: z.array(z.union([ChannelFeaturesSchema, z.looseObject({ name: z.string() })])),
      timeFrequency: z.looseObject({ times: z.array(z.number()), attachments: z.array(z.looseObject({ name: z.string(), shape: z.array(z.number().int()), dtype: z.string() })) }).optional(),
      connectivity: z.looseObject({}).optional(),
      epochs: z.array(z.object({ index: z.number().int(), channels: z.array(ChannelFeaturesSchema) })).optional(),
      estimate: z.looseObject({}),
      warnings: z.array(z.string()),
    }),
    resultHash: z.string().describe('SHA-256 of the canonical JSON of result'),
    attachments: z
      .array(
        z.object({
          name: z.string().describe('GET /v1/jobs/{id}/attachments/{name}'),
          kind: z.string().describe('what it holds, e.g. power, trialPower, phaseConsistency, edgeMask'),
          channel: z.string().nullable(),
          shape: z.array(z.number().int()).describe('row-major dimensions, e.g. [times, frequencies]'),
          dtype: z.enum(['float64-le', 'uint8']),
          bytes: z.number().int(),
          sha256: z.string(),
        }),
      )
      .optional()
      .describe('time–frequency records: the binary matrices, fetched separately; their hashes are inside result'),
    provenance: z.looseObject({}),
  })
  .meta({ id: 'FeatureRecord' });
