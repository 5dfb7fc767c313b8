import { DOMParser, type Document, type Element } from '@xmldom/xmldom';

/** Parses SVG text with a real XML parser; malformed markup throws. */
export function parseSvg(text: string): Document {
  const errors: string[] = [];
  const doc = new DOMParser({ onError: (level, message) => errors.push(`${level}: ${message}`) }).parseFromString(text, 'image/svg+xml');
  if (errors.length > 0) throw new Error(`SVG does not parse: ${errors.join('; ')}`);
  return doc;
}

export function all(doc: Document | Element, tag: string): Element[] {
  return Array.from(doc.getElementsByTagName(tag));
}

/** Elements whose class list holds `name`. */
export function byClass(doc: Document | Element, name: string): Element[] {
  return all(doc, '*').filter((e) => (e.getAttribute('class') ?? '').split(/\s+/).includes(name));
}

export function attr(e: Element, name: string): number {
  const v = e.getAttribute(name);
  if (v === null) throw new Error(`<${e.tagName}> has no ${name}`);
  return Number(v);
}

const SUPERSCRIPTS = '⁰¹²³⁴⁵⁶⁷⁸⁹';

/** A tick label as a number: "−10" (U+2212), "0.01", "10⁻⁵", "2×10⁶". */
export function labelValue(text: string): number {
  const t = text.trim().replace(/\u2212/g, '-');
  const power = /^(?:(\d+(?:\.\d+)?)×)?10([⁻]?)([⁰¹²³⁴⁵⁶⁷⁸⁹]+)$/.exec(t);
  if (power) {
    const exponent = Number([...power[3]!].map((c) => SUPERSCRIPTS.indexOf(c)).join('')) * (power[2] ? -1 : 1);
    return Number(power[1] ?? 1) * 10 ** exponent;
  }
  const n = Number(t);
  if (!Number.isFinite(n)) throw new Error(`tick label "${text}" is not a number`);
  return n;
}

export interface Axis {
  ticks: { pixel: number; value: number; label: string }[];
  /** pixel → value, fitted through the first and last tick (in log10 for a log axis) */
  invert(pixel: number): number;
  /** value → pixel, the same fit */
  pixelOf(value: number): number;
  /** value units per pixel near `value` */
  perPixel(value: number): number;
}

/**
 * Reads an axis back from the picture alone: each tick's position (its grid line) and its printed
 * label. The map between them is fitted through the outermost ticks, so a test checks drawn
 * positions against printed numbers, not against the code that drew them.
 */
export function readAxis(root: Document | Element, which: 'x' | 'y', log = false): Axis {
  const ticks = byClass(root, `${which}-tick`).map((g) => {
    const line = all(g, 'line')[0]!;
    const label = all(g, 'text')[0]!.textContent ?? '';
    return { pixel: attr(line, which === 'x' ? 'x1' : 'y1'), value: labelValue(label), label };
  });
  if (ticks.length < 2) throw new Error(`the ${which} axis has ${ticks.length} tick(s)`);
  const a = ticks[0]!;
  const b = ticks[ticks.length - 1]!;
  const f = (v: number) => (log ? Math.log10(v) : v);
  const g = (u: number) => (log ? 10 ** u : u);
  const k = (f(b.value) - f(a.value)) / (b.pixel - a.pixel);
  return {
    ticks,
    invert: (p) => g(f(a.value) + (p - a.pixel) * k),
    pixelOf: (v) => a.pixel + (f(v) - f(a.value)) / k,
    perPixel: (v) => (log ? Math.abs(v * Math.LN10 * k) : Math.abs(k)),
  };
}

/** The points of an `M x,y L x,y …` path, with the command letter of each. */
export function pathPoints(d: string): { command: string; x: number; y: number }[] {
  return Array.from(d.matchAll(/([MLZ])\s*(?:(-?[\d.]+),(-?[\d.]+))?/g))
    .filter((m) => m[1] !== 'Z')
    .map((m) => ({ command: m[1]!, x: Number(m[2]), y: Number(m[3]) }));
}

/** Whether consecutive ticks differ by one step of 1, 2 or 5 × 10^k (linear) or lie on 1-2-5 decades (log). */
export function isNiceSequence(values: number[], log = false): boolean {
  const nice = (v: number) => {
    const m = v / 10 ** Math.floor(Math.log10(v) + 1e-12);
    return [1, 2, 5, 10].some((n) => Math.abs(m - n) < 1e-9);
  };
  if (log) return values.every((v) => v > 0 && nice(v));
  const steps = values.slice(1).map((v, i) => v - values[i]!);
  return (
    steps.length > 0 && nice(steps[0]!) && steps.every((s) => Math.abs(s - steps[0]!) < 1e-9 * Math.abs(steps[0]!)) && values.every((v) => Math.abs(v / steps[0]! - Math.round(v / steps[0]!)) < 1e-9)
  );
}
