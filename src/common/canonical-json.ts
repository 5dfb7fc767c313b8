/**
 * Canonical JSON: object keys sorted by UTF-16 code unit, no insignificant white space, numbers in
 * ECMAScript's shortest round-trip form (so a float64 survives a JSON round trip bit for bit).
 * Hashes of recipes and results are taken over this text, so it must never depend on key insertion
 * order. Non-finite numbers are refused rather than silently turned into `null`.
 */
export function canonicalJson(value: unknown): string {
  const parts: string[] = [];
  write(value, parts, '$');
  return parts.join('');
}

function write(value: unknown, out: string[], path: string): void {
  if (value === null) {
    out.push('null');
    return;
  }
  switch (typeof value) {
    case 'number':
      if (!Number.isFinite(value)) throw new TypeError(`canonical JSON cannot hold the non-finite number at ${path}`);
      out.push(Object.is(value, -0) ? '0' : String(value));
      return;
    case 'string':
      out.push(JSON.stringify(value));
      return;
    case 'boolean':
      out.push(value ? 'true' : 'false');
      return;
    case 'object':
      break;
    default:
      throw new TypeError(`canonical JSON cannot hold a ${typeof value} at ${path}`);
  }
  if (Array.isArray(value) || ArrayBuffer.isView(value)) {
    const items = value as ArrayLike<unknown>;
    out.push('[');
    for (let i = 0; i < items.length; i++) {
      if (i > 0) out.push(',');
      write(items[i], out, `${path}[${i}]`);
    }
    out.push(']');
    return;
  }
  const record = value as Record<string, unknown>;
  const keys = Object.keys(record).filter((k) => record[k] !== undefined).sort();
  out.push('{');
  keys.forEach((key, i) => {
    if (i > 0) out.push(',');
    out.push(JSON.stringify(key), ':');
    write(record[key], out, `${path}.${key}`);
  });
  out.push('}');
}
