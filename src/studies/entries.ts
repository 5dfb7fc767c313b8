import { DomainError } from '../common/errors.js';
import type { SignalView } from '../signals/view.js';
import { RESERVED_COLUMN_NAMES } from '../tables/columns.js';

export type MetadataValue = string | number;
export type Metadata = Record<string, MetadataValue>;

/** Bounds of one study; sizes a lab's study needs with room to spare, small enough for one document. */
export const STUDY_LIMITS = Object.freeze({
  entries: 10_000,
  metadataKeys: 64,
  valueLength: 256,
  nameLength: 200,
  channels: 1024,
  badSpans: 10_000,
});

export const METADATA_KEY = /^[a-z][a-z0-9_]{0,63}$/i;

/** Metadata keys every entry must carry: a statistics table without the subject is of no use. */
export const REQUIRED_METADATA = ['subject'] as const;

/** Columns of a manifest row that describe the signal and its view, not metadata. */
export const VIEW_COLUMNS = ['signal', 'upload', 'start', 'end', 'channels', 'badSpans'] as const;

/**
 * Names the feature tables give their own columns (and the manifest's view columns): a metadata key
 * may not take one, or a table row would hold two columns of the same name. Compared ignoring case,
 * since spreadsheets and data frames often fold it.
 */
export const RESERVED_KEYS: ReadonlySet<string> = new Set([...VIEW_COLUMNS, ...RESERVED_COLUMN_NAMES].map((k) => k.toLowerCase()));

/** One entry as the caller gives it, before the signal is looked up. */
export interface EntryInput {
  signal?: string;
  upload?: string;
  view: SignalView;
  metadata: Metadata;
  /** where the input sat, for errors: 1-based row and a pointer prefix */
  row: number;
  /** the pointer of a column of this row, e.g. `/entries/3/metadata/age` or `/rows/3/age` */
  at: (column: string) => string;
}

export type ManifestReason = 'unknown-signal' | 'duplicate-entry' | 'bad-key' | 'missing-column' | 'wrong-type' | 'bad-view' | 'too-large' | 'malformed';

/** The one error of a refused manifest: names row (1-based, as a person counts data rows) and column. */
export function manifestError(reason: ManifestReason, detail: string, where: { row: number | null; column: string | null; pointer: string }): DomainError {
  const place = [where.row === null ? null : `row ${where.row}`, where.column === null ? null : `column "${where.column}"`].filter(Boolean).join(', ');
  return new DomainError('invalid-manifest', `${place ? `${place}: ` : ''}${detail}; nothing was added`, {
    pointer: where.pointer,
    extensions: { reason, row: where.row, column: where.column },
  });
}

function fail(input: Pick<EntryInput, 'row' | 'at'>, column: string, reason: ManifestReason, detail: string): never {
  throw manifestError(reason, detail, { row: input.row, column, pointer: input.at(column) });
}

