import { describe, expect, it } from 'vitest';
import { DomainError } from '../../src/common/errors.js';
import { psdPlot } from '../../src/plots/psd.js';
import { demoRecord, spectral } from './records.js';
import { all, attr, byClass, isNiceSequence, parseSvg, pathPoints, readAxis } from './svg-reader.js';

// Coordinates are written rounded to 0.01 px and the tick positions too: a value read back through
// the axes is off by at most ~0.02 px of its axis, which is the tolerance used below.
const PX = 0.02;

const record = spectral(demoRecord({ method: 'welch', confidence: 0.95, perEpoch: true, features: { peakFrequency: {} } }));
const frequencies = record.result.frequencies;
const oz = record.result.channels.find((c) => c.name === 'Oz')!;
const dB = (p: number) => 10 * Math.log10(p); // dB re 1 unit², 10·log10 of a power ratio (common practice)

function series(svg: string, label: string) {
  const doc = parseSvg(svg);
  const path = byClass(doc, 'series').find((p) => p.getAttribute('data-series') === label)!;
  return { doc, points: pathPoints(path.getAttribute('d')!) };
}

describe('when a Welch record of the demo study is drawn as a PSD in dB', () => {
  const svg = psdPlot(record, { width: 800, height: 480, channels: ['Oz', 'Fz'] });
  const { doc, points } = series(svg, 'Oz');
  const x = readAxis(doc, 'x');
  const y = readAxis(doc, 'y');

  it('should draw one point per frequency bin above 0 Hz, as one unbroken line', () => {
    const inRange = frequencies.filter((f) => f > 0);
    expect(points).toHaveLength(inRange.length);
    expect(points.filter((p) => p.command === 'M')).toHaveLength(1);
  });

  it('should put points where the axes say their frequency and power are', () => {
    for (const target of [2, 6, 10, 20, 40, 100]) {
      const k = frequencies.indexOf(target);
      const p = points[k - 1]!; // bin 0 (0 Hz) is left out
      expect(Math.abs(x.invert(p.x) - target)).toBeLessThan(PX * x.perPixel(target));
      expect(Math.abs(y.invert(p.y) - dB(oz.psd[k]!))).toBeLessThan(PX * y.perPixel(0));
    }
  });

  it('should show the eyes-closed alpha peak of Oz near 10 Hz, where the record has it', () => {
    // The invented generator puts occipital alpha at 9.8–10.2 Hz (src/signals/demo-recording.ts).
    const peak = oz.features!.peakFrequency!;
    expect(peak.frequency!).toBeGreaterThan(9.5);
    expect(peak.frequency!).toBeLessThan(10.5);
    const marker = all(byClass(doc, 'peak').find((g) => g.getAttribute('data-series') === 'Oz')!, 'circle')[0]!;
    expect(Math.abs(x.invert(attr(marker, 'cx')) - peak.frequency!)).toBeLessThan(PX * x.perPixel(10));
    expect(Math.abs(y.invert(attr(marker, 'cy')) - dB(peak.power!))).toBeLessThan(PX * y.perPixel(0));
    const highest = points.reduce((best, p) => (p.y < best.y ? p : best));
    expect(Math.abs(x.invert(highest.x) - 10)).toBeLessThan(0.6);
  });

  it('should shade each band exactly between its edges and name it', () => {
    for (const band of byClass(doc, 'band')) {
      const name = band.getAttribute('data-band')!;
      const edges = record.recipe.method === 'welch' ? record.recipe.bands.find((b) => b.name === name)! : null;
      const rect = all(band, 'rect')[0]!;
      expect(Math.abs(x.invert(attr(rect, 'x')) - Math.max(edges!.low, 0.5))).toBeLessThan(PX * x.perPixel(1));
      expect(Math.abs(x.invert(attr(rect, 'x') + attr(rect, 'width')) - edges!.high)).toBeLessThan(PX * x.perPixel(1));
      expect(all(band, 'text')[0]!.textContent).toBe(name);
    }
    // The default IFCN-based bands of the README: delta, theta, alpha, beta, gamma.
    expect(byClass(doc, 'band').map((b) => b.getAttribute('data-band'))).toEqual(['delta', 'theta', 'alpha', 'beta', 'gamma']);
  });

  it("should draw the confidence ribbon through the record's bounds", () => {
    const ribbon = byClass(doc, 'ribbon').find((p) => p.getAttribute('data-series') === 'Oz')!;
    const ps = pathPoints(ribbon.getAttribute('d')!);
    const n = frequencies.length - 1;
    expect(ps).toHaveLength(2 * n);
    const k = frequencies.indexOf(10);
    expect(Math.abs(y.invert(ps[k - 1]!.y) - dB(oz.psdUpper![k]!))).toBeLessThan(PX * y.perPixel(0));
    expect(Math.abs(y.invert(ps[2 * n - k]!.y) - dB(oz.psdLower![k]!))).toBeLessThan(PX * y.perPixel(0));
  });

  it('should draw every epoch of each channel faintly behind the mean', () => {
    const epochs = byClass(doc, 'epoch');
    expect(epochs).toHaveLength(10 * 2);
    expect(Number(epochs[0]!.getAttribute('stroke-opacity'))).toBeLessThan(0.5);
    const svgWithout = psdPlot(record, { width: 800, height: 480, channels: ['Oz'], epochs: false });
    expect(byClass(parseSvg(svgWithout), 'epoch')).toHaveLength(0);
  });

  it('should label its axes with units and use nice tick steps', () => {
    const labels = byClass(doc, 'axis-label').map((t) => t.textContent);
    expect(labels).toEqual(['Power (dB re 1 µV²/Hz)', 'Frequency (Hz)']);
    expect(isNiceSequence(x.ticks.map((t) => t.value))).toBe(true);
    expect(isNiceSequence(y.ticks.map((t) => t.value))).toBe(true);
  });

  it('should carry a title and a description for screen readers, as real text', () => {
    const root = doc.documentElement!;
    expect(root.getAttribute('role')).toBe('img');
    const [titleId, descId] = root.getAttribute('aria-labelledby')!.split(' ');
    expect(all(doc, 'title')[0]!.getAttribute('id')).toBe(titleId);
    expect(all(doc, 'desc')[0]!.getAttribute('id')).toBe(descId);
    expect(all(doc, 'desc')[0]!.textContent).toMatch(/Oz peak at 9\.\d\d Hz/);
    expect(all(doc, 'path').length + all(doc, 'text').length).toBeGreaterThan(20);
  });

  it('should give the same bytes for the same record and options', () => {
    expect(psdPlot(record, { width: 800, height: 480, channels: ['Oz', 'Fz'] })).toBe(svg);
    expect(psdPlot(record, { width: 801, height: 480, channels: ['Oz', 'Fz'] })).not.toBe(svg);
  });
});

