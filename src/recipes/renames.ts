/**
 * Settings renamed in 0.3.0 so that one idea has one word across the recipe (issue 10): the old
 * names are accepted for one version and rewritten to the new ones before the recipe is parsed and
 * hashed, so both spellings give the same recipe, hash and id, and the same records.
 */
import { invalid } from '../methods/fit.js';

/** A deprecated setting found in a recipe: where it was and what to write instead. */
export interface Deprecation {
  /** JSON pointer of the old setting in the recipe */
  pointer: string;
  message: string;
}

interface Rename {
  /** path of the object holding the setting */
  at: string[];
  from: string;
  to: string;
  why: string;
}

export const RENAMES: readonly Rename[] = [
  { at: [], from: 'perTrial', to: 'perEpoch', why: 'a trial is an epoch; the spectrum methods already say perEpoch' },
  { at: [], from: 'windowSeconds', to: 'segmentSeconds', why: '"window" names the taper shape; the piece one transform sees is a segment, as in Welch' },
  { at: ['epoching'], from: 'lengthSeconds', to: 'epochSeconds', why: 'each piece length is named after its piece: segmentSeconds, epochSeconds' },
  { at: ['features', 'lineNoise'], from: 'neighbourhoodWidth', to: 'neighborhoodWidth', why: 'one spelling throughout (normalized, neighborhood)' },
];

/**
 * The recipe with deprecated setting names replaced by the new ones (copied where changed, never
 * mutated), and the deprecations found. Refuses a recipe that gives both names of one setting.
 */
export function renameDeprecated(input: unknown): { input: unknown; deprecations: Deprecation[] } {
  const deprecations: Deprecation[] = [];
  let root = input;
  for (const rename of RENAMES) {
    const holder = objectAt(root, rename.at);
    if (!holder || !Object.hasOwn(holder, rename.from)) continue;
    const where = ['', ...rename.at].join('/');
    if (Object.hasOwn(holder, rename.to)) {
      throw invalid(`"${rename.from}" is the deprecated name of "${rename.to}"; give only "${rename.to}"`, `${where}/${rename.from}`);
    }
    const { [rename.from]: value, ...rest } = holder;
    root = replaceAt(root, rename.at, { ...rest, [rename.to]: value });
    deprecations.push({ pointer: `${where}/${rename.from}`, message: `"${rename.from}" is deprecated and will be refused in the next version: write "${rename.to}" (${rename.why})` });
  }
  return { input: root, deprecations };
}

function isObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function objectAt(root: unknown, path: string[]): Record<string, unknown> | null {
  let node = root;
  for (const key of path) node = isObject(node) ? node[key] : undefined;
  return isObject(node) ? node : null;
}

function replaceAt(root: unknown, path: string[], value: Record<string, unknown>): unknown {
  if (path.length === 0) return value;
  const node = root as Record<string, unknown>;
  return { ...node, [path[0]!]: replaceAt(node[path[0]!], path.slice(1), value) };
}
