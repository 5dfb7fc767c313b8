import { randomBytes } from 'node:crypto';
import { canonicalJson } from '../common/canonical-json.js';
import { DomainError } from '../common/errors.js';
import { sha256Hex } from '../common/hash.js';
import { SignalInputError } from '../signals/errors.js';
import { resolveView, type SignalView } from '../signals/view.js';
import type { SignalMeta, Store } from '../stores/store.js';
import { manifestError, STUDY_LIMITS, type EntryInput, type Metadata } from './entries.js';

export interface StudyEntry {
  id: string;
  signal: string;
  sha256: string;
  /** the part of the signal analysed; null = all of it */
  view: SignalView | null;
  metadata: Metadata;
  addedAt: string;
}

export interface Study {
  id: string;
  tenant: string;
  name: string;
  description: string | null;
  createdAt: string;
  updatedAt: string;
  entries: StudyEntry[];
}

/**
 * Ids sort by creation time (12 hex digits of milliseconds, then 20 random), so listing the store's
 * keys in order lists studies and runs oldest first and a cursor is simply the last id seen.
 */
export function newId(prefix: 'stu' | 'run'): string {
  return `${prefix}_${Date.now().toString(16).padStart(12, '0')}${randomBytes(10).toString('hex')}`;
}

const ID = { stu: /^stu_[0-9a-f]{32}$/, run: /^run_[0-9a-f]{32}$/ };

export function isId(prefix: 'stu' | 'run', id: string): boolean {
  return ID[prefix].test(id);
}

/** One tenant's documents share a key prefix, so that another tenant's study is simply not found. */
export function studyKey(tenant: string, studyId: string): string {
  return `${tenant}.${studyId}`;
}

function viewOrNull(view: SignalView): SignalView | null {
  return Object.keys(view).length === 0 ? null : view;
}

/** Entries of the same signal and view would give the same job and record: the same entry twice. */
function identityOf(signal: string, view: SignalView | null): string {
  return `${signal}.${canonicalJson(view ?? {})}`;
}

function entryIdOf(identity: string): string {
  return `ent_${sha256Hex(identity).slice(0, 24)}`;
}

/**
 * Studies as one document each (the study and all its entries), so that adding a whole manifest is
 * one atomic write in either store: readers see all of it or none of it. Writes to one study are
 * serialized within this process.
 */