/** Checks keys and values of one entry's metadata (from JSON or CSV alike). */
export function checkMetadata(input: Pick<EntryInput, 'row' | 'at' | 'metadata'>): void {
  const keys = Object.keys(input.metadata);
  if (keys.length > STUDY_LIMITS.metadataKeys) fail(input, keys[STUDY_LIMITS.metadataKeys]!, 'too-large', `an entry holds at most ${STUDY_LIMITS.metadataKeys} metadata keys`);
  for (const key of keys) {
    if (!METADATA_KEY.test(key)) fail(input, key, 'bad-key', `metadata key "${key}" must start with a letter and hold only letters, digits and _ (at most 64)`);
    if (RESERVED_KEYS.has(key.toLowerCase())) fail(input, key, 'bad-key', `metadata key "${key}" is the name of a table column; choose another name`);
    const value: unknown = input.metadata[key];
    if (typeof value === 'number') {
      if (!Number.isFinite(value)) fail(input, key, 'wrong-type', 'a number must be finite');
    } else if (typeof value === 'string') {
      if (value.length > STUDY_LIMITS.valueLength) fail(input, key, 'too-large', `a text value holds at most ${STUDY_LIMITS.valueLength} characters`);
    } else {
      fail(input, key, 'wrong-type', `a metadata value is a string or a number, not ${value === null ? 'null' : Array.isArray(value) ? 'an array' : typeof value}`);
    }
  }
  for (const key of REQUIRED_METADATA) {
    const value = input.metadata[key];
    if (value === undefined || value === '') fail(input, key, 'missing-column', `every entry names its "${key}"`);
  }
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * Reads the JSON form, `{entries: [{signal | upload, start?, end?, channels?, badSpans?, metadata}]}`,
 * into entry inputs; every fault names the entry (row = index + 1) and the field.
 */
export function readJsonEntries(body: unknown): EntryInput[] {
  const where = (row: number | null, column: string | null, pointer: string) => ({ row, column, pointer });
  if (!isRecord(body) || !Array.isArray(body.entries)) throw manifestError('malformed', 'the body is {"entries": [...]} (JSON) or a CSV manifest (text/csv)', where(null, null, '/entries'));
  const unknownTop = Object.keys(body).find((k) => k !== 'entries');
  if (unknownTop) throw manifestError('malformed', `unknown field "${unknownTop}"`, where(null, unknownTop, `/${unknownTop}`));
  if (body.entries.length === 0) throw manifestError('malformed', 'the list of entries is empty', where(null, null, '/entries'));
  if (body.entries.length > STUDY_LIMITS.entries) throw manifestError('too-large', `at most ${STUDY_LIMITS.entries} entries at once`, where(null, null, '/entries'));
  return body.entries.map((raw, index) => {
    const row = index + 1;
    const base = `/entries/${index}`;
    const at = (column: string) => (VIEW_COLUMNS.includes(column as never) ? `${base}/${column}` : `${base}/metadata/${column}`);
    const input = { row, at };
    if (!isRecord(raw)) throw manifestError('wrong-type', 'an entry is an object', where(row, null, base));
    for (const key of Object.keys(raw)) {
      if (key !== 'metadata' && !VIEW_COLUMNS.includes(key as never)) fail({ row, at: () => `${base}/${key}` }, key, 'bad-key', `unknown field "${key}"; metadata go inside "metadata"`);
    }
    if (!isRecord(raw.metadata))
      fail({ row, at: () => `${base}/metadata` }, 'metadata', raw.metadata === undefined ? 'missing-column' : 'wrong-type', 'every entry has a "metadata" object (at least its "subject")');
    const view: SignalView = {};
    const number = (column: 'start' | 'end') => {
      const value = raw[column];
      if (value === undefined) return;
      if (typeof value !== 'number' || !Number.isFinite(value)) fail(input, column, 'wrong-type', `${column} is a number of seconds`);
      view[column] = value;
    };
    number('start');
    number('end');
    if (raw.channels !== undefined) {
      const list = raw.channels;
      if (!Array.isArray(list) || list.length === 0 || list.length > STUDY_LIMITS.channels || !list.every((c) => typeof c === 'string' && c.length > 0)) {
        fail(input, 'channels', 'wrong-type', `channels is a list of 1–${STUDY_LIMITS.channels} channel names`);
      }
      view.channels = list as string[];
    }
    if (raw.badSpans !== undefined) {
      const spans = raw.badSpans;
      const ok = Array.isArray(spans) && spans.length <= STUDY_LIMITS.badSpans && spans.every((s) => Array.isArray(s) && s.length === 2 && s.every((t) => typeof t === 'number' && Number.isFinite(t)));
      if (!ok) fail(input, 'badSpans', 'wrong-type', 'badSpans is a list of [start, end] pairs of seconds');
      view.badSpans = spans as [number, number][];
    }
    const entry: EntryInput = { row, at, view, metadata: raw.metadata as Metadata };
    for (const column of ['signal', 'upload'] as const) {
      const value = raw[column];
      if (value === undefined) continue;
      if (typeof value !== 'string') fail(input, column, 'wrong-type', `${column} is an id`);
      entry[column] = value;
    }
    checkSource(entry);
    checkMetadata(entry);
    return entry;
  });
}

function checkSource(entry: EntryInput): void {
  if (entry.signal !== undefined && entry.upload !== undefined) fail(entry, 'upload', 'malformed', 'name either a signal or an upload, not both');
  if (entry.signal === undefined && entry.upload === undefined) fail(entry, 'signal', 'missing-column', 'every entry names a stored signal ("signal") or a completed upload ("upload")');
}

/** RFC 4180 fields: quoted fields may hold commas, line breaks and doubled quotes; CRLF or LF ends a record. */
export function parseCsv(text: string): { rows: string[][]; lines: number[] } {
  const rows: string[][] = [];
  const lines: number[] = [];
  let line = 1;
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  while (i < text.length) {
    const row: string[] = [];
    const startLine = line;
    for (;;) {
      let field = '';
      if (text[i] === '"') {
        i++;
        for (;;) {
          if (i >= text.length) throw manifestError('malformed', `a quoted field opened on line ${startLine} is never closed (RFC 4180 §2)`, { row: null, column: null, pointer: '/' });
          const c = text[i]!;
          if (c === '"') {
            if (text[i + 1] === '"') {
              field += '"';
              i += 2;
              continue;
            }
            i++;
            break;
          }
          if (c === '\n') line++;
          field += c;
          i++;
        }
        if (i < text.length && text[i] !== ',' && text[i] !== '\r' && text[i] !== '\n') {
          throw manifestError('malformed', `line ${line}: text after a closing quote (RFC 4180 §2: a quote inside a quoted field is doubled)`, { row: null, column: null, pointer: '/' });
        }
      } else {
        while (i < text.length && text[i] !== ',' && text[i] !== '\r' && text[i] !== '\n') field += text[i++];
      }
      row.push(field);
      if (text[i] === ',') {
        i++;
        continue;
      }
      break;
    }
    if (text[i] === '\r') i++;
    if (text[i] === '\n') i++;
    line++;
    // A blank line carries no entry (a trailing newline, or one left at the end by an editor).
    if (!(row.length === 1 && row[0] === '')) {
      rows.push(row);
      lines.push(startLine);
    }
  }
  return { rows, lines };
}

/**
 * Reads a CSV manifest (RFC 4180, header row). Columns: `signal` or `upload` (ids), optional `start`
 * and `end` (seconds) and `channels` (names separated by `;`); every other column is a metadata key.
 * Cells are text; a header written `age:number` makes its column numeric. An empty cell leaves the
 * key out of that entry.
 */
export function readCsvManifest(text: string): EntryInput[] {
  const { rows } = parseCsv(text);
  const header = rows[0];
  if (!header) throw manifestError('missing-column', 'the manifest is empty; its first row names the columns', { row: null, column: null, pointer: '/rows' });
  if (rows.length - 1 > STUDY_LIMITS.entries) throw manifestError('too-large', `at most ${STUDY_LIMITS.entries} rows at once`, { row: null, column: null, pointer: '/rows' });
  const columns = header.map((cell, index) => {
    const [name = '', type, ...rest] = cell.trim().split(':');
    const where = { row: 0, column: cell, pointer: `/header/${index}` };
    if (rest.length > 0 || (type !== undefined && type !== 'number' && type !== 'text')) throw manifestError('bad-key', `a column type is ":number" or ":text", not "${cell}"`, where);
    if (VIEW_COLUMNS.includes(name as never)) {
      if (name === 'badSpans') throw manifestError('bad-key', 'badSpans go in the JSON form of the entries, not in a CSV manifest', where);
    } else {
      if (!METADATA_KEY.test(name)) throw manifestError('bad-key', `column "${name}" must start with a letter and hold only letters, digits and _ (at most 64)`, where);
      if (RESERVED_KEYS.has(name.toLowerCase())) throw manifestError('bad-key', `column "${name}" is the name of a table column; choose another name`, where);
    }
    return { name, numeric: type === 'number' || name === 'start' || name === 'end' };
  });
  const names = columns.map((c) => c.name);
  const repeated = names.find((n, i) => names.indexOf(n) !== i);
  if (repeated) throw manifestError('bad-key', `column "${repeated}" appears twice`, { row: 0, column: repeated, pointer: `/header/${names.lastIndexOf(repeated)}` });
  if (!names.includes('signal') && !names.includes('upload'))
    throw manifestError('missing-column', 'the header names a "signal" or an "upload" column', { row: 0, column: 'signal', pointer: '/header' });
  for (const key of REQUIRED_METADATA) {
    if (!names.includes(key)) throw manifestError('missing-column', `the header names a "${key}" column`, { row: 0, column: key, pointer: '/header' });
  }
  if (rows.length === 1) throw manifestError('malformed', 'the manifest has a header but no rows', { row: null, column: null, pointer: '/rows' });
  return rows.slice(1).map((cells, index) => {
    const row = index + 1;
    const at = (column: string) => `/rows/${row}/${column}`;
    if (cells.length !== columns.length) {
      const column = cells.length < columns.length ? columns[cells.length]!.name : `#${cells.length}`;
      fail({ row, at }, column, 'missing-column', `the row has ${cells.length} cells; the header has ${columns.length}`);
    }
    const entry: EntryInput = { row, at, view: {}, metadata: {} };
    columns.forEach(({ name, numeric }, c) => {
      const cell = cells[c]!.trim();
      if (cell === '') return;
      let value: MetadataValue = cell;
      if (numeric) {
        value = Number(cell);
        if (!Number.isFinite(value)) fail(entry, name, 'wrong-type', `"${cell}" is not a number`);
      }
      if (name === 'signal' || name === 'upload') entry[name] = cell;
      else if (name === 'start' || name === 'end') entry.view[name] = value as number;
      else if (name === 'channels') entry.view.channels = cell.split(';').map((s) => s.trim());
      else entry.metadata[name] = value;
    });
    checkSource(entry);
    checkMetadata(entry);
    return entry;
  });
}
