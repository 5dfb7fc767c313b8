import { describe, expect, it } from 'vitest';
import { divergingColour, labToHex, sequentialColour } from '../../src/plots/colour.js';
import { linearTicks, logTicks, niceDomain, niceStep } from '../../src/plots/scale.js';

/** sRGB (IEC 61966-2-1) → CIELAB L* (CIE 15, D65), written here apart from the code under test. */
function lightness(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => {
    const c = parseInt(hex.slice(i, i + 2), 16) / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  }) as [number, number, number];
  const Y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  return Y > (6 / 29) ** 3 ? 116 * Math.cbrt(Y) - 16 : (29 / 3) ** 3 * Y;
}

describe('when ticks are chosen', () => {
  it('should step by 1, 2 or 5 × 10^k', () => {
    expect(niceStep(127.5, 8)).toBe(20);
    expect(niceStep(1, 5)).toBe(0.2);
    expect(niceStep(0.03, 6)).toBe(0.005);
    expect(linearTicks(0.5, 128, 8).map((t) => t.value)).toEqual([20, 40, 60, 80, 100, 120]);
    expect(linearTicks(-0.3, 0.3, 6).map((t) => t.label)).toEqual(['\u22120.3', '\u22120.2', '\u22120.1', '0.0', '0.1', '0.2', '0.3']);
    expect(niceDomain(-12.3, 27.9, 6)).toEqual([-15, 30]);
  });

  it('should tick a log axis on decades, and on 1-2-5 within two decades', () => {
    expect(logTicks(0.01, 1000).map((t) => t.value)).toEqual([0.01, 0.1, 1, 10, 100, 1000]);
    expect(logTicks(1, 50).map((t) => t.label)).toEqual(['1', '2', '5', '10', '20', '50']);
    expect(logTicks(1e-6, 1e-3).map((t) => t.label)).toEqual(['10\u207b\u2076', '10\u207b\u2075', '10\u207b\u2074', '0.001']);
  });
});

describe('when colours are made from CIELAB', () => {
  it('should give sRGB white and red for their published CIELAB values', () => {
    // D65 white is L* 100; sRGB red is about (53.24, 80.09, 67.20) — from memory, widely tabulated.
    expect(labToHex([100, 0, 0])).toBe('#ffffff');
    expect(labToHex([53.24, 80.09, 67.2])).toBe('#ff0000');
  });

  it('should raise lightness evenly along the sequential map', () => {
    const L = Array.from({ length: 11 }, (_, i) => lightness(sequentialColour(i / 10)));
    const steps = L.slice(1).map((v, i) => v - L[i]!);
    for (const s of steps) expect(Math.abs(s - (L[10]! - L[0]!) / 10)).toBeLessThan(1.5);
    expect(L[10]! - L[0]!).toBeGreaterThan(60);
  });

  it('should mirror lightness around a light centre on the diverging map', () => {
    const centre = lightness(divergingColour(0));
    expect(centre).toBeGreaterThan(95);
    for (const t of [0.25, 0.5, 0.75, 1]) {
      expect(Math.abs(lightness(divergingColour(t)) - lightness(divergingColour(-t)))).toBeLessThan(4);
      expect(lightness(divergingColour(t))).toBeLessThan(centre);
    }
  });
});
