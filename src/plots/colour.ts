/**
 * The plots' colour maps, built by straight-line interpolation in CIELAB (CIE 15, D65 white), so
 * equal steps of value are close to equal steps of perceived colour and lightness changes linearly.
 *
 * - sequential: dark blue → grey → light yellow. The hue moves along the blue–yellow axis, which the
 *   common red–green colour-vision deficiencies keep, and lightness rises monotonically, so the map
 *   also reads in greyscale.
 * - diverging: blue → near-white → red-orange, each half linear in CIELAB with mirrored lightness, so
 *   equal distances above and below the centre look equally strong and the centre (no change) is
 *   the lightest colour.
 */

export type Lab = readonly [number, number, number];

const WHITE_X = 0.95047;
const WHITE_Z = 1.08883;

function labToLinearRgb([L, a, b]: Lab): [number, number, number] {
  const fy = (L + 16) / 116;
  const fx = fy + a / 500;
  const fz = fy - b / 200;
  const inverse = (t: number) => (t > 6 / 29 ? t ** 3 : 3 * (6 / 29) ** 2 * (t - 4 / 29));
  const X = WHITE_X * inverse(fx);
  const Y = inverse(fy);
  const Z = WHITE_Z * inverse(fz);
  // IEC 61966-2-1 (sRGB) XYZ → linear RGB.
  return [3.2406 * X - 1.5372 * Y - 0.4986 * Z, -0.9689 * X + 1.8758 * Y + 0.0415 * Z, 0.0557 * X - 0.204 * Y + 1.057 * Z];
}

function encode(linear: number): number {
  const c = Math.min(1, Math.max(0, linear));
  const v = c <= 0.0031308 ? 12.92 * c : 1.055 * c ** (1 / 2.4) - 0.055;
  return Math.round(v * 255);
}

/** CIELAB (D65) → `#rrggbb`, clipped to the sRGB gamut. */
export function labToHex(lab: Lab): string {
  return `#${labToLinearRgb(lab)
    .map((c) => encode(c).toString(16).padStart(2, '0'))
    .join('')}`;
}

function mix(a: Lab, b: Lab, t: number): Lab {
  return [a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t, a[2] + (b[2] - a[2]) * t];
}

export const SEQUENTIAL_ENDS: readonly [Lab, Lab] = [
  [18, 8, -38],
  [94, -6, 72],
];
export const DIVERGING_STOPS: readonly [Lab, Lab, Lab] = [
  [32, 12, -52],
  [97, 0, 0],
  [36, 50, 42],
];

function clamp01(t: number): number {
  return Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0;
}

/** Sequential colour of t in [0, 1] (clamped). */
export function sequentialColour(t: number): string {
  return labToHex(mix(SEQUENTIAL_ENDS[0], SEQUENTIAL_ENDS[1], clamp01(t)));
}

/** Diverging colour of t in [−1, 1] (clamped); 0 is the neutral centre. */
export function divergingColour(t: number): string {
  const u = Number.isFinite(t) ? Math.min(1, Math.max(-1, t)) : 0;
  return labToHex(u < 0 ? mix(DIVERGING_STOPS[1], DIVERGING_STOPS[0], -u) : mix(DIVERGING_STOPS[1], DIVERGING_STOPS[2], u));
}

/**
 * Line colours for channels and pairs: the eight colours Okabe and Ito proposed for colour-blind
 * readers, ordered so the pale yellow (weak on white) comes last.
 */
export const SERIES_COLOURS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#000000', '#F0E442'] as const;

export function seriesColour(index: number): string {
  return SERIES_COLOURS[index % SERIES_COLOURS.length]!;
}
