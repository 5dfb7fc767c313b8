/** Axis scales and "nice" ticks (steps of 1, 2 or 5 × 10^k), written for the plots. */

export interface Scale {
  (value: number): number;
  readonly domain: readonly [number, number];
  readonly range: readonly [number, number];
  readonly log: boolean;
  invert(pixel: number): number;
}

export interface Tick {
  value: number;
  label: string;
}

/** Maps [d0, d1] linearly onto [r0, r1]. A zero-width domain is widened by ±1 so it still draws. */
export function linearScale(domain: readonly [number, number], range: readonly [number, number]): Scale {
  let [d0, d1] = domain;
  if (d0 === d1) [d0, d1] = [d0 - 1, d1 + 1];
  const [r0, r1] = range;
  const k = (r1 - r0) / (d1 - d0);
  const scale = ((v: number) => r0 + (v - d0) * k) as Scale;
  return Object.assign(scale, { domain: [d0, d1] as const, range: [r0, r1] as const, log: false, invert: (p: number) => d0 + (p - r0) / k });
}

/** Maps [d0, d1] (both > 0) onto [r0, r1] linearly in log10. */
export function logScale(domain: readonly [number, number], range: readonly [number, number]): Scale {
  let [d0, d1] = domain;
  if (d0 === d1) [d0, d1] = [d0 / 10, d1 * 10];
  const inner = linearScale([Math.log10(d0), Math.log10(d1)], range);
  const scale = ((v: number) => (v > 0 ? inner(Math.log10(v)) : Number.NaN)) as Scale;
  return Object.assign(scale, { domain: [d0, d1] as const, range: inner.range, log: true, invert: (p: number) => 10 ** inner.invert(p) });
}

/** The nice step (1, 2 or 5 × 10^k) that splits `span` into about `count` intervals. */
export function niceStep(span: number, count: number): number {
  const raw = Math.abs(span) / Math.max(1, count);
  if (!(raw > 0) || !Number.isFinite(raw)) return 1;
  const power = 10 ** Math.floor(Math.log10(raw));
  const m = raw / power;
  return (m < 1.5 ? 1 : m < 3.5 ? 2 : m < 7.5 ? 5 : 10) * power;
}

function decimalsOf(step: number): number {
  return Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
}

/** A number for a label: fixed decimals, with a real minus sign (U+2212). */
export function formatNumber(value: number, decimals: number): string {
  const text = value.toFixed(decimals);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text.replace('-', '\u2212');
}

/** Up to ~4 significant digits, for values that are not ticks (colour-bar ends, peak labels). */
export function formatValue(value: number): string {
  if (value === 0) return '0';
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  if (magnitude >= 6 || magnitude <= -4) return value.toExponential(3).replace('-', '\u2212');
  return formatNumber(value, Math.max(0, 3 - magnitude));
}

/** Extends [d0, d1] outwards to multiples of the nice step. */
export function niceDomain(d0: number, d1: number, count = 6): [number, number] {
  if (d0 === d1) return [d0 - 1, d1 + 1];
  const step = niceStep(d1 - d0, count);
  return [Math.floor(d0 / step + 1e-9) * step, Math.ceil(d1 / step - 1e-9) * step];
}

/** Multiples of a nice step inside [d0, d1] (ends included within 1e-9 of a step). */
export function linearTicks(d0: number, d1: number, count = 6): Tick[] {
  const lo = Math.min(d0, d1);
  const hi = Math.max(d0, d1);
  const step = niceStep(hi - lo, count);
  const decimals = decimalsOf(step);
  const ticks: Tick[] = [];
  for (let i = Math.ceil(lo / step - 1e-9); i <= Math.floor(hi / step + 1e-9); i++) {
    // Integer multiples, rounded to the step's decimals, so no 0.30000000000000004 reaches a label.
    const value = Number((i * step).toFixed(decimals));
    ticks.push({ value, label: formatNumber(value, decimals) });
  }
  return ticks;
}

const SUPERSCRIPT: Record<string, string> = {
  '-': '\u207b',
  '0': '\u2070',
  '1': '\u00b9',
  '2': '\u00b2',
  '3': '\u00b3',
  '4': '\u2074',
  '5': '\u2075',
  '6': '\u2076',
  '7': '\u2077',
  '8': '\u2078',
  '9': '\u2079',
};

function powerLabel(mantissa: number, exponent: number): string {
  if (exponent >= -3 && exponent <= 4) return formatNumber(mantissa * 10 ** exponent, Math.max(0, -exponent));
  const power = `10${String(exponent)
    .split('')
    .map((c) => SUPERSCRIPT[c])
    .join('')}`;
  return mantissa === 1 ? power : `${mantissa}\u00d7${power}`;
}

/** Decades inside [d0, d1] (> 0); with fewer than three decades, 2× and 5× as well. */
export function logTicks(d0: number, d1: number): Tick[] {
  const lo = Math.min(d0, d1);
  const hi = Math.max(d0, d1);
  const first = Math.floor(Math.log10(lo));
  const last = Math.ceil(Math.log10(hi));
  const mantissas = last - first <= 2 ? [1, 2, 5] : [1];
  const ticks: Tick[] = [];
  for (let e = first; e <= last; e++) {
    for (const m of mantissas) {
      const value = Number((m * 10 ** e).toPrecision(12));
      if (value >= lo * (1 - 1e-9) && value <= hi * (1 + 1e-9)) ticks.push({ value, label: powerLabel(m, e) });
    }
  }
  return ticks;
}

/** Extends [d0, d1] (> 0) outwards to whole decades. */
export function logDomain(d0: number, d1: number): [number, number] {
  return [10 ** Math.floor(Math.log10(d0) + 1e-9), 10 ** Math.ceil(Math.log10(d1) - 1e-9)];
}