export function createStudyStore(store: Store) {
  const locks = new Map<string, Promise<unknown>>();

  async function exclusive<T>(key: string, work: () => Promise<T>): Promise<T> {
    const previous = locks.get(key) ?? Promise.resolve();
    const next = previous.then(work, work);
    const settled = next.then(
      () => undefined,
      () => undefined,
    );
    locks.set(key, settled);
    try {
      return await next;
    } finally {
      if (locks.get(key) === settled) locks.delete(key);
    }
  }

  async function read(tenant: string, studyId: string): Promise<Study | null> {
    if (!isId('stu', studyId)) return null;
    const text = await store.getDocument('studies', studyKey(tenant, studyId));
    return text === null ? null : (JSON.parse(text) as Study);
  }

  async function require(tenant: string, studyId: string): Promise<Study> {
    const study = await read(tenant, studyId);
    if (!study) throw new DomainError('study-not-found', `no study with id "${studyId}"`);
    return study;
  }

  const write = (study: Study) => store.putDocument('studies', studyKey(study.tenant, study.id), JSON.stringify(study));

  /** Looks up the signal an entry names, for its tenant; a completed upload names its signal. */
  async function sourceOf(tenant: string, input: EntryInput): Promise<SignalMeta> {
    let signalId = input.signal;
    if (input.upload !== undefined) {
      const text = /^upl_[0-9a-f]{32}$/.test(input.upload) ? await store.getDocument('upload-signals', input.upload) : null;
      const known = text ? (JSON.parse(text) as { tenant: string; signal: string }) : null;
      if (!known || known.tenant !== tenant) {
        throw manifestError('unknown-signal', `no completed upload with id "${input.upload}"`, { row: input.row, column: 'upload', pointer: input.at('upload') });
      }
      signalId = known.signal;
    }
    const meta = /^sig_[0-9a-f]{32}$/.test(signalId ?? '') ? await store.getSignalMeta(signalId!) : null;
    const column = input.upload !== undefined ? 'upload' : 'signal';
    if (!meta || meta.tenant !== tenant) {
      throw manifestError('unknown-signal', `no signal with id "${signalId}" is stored`, { row: input.row, column, pointer: input.at(column) });
    }
    return meta;
  }

  return {
    read,
    require,

    async create(tenant: string, fields: { name: string; description?: string | null | undefined }): Promise<Study> {
      const now = new Date().toISOString();
      const study: Study = { id: newId('stu'), tenant, name: fields.name, description: fields.description ?? null, createdAt: now, updatedAt: now, entries: [] };
      await write(study);
      return study;
    },

    /** The tenant's studies oldest first, `limit` after the cursor (the last id of the previous page). */
    async list(tenant: string, limit: number, after: string | null): Promise<{ studies: Study[]; next: string | null }> {
      const prefix = `${tenant}.`;
      const keys = (await store.listDocuments('studies')).filter((k) => k.startsWith(prefix) && (after === null || k.slice(prefix.length) > after));
      const page = keys.slice(0, limit);
      const studies = (await Promise.all(page.map((k) => store.getDocument('studies', k)))).flatMap((t) => (t === null ? [] : [JSON.parse(t) as Study]));
      return { studies, next: keys.length > limit && studies.length > 0 ? studies[studies.length - 1]!.id : null };
    },

    async remove(tenant: string, studyId: string): Promise<boolean> {
      return exclusive(studyKey(tenant, studyId), async () => {
        if (!(await read(tenant, studyId))) return false;
        return store.deleteDocument('studies', studyKey(tenant, studyId));
      });
    },

    /**
     * Checks every input (signal known to the tenant, view fits it, no duplicate within the inputs or
     * the study, room left) before one write adds them all; the first fault refuses the whole list.
     */
    async addEntries(tenant: string, studyId: string, inputs: EntryInput[]): Promise<StudyEntry[]> {
      return exclusive(studyKey(tenant, studyId), async () => {
        const study = await require(tenant, studyId);
        if (study.entries.length + inputs.length > STUDY_LIMITS.entries) {
          throw manifestError('too-large', `a study holds at most ${STUDY_LIMITS.entries} entries; it has ${study.entries.length} and ${inputs.length} were sent`, {
            row: null,
            column: null,
            pointer: '/',
          });
        }
        const taken = new Map(study.entries.map((e) => [identityOf(e.signal, e.view), `entry ${e.id}`]));
        const now = new Date().toISOString();
        const added: StudyEntry[] = [];
        for (const input of inputs) {
          const meta = await sourceOf(tenant, input);
          const view = viewOrNull(input.view);
          if (view) {
            try {
              resolveView(meta, view);
            } catch (error) {
              if (!(error instanceof SignalInputError)) throw error;
              const column = (error.pointer ?? '/signal').split('/')[1] ?? 'signal';
              throw manifestError('bad-view', error.message, { row: input.row, column, pointer: input.at(column) });
            }
          }
          const identity = identityOf(meta.id, view);
          const earlier = taken.get(identity);
          if (earlier) {
            const column = input.upload !== undefined ? 'upload' : 'signal';
            throw manifestError('duplicate-entry', `signal ${meta.id}${view ? ' with this view' : ''} is already ${earlier}; give each entry its own signal or part of one`, {
              row: input.row,
              column,
              pointer: input.at(column),
            });
          }
          taken.set(identity, `row ${input.row}`);
          added.push({ id: entryIdOf(identity), signal: meta.id, sha256: meta.sha256, view, metadata: input.metadata, addedAt: now });
        }
        await write({ ...study, entries: [...study.entries, ...added], updatedAt: now });
        return added;
      });
    },

    async removeEntry(tenant: string, studyId: string, entryId: string): Promise<boolean> {
      return exclusive(studyKey(tenant, studyId), async () => {
        const study = await require(tenant, studyId);
        const entries = study.entries.filter((e) => e.id !== entryId);
        if (entries.length === study.entries.length) return false;
        await write({ ...study, entries, updatedAt: new Date().toISOString() });
        return true;
      });
    },
  };
}

export type StudyStore = ReturnType<typeof createStudyStore>;
