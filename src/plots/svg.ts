/**
 * A tiny deterministic SVG writer: attributes in the order given, numbers rounded to 0.01 px, text
 * escaped. Plots use presentation attributes only (no <style>, no style=""), so a strict
 * Content-Security-Policy on the response still lets them render.
 */

export type Attributes = Record<string, string | number | null | undefined>;

/** A number as it appears in the output: rounded to 2 decimals, no trailing zeros, never "-0". */
export function num(value: number): string {
  const rounded = Math.round(value * 100) / 100;
  return Object.is(rounded, -0) || rounded === 0 ? '0' : String(rounded);
}

export function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[c]!);
}

function attributes(attrs: Attributes): string {
  let out = '';
  for (const [key, value] of Object.entries(attrs)) {
    if (value === null || value === undefined) continue;
    out += ` ${key}="${typeof value === 'number' ? num(value) : escapeXml(value)}"`;
  }
  return out;
}

/** An element with child markup (already-written strings). */
export function el(name: string, attrs: Attributes = {}, ...children: string[]): string {
  return children.length === 0 ? `<${name}${attributes(attrs)}/>` : `<${name}${attributes(attrs)}>${children.join('')}</${name}>`;
}

/** An element holding escaped text. */
export function textEl(name: string, attrs: Attributes, text: string): string {
  return `<${name}${attributes(attrs)}>${escapeXml(text)}</${name}>`;
}

/**
 * Path data through the points, one `M`/`L` command per point; a non-finite point breaks the line
 * (the next finite point starts a new `M`).
 */
export function pathData(xs: ArrayLike<number>, ys: ArrayLike<number>): string {
  let d = '';
  let pen = false;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i]!;
    const y = ys[i]!;
    if (!Number.isFinite(x) || !Number.isFinite(y)) {
      pen = false;
      continue;
    }
    d += `${d ? ' ' : ''}${pen ? 'L' : 'M'}${num(x)},${num(y)}`;
    pen = true;
  }
  return d;
}

/** 32-bit FNV-1a, for short deterministic element ids (several plots may share one page). */
export function shortHash(text: string): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}
