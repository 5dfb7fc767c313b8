/**
 * Canonical JSON as RFC 8785 (JSON Canonicalization Scheme) defines it:
 * - object members sorted by their names as arrays of UTF-16 code units (§3.2.3);
 * - no white space between tokens;
 * - numbers as ECMAScript's Number.prototype.toString writes them, the shortest text that reads
 *   back to the same float64, with −0 written as 0 (§3.2.2.3); NaN and ±Infinity are errors;
 * - strings as ECMAScript's JSON.stringify writes them: only `"`, `\` and U+0000–U+001F escaped,
 *   with \b \t \n \f \r and lowercase \u00xx (§3.2.2.2);
 * - the data must be I-JSON (RFC 7493), so a string holding a lone surrogate is an error rather
 *   than a guess at how to write it.
 *
 * Hashes of recipes, signals and results are taken over this text, so it must never depend on key
 * insertion order. Results hold tens of thousands of numbers, so arrays of numbers take a fast path
 * and the JSON path of an offending value is only spelled out when there is one.
 */
export function canonicalJson(value: unknown): string {
  const path: (string | number)[] = [];
  return write(value, path);
}

/** A value that RFC 8785 cannot write; `pointer` is the RFC 6901 JSON pointer of the value. */
export class CanonicalJsonError extends TypeError {
  override readonly name = 'CanonicalJsonError';
  readonly pointer: string;
  constructor(what: string, path: readonly (string | number)[]) {
    super(`canonical JSON cannot hold ${what} at ${where(path)}`);
    this.pointer = path.map((p) => '/' + String(p).replaceAll('~', '~0').replaceAll('/', '~1')).join('');
  }
}

const remembered = new WeakMap<object, string>();

/**
 * canonicalJson(value), computed once per object: the engine hashes a result and the job runner
 * stores the same text, without writing tens of thousands of numbers twice. The object must not
 * change after the first call (results are never mutated once hashed).
 */
export function canonicalJsonOnce(value: object): string {
  let text = remembered.get(value);
  if (text === undefined) {
    text = canonicalJson(value);
    remembered.set(value, text);
  }
  return text;
}

function where(path: readonly (string | number)[]): string {
  return '$' + path.map((p) => (typeof p === 'number' ? `[${p}]` : `.${p}`)).join('');
}

/** Index of the first unpaired UTF-16 surrogate in `text`, or −1. */
export function loneSurrogateAt(text: string): number {
  for (let i = 0; i < text.length; i++) {
    const unit = text.charCodeAt(i);
    if (unit < 0xd800 || unit > 0xdfff) continue;
    if (unit <= 0xdbff && i + 1 < text.length) {
      const next = text.charCodeAt(i + 1);
      if (next >= 0xdc00 && next <= 0xdfff) {
        i++;
        continue;
      }
    }
    return i;
  }
  return -1;
}

// Lone surrogates are rare enough that one regular-expression test keeps the common path fast.
const SURROGATE = /[\ud800-\udfff]/;

function string(text: string, path: (string | number)[]): string {
  if (SURROGATE.test(text) && loneSurrogateAt(text) >= 0) throw new CanonicalJsonError('a string with an unpaired UTF-16 surrogate (not I-JSON)', path);
  return JSON.stringify(text);
}

function number(value: number, path: (string | number)[]): string {
  if (!Number.isFinite(value)) throw new CanonicalJsonError('the non-finite number', path);
  return value === 0 ? '0' : String(value);
}

function write(value: unknown, path: (string | number)[]): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'number':
      return number(value, path);
    case 'string':
      return string(value, path);
    case 'boolean':
      return value ? 'true' : 'false';
    case 'object':
      break;
    default:
      throw new CanonicalJsonError(`a ${typeof value}`, path);
  }
  if (Array.isArray(value) || ArrayBuffer.isView(value)) {
    const items = value as ArrayLike<unknown>;
    let out = '[';
    for (let i = 0; i < items.length; i++) {
      const item = items[i];
      if (i > 0) out += ',';
      if (typeof item === 'number' && Number.isFinite(item)) {
        out += item === 0 ? '0' : String(item);
      } else {
        path.push(i);
        out += write(item, path);
        path.pop();
      }
    }
    return out + ']';
  }
  const record = value as Record<string, unknown>;
  // Array.prototype.sort without a comparator orders strings by UTF-16 code units, as §3.2.3 asks.
  const keys = Object.keys(record)
    .filter((k) => record[k] !== undefined)
    .sort();
  let out = '{';
  for (let i = 0; i < keys.length; i++) {
    const key = keys[i]!;
    if (i > 0) out += ',';
    path.push(key);
    out += string(key, path) + ':' + write(record[key], path);
    path.pop();
  }
  return out + '}';
}