describe('when the PSD is drawn on a log10 axis', () => {
  const svg = psdPlot(record, { width: 640, height: 400, channels: ['O1'], scale: 'log10', frequencyRange: [1, 45] });
  const { doc, points } = series(svg, 'O1');
  const x = readAxis(doc, 'x');
  const y = readAxis(doc, 'y', true);
  const o1 = record.result.channels.find((c) => c.name === 'O1')!;

  it('should keep the bins from 1 to 45 Hz and map them back in log10', () => {
    const keep = frequencies.map((f, k) => [f, k] as const).filter(([f]) => f >= 1 && f <= 45);
    expect(points).toHaveLength(keep.length);
    for (const j of [0, 18, 40, keep.length - 1]) {
      const [f, k] = keep[j]!;
      expect(Math.abs(x.invert(points[j]!.x) - f)).toBeLessThan(PX * x.perPixel(f));
      const p = o1.psd[k]!;
      expect(Math.abs(y.invert(points[j]!.y) - p)).toBeLessThan(PX * y.perPixel(p));
    }
  });

  it("should tick the power axis on decades in the record's unit", () => {
    expect(
      isNiceSequence(
        y.ticks.map((t) => t.value),
        true,
      ),
    ).toBe(true);
    expect(byClass(doc, 'axis-label')[0]!.textContent).toBe('Power (µV²/Hz)');
  });
});

describe('when the PSD plot is asked for a channel the record does not have', () => {
  it("should refuse with the record's channels listed", () => {
    let caught: unknown;
    try {
      psdPlot(record, { width: 800, height: 480, channels: ['Oz', 'T7'] });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(DomainError);
    const error = caught as DomainError;
    expect(error.code).toBe('unknown-channel');
    expect(error.pointer).toBe('/channels');
    expect(error.extensions.channels).toEqual(['F3', 'F4', 'Fz', 'Cz', 'Pz', 'O1', 'Oz', 'O2']);
    expect(error.detail).toContain('"T7"');
  });
});
