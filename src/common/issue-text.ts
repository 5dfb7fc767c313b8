/**
 * Details people can act on for schema violations: never a bare "Invalid input". A choice names
 * the allowed values and the closest one to what was sent; a range names the bound, the unit and,
 * for fractions sent as percentages, the likely intended value.
 */

/** The parts of a zod issue these texts read (structural, so this module needs no zod). */
export interface SchemaIssue {
  code: string;
  path?: readonly PropertyKey[];
  message?: string;
  values?: readonly unknown[];
  options?: readonly unknown[];
  keys?: readonly string[];
  errors?: readonly (readonly SchemaIssue[])[];
  discriminator?: string;
  expected?: string;
  minimum?: number | bigint;
  maximum?: number | bigint;
  inclusive?: boolean;
  origin?: string;
}

/** Levenshtein distance: insertions, deletions and substitutions each cost 1. */
export function editDistance(a: string, b: string): number {
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const current = [i];
    for (let j = 1; j <= b.length; j++) {
      current[j] = Math.min(previous[j]! + 1, current[j - 1]! + 1, previous[j - 1]! + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    previous = current;
  }
  return previous[b.length]!;
}

/**
 * The allowed value closest to `given` by edit distance (case-insensitive), when it is close
 * enough to be a slip: at most a third of its length, and at least one edit allowed.
 */
export function closest(given: string, allowed: readonly string[]): string | null {
  let best: string | null = null;
  let bestDistance = Infinity;
  for (const candidate of allowed) {
    const d = editDistance(given.toLowerCase(), candidate.toLowerCase());
    if (d < bestDistance) [best, bestDistance] = [candidate, d];
  }
  return best !== null && bestDistance <= Math.max(1, Math.floor(best.length / 3)) ? best : null;
}

/** Units of settings, by name (the recipe's words; see the README's recipe tables). */
function unitOf(field: string): string | null {
  if (/Seconds$|^(onset|duration|start|end)$/.test(field)) return 's';
  if (field === 'samplingRate' || /[Ff]requency$|^(low|high)$/.test(field)) return 'Hz';
  if (field === 'overlap' || /Ratio$|Fraction$/.test(field)) return 'fraction';
  return null;
}

function valueAt(root: unknown, path: readonly PropertyKey[]): unknown {
  let value = root;
  for (const key of path) {
    if (value === null || typeof value !== 'object') return undefined;
    value = (value as Record<PropertyKey, unknown>)[key];
  }
  return value;
}

const quote = (v: unknown) => JSON.stringify(v);

function choice(allowed: readonly unknown[], given: unknown): string {
  const list = allowed.map(quote).join(', ');
  const near =
    typeof given === 'string'
      ? closest(
          given,
          allowed.filter((v): v is string => typeof v === 'string'),
        )
      : null;
  const sent = given === undefined ? 'nothing was sent' : `got ${quote(given)}`;
  return `must be one of ${list}; ${sent}${near && near !== given ? `; did you mean ${quote(near)}?` : ''}`;
}

function range(issue: SchemaIssue, given: unknown, field: string): string {
  const unit = unitOf(field);
  const unitText = unit === null ? '' : unit === 'fraction' ? ' (a fraction, not a percentage)' : ` ${unit}`;
  const big = issue.code === 'too_big';
  const bound = big ? issue.maximum : issue.minimum;
  const relation = big ? (issue.inclusive ? 'at most' : 'below') : issue.inclusive ? 'at least' : 'above';
  if (issue.origin !== undefined && issue.origin !== 'number' && issue.origin !== 'bigint') {
    const what = issue.origin === 'string' ? 'characters' : issue.origin === 'array' || issue.origin === 'set' ? 'items' : 'entries';
    return `must have ${relation} ${String(bound)} ${what}`;
  }
  let text = `must be ${relation} ${String(bound)}${unitText}; got ${quote(given)}`;
  if (unit === 'fraction' && big && typeof given === 'number' && given > 1 && given <= 100) text += `; did you mean ${given / 100}?`;
  // A schema's own wording (e.g. which setting sets the bound) is kept; zod's default adds nothing.
  if (issue.message && !/^(Too big|Too small|Invalid input)/.test(issue.message)) text += ` (${issue.message})`;
  return text;
}

/** Whether a branch's issues say the input is not of its shape at all (nested unions included). */
function wrongShape(branch: readonly SchemaIssue[]): boolean {
  return branch.some(
    (i) =>
      (i.path?.length ?? 0) === 0 &&
      (i.code === 'invalid_type' || i.code === 'unrecognized_keys' || (i.code === 'invalid_union' && i.discriminator === undefined && (i.errors ?? []).every(wrongShape))),
  );
}

/**
 * The branch of a failed union the input most likely meant: the one whose first issue lies
 * deepest, among branches whose shape the input has (no wrong type or unknown key at its root).
 * Null when no branch, or more than one, stands out; the union is then described as a whole.
 */
function likeliestBranch(errors: readonly (readonly SchemaIssue[])[]): readonly SchemaIssue[] | null {
  let best: readonly SchemaIssue[] | null = null;
  let depth = 0;
  let tied = false;
  for (const branch of errors) {
    const first = branch[0];
    if (!first || wrongShape(branch)) continue;
    const d = (first.path?.length ?? 0) + 1;
    if (d > depth) [best, depth, tied] = [branch, d, false];
    else if (d === depth) tied = true;
  }
  return tied ? null : best;
}

/** Where an issue is (descending into the likeliest branch of a union) and what it says. */
export interface ExplainedIssue {
  path: PropertyKey[];
  text: string;
}

/**
 * Words for one schema issue, relative to the field it names. `root` is the validated input,
 * read for the value that was sent; `alternatives` describes the branches of an unnamed union.
 */
export function explainIssue(issue: SchemaIssue, root: unknown, alternatives?: string): ExplainedIssue {
  const path = [...(issue.path ?? [])];
  if (issue.code === 'invalid_union' && issue.discriminator === undefined) {
    const inner = likeliestBranch(issue.errors ?? [])?.[0];
    if (inner) return explainIssue({ ...inner, path: [...path, ...(inner.path ?? [])] }, root);
  }
  return { path, text: describe(issue, path, root, alternatives) };
}

function describe(issue: SchemaIssue, path: PropertyKey[], root: unknown, alternatives?: string): string {
  const given = valueAt(root, path);
  const field = String(path[path.length - 1] ?? '');
  switch (issue.code) {
    case 'unrecognized_keys': {
      const keys = issue.keys ?? [];
      return `unknown field${keys.length > 1 ? 's' : ''} ${keys.map(quote).join(', ')}; a misspelt setting is never replaced by a default`;
    }
    case 'invalid_value':
      return choice(issue.values ?? [], given);
    case 'invalid_union':
      if (issue.discriminator !== undefined && issue.options) return choice(issue.options, given);
      return `does not match any accepted form${alternatives ? `: ${alternatives}` : ''}; got ${describeValue(given)}`;
    case 'too_big':
    case 'too_small':
      return range(issue, given, field);
    case 'invalid_type': {
      const unit = unitOf(field);
      return `must be ${issue.expected === 'object' ? 'an object' : issue.expected === 'array' ? 'an array' : `a ${issue.expected}`}${unit && unit !== 'fraction' ? ` (${unit})` : ''}; got ${describeValue(given)}`;
    }
    default:
      return issue.message && issue.message !== 'Invalid input' ? issue.message : `is not accepted here; got ${describeValue(given)}`;
  }
}

function describeValue(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  if (typeof value === 'object') return 'an object';
  return `${typeof value} ${quote(value)}`;
}
