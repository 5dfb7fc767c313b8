/**
 * Canonical JSON: object keys sorted by UTF-16 code unit, no insignificant white space, numbers in
 * ECMAScript's shortest round-trip form (so a float64 survives a JSON round trip bit for bit).
 * Hashes of recipes and results are taken over this text, so it must never depend on key insertion
 * order. Non-finite numbers are refused rather than silently turned into `null`.
 *
 * Results hold tens of thousands of numbers, so arrays of numbers take a fast path and the JSON
 * path of an offending value is only spelled out when there is one.
 */
export function canonicalJson(value: unknown): string {
  const path: (string | number)[] = [];
  return write(value, path);
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

function number(value: number, path: (string | number)[]): string {
  if (!Number.isFinite(value)) throw new TypeError(`canonical JSON cannot hold the non-finite number at ${where(path)}`);
  return value === 0 ? '0' : String(value);
}

function write(value: unknown, path: (string | number)[]): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'number':
      return number(value, path);
    case 'string':
      return JSON.stringify(value);
    case 'boolean':
      return value ? 'true' : 'false';
    case 'object':
      break;
    default:
      throw new TypeError(`canonical JSON cannot hold a ${typeof value} at ${where(path)}`);
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
  const keys = Object.keys(record).filter((k) => record[k] !== undefined).sort();
  let out = '{';
  for (let i = 0; i < keys.length; i++) {
    const key = keys[i]!;
    if (i > 0) out += ',';
    path.push(key);
    out += JSON.stringify(key) + ':' + write(record[key], path);
    path.pop();
  }
  return out + '}';
}
