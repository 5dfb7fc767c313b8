import { describe, expect, it } from 'vitest';
import type { Attachment } from '../../src/engine/record.js';
import { isLogSpaced, timeFrequencyPlot } from '../../src/plots/time-frequency.js';
import { labelValue } from './svg-reader.js';
import { demoRecord, timeFrequency } from './records.js';
import { all, attr, byClass, parseSvg, readAxis } from './svg-reader.js';
import type { Element } from '@xmldom/xmldom';

const PX = 0.02;

function matrices(record: ReturnType<typeof timeFrequency>, channels: string[]) {
  const list = record.attachments as Attachment[];
  const power = Object.fromEntries(channels.map((c) => [c, list.find((a) => a.kind === 'power' && a.channel === c)!.data as Float64Array]));
  const edgeMask = (list.find((a) => a.kind === 'edgeMask')?.data as Uint8Array | undefined) ?? null;
  return { power, edgeMask };
}

/** Finite values outside edge cells: the range the colour bar must span. */
function range(values: Float64Array[], mask: Uint8Array | null) {
  let min = Infinity;
  let max = -Infinity;
  for (const m of values) for (let i = 0; i < m.length; i++) if (Number.isFinite(m[i]!) && !(mask && mask[i] === 1)) [min, max] = [Math.min(min, m[i]!), Math.max(max, m[i]!)];
  return { min, max };
}

/** Reads the colour bar back: its steps' colours from bottom to top, and its printed ends. */
function colourBar(doc: ReturnType<typeof parseSvg>) {
  const bar = byClass(doc, 'colour-bar')[0]!;
  const steps = all(bar, 'rect')
    .filter((r) => r.getAttribute('fill') !== 'none')
    .sort((a, b) => attr(b, 'y') - attr(a, 'y'));
  const ends = byClass(bar, 'colour-bar-end').map((t) => labelValue(t.textContent!));
  return { steps: steps.map((r) => r.getAttribute('fill')!), ends: ends as [number, number] };
}

const dB = (p: number) => 10 * Math.log10(p); // common practice

describe('when Morlet power of the demo study is drawn as a heat map', () => {
  const record = timeFrequency(demoRecord({ method: 'morlet', frequencies: { low: 2, high: 40, count: 30 }, decimation: 4 }, 'eyes-closed', 'late', 3, 4));
  const m = matrices(record, ['Oz', 'Fz']);
  const svg = timeFrequencyPlot(record, { width: 800, height: 520 }, m);
  const doc = parseSvg(svg);
  const T = record.result.timeFrequency!.times.length;
  const frequencies = record.result.frequencies;
  const F = frequencies.length;

  it('should span the colour bar over the data range in dB, outside edge cells', () => {
    const { min, max } = range(Object.values(m.power), m.edgeMask);
    const { ends } = colourBar(doc);
    // The ends are printed with 4 significant digits.
    expect(Math.abs(ends[0] - dB(min))).toBeLessThan(0.01);
    expect(Math.abs(ends[1] - dB(max))).toBeLessThan(0.01);
    expect(byClass(doc, 'colour-label')[0]!.textContent).toBe('Power (dB re 1 µV²)');
  });

  it('should use a log frequency axis for log-spaced frequencies, each row centred on its frequency', () => {
    expect(isLogSpaced(frequencies)).toBe(true);
    const panel = byClass(doc, 'panel').find((p) => p.getAttribute('data-channel') === 'Oz')!;
    const y = readAxis(panel, 'y', true);
    const cells = all(byClass(panel, 'heat-map')[0]!, 'rect');
    for (const k of [0, 10, F - 1]) {
      const row = cells.find((c) => Math.abs(y.invert(attr(c, 'y') + (attr(c, 'height') - 0.3) / 2) / frequencies[k]! - 1) < 1e-3);
      expect(row, `a row centred on ${frequencies[k]} Hz`).toBeDefined();
    }
  });

  it('should colour each cell as the colour bar says its value is', () => {
    const panel = byClass(doc, 'panel').find((p) => p.getAttribute('data-channel') === 'Oz')!;
    const x = readAxis(panel, 'x');
    const y = readAxis(panel, 'y', true);
    const { steps, ends } = colourBar(doc);
    const cells = all(byClass(panel, 'heat-map')[0]!, 'rect');
    const power = m.power.Oz!;
    const times = record.result.timeFrequency!.times;
    for (const [t, k] of [
      [Math.floor(T / 2), frequencies.findIndex((f) => f > 9.5)],
      [Math.floor(T / 2), F - 1],
      [Math.floor(T / 3), 5],
    ] as const) {
      const px = x.pixelOf(times[t]!);
      const py = y.pixelOf(frequencies[k]!);
      const cell = cells.find((c: Element) => attr(c, 'x') <= px && px <= attr(c, 'x') + attr(c, 'width') - 0.3 && attr(c, 'y') <= py && py <= attr(c, 'y') + attr(c, 'height') - 0.3)!;
      const step = steps.indexOf(cell.getAttribute('fill')!);
      expect(step).toBeGreaterThanOrEqual(0);
      const value = ends[0] + ((step + 0.5) / steps.length) * (ends[1] - ends[0]);
      expect(Math.abs(value - dB(power[t * F + k]!))).toBeLessThanOrEqual((ends[1] - ends[0]) / steps.length);
    }
  });

  it('should hatch exactly the edge cells of the edge mask', () => {
    const mask = m.edgeMask!;
    const edgeCount = mask.reduce((a, b) => a + b, 0);
    expect(edgeCount).toBeGreaterThan(0);
    const panel = byClass(doc, 'panel')[0]!;
    const x = readAxis(panel, 'x');
    const times = record.result.timeFrequency!.times;
    const cellWidth = (times[1]! - times[0]!) / x.perPixel(0);
    const drawn = byClass(panel, 'edge-cell').reduce((n, r) => n + Math.round(attr(r, 'width') / cellWidth), 0);
    expect(drawn).toBe(edgeCount);
    expect(byClass(panel, 'edge-cell')[0]!.getAttribute('fill')).toMatch(/^url\(#rm[0-9a-f]{8}-hatch\)$/);
    expect(byClass(doc, 'edge-key')[0]!.textContent).toContain('edge cells');
  });

  it('should draw the asked channels as panels and give the same bytes twice', () => {
    expect(byClass(doc, 'panel').map((p) => p.getAttribute('data-channel'))).toEqual(['Oz', 'Fz']);
    expect(timeFrequencyPlot(record, { width: 800, height: 520 }, m)).toBe(svg);
  });
});

describe('when baseline-normalized power is drawn', () => {
  // At 2 Hz the wavelet overhangs the whole 0.5–1.5 s baseline, so that row has no defined value.
  const record = timeFrequency(
    demoRecord({ method: 'morlet', frequencies: { low: 2, high: 30, count: 16 }, decimation: 4, baseline: { start: 0.5, end: 1.5, mode: 'decibel' } }, 'eyes-closed', 'late', 3, 4),
  );
  const m = matrices(record, ['O1']);
  const doc = parseSvg(timeFrequencyPlot(record, { width: 700, height: 400 }, m));

  it('should centre a diverging colour bar on 0 dB, its ends at ± the largest change', () => {
    const { min, max } = range([m.power.O1!], m.edgeMask);
    const reach = Math.max(Math.abs(min), Math.abs(max));
    const { steps, ends } = colourBar(doc);
    expect(Math.abs(ends[0] + reach)).toBeLessThan(1e-3 * reach);
    expect(Math.abs(ends[1] - reach)).toBeLessThan(1e-3 * reach);
    expect(byClass(doc, 'colour-label')[0]!.textContent).toBe('Power change (dB from baseline)');
    // The middle of the map is the lightest colour: no change stands out least.
    const lightness = (hex: string) => parseInt(hex.slice(1, 3), 16) + parseInt(hex.slice(3, 5), 16) + parseInt(hex.slice(5, 7), 16);
    const brightest = steps.reduce((best, s, i) => (lightness(s) > lightness(steps[best]!) ? i : best), 0);
    expect(Math.abs(brightest - steps.length / 2)).toBeLessThanOrEqual(1);
  });
});

describe('when some cells have no value', () => {
  const record = timeFrequency(
    demoRecord({ method: 'morlet', frequencies: { low: 2, high: 30, count: 16 }, decimation: 4, baseline: { start: 0.5, end: 1.5, mode: 'decibel' } }, 'eyes-closed', 'late', 3, 4),
  );
  const m = matrices(record, ['O1']);
  const doc = parseSvg(timeFrequencyPlot(record, { width: 700, height: 400 }, m));

  it('should dot exactly those cells and say so', () => {
    const missing = Array.from(m.power.O1!).filter((v) => !Number.isFinite(v)).length;
    expect(missing).toBeGreaterThan(0);
    const panel = byClass(doc, 'panel')[0]!;
    const x = readAxis(panel, 'x');
    const times = record.result.timeFrequency!.times;
    const cellWidth = (times[1]! - times[0]!) / x.perPixel(0);
    expect(byClass(panel, 'no-value').reduce((n, r) => n + Math.round(attr(r, 'width') / cellWidth), 0)).toBe(missing);
    expect(byClass(doc, 'no-value-key')[0]!.textContent).toBe('dotted: no value');
  });
});

describe('when a spectrogram is drawn', () => {
  const record = timeFrequency(demoRecord({ method: 'spectrogram' }, 'eyes-open', 'early', 2, 4));
  const m = matrices(record, ['Cz']);
  const doc = parseSvg(timeFrequencyPlot(record, { width: 700, height: 400 }, m));

  it('should use a linear frequency axis with nice ticks and the PSD unit', () => {
    expect(isLogSpaced(record.result.frequencies)).toBe(false);
    const y = readAxis(byClass(doc, 'panel')[0]!, 'y');
    expect(y.ticks.map((t) => t.value)).toEqual([0, 20, 40, 60, 80, 100, 120]);
    expect(byClass(doc, 'colour-label')[0]!.textContent).toBe('Power (dB re 1 µV²/Hz)');
    expect(byClass(doc, 'edge-cell')).toHaveLength(0);
  });
});

describe('when a matrix has more times than the panel has pixels', () => {
  const record = timeFrequency(demoRecord({ method: 'morlet', frequencies: { low: 4, high: 30, count: 8 } }, 'eyes-closed', 'late', 1, 4));
  const m = matrices(record, ['Oz']);
  const svg = timeFrequencyPlot(record, { width: 400, height: 300 }, m);
  const doc = parseSvg(svg);
  const T = record.result.timeFrequency!.times.length;

  it('should average the times into one column per pixel, keeping the colour bar on the full data range', () => {
    expect(T).toBe(1024);
    const panel = byClass(doc, 'panel')[0]!;
    const x = readAxis(panel, 'x');
    const starts = new Set(all(byClass(panel, 'heat-map')[0]!, 'rect').map((r) => attr(r, 'x')));
    const areaWidth = 400 - 72 - 120;
    expect(starts.size).toBeLessThanOrEqual(areaWidth);
    const { min, max } = range([m.power.Oz!], m.edgeMask);
    const { ends } = colourBar(doc);
    expect(Math.abs(ends[0] - dB(min))).toBeLessThan(0.01);
    expect(Math.abs(ends[1] - dB(max))).toBeLessThan(0.01);
    expect(all(doc, 'desc')[0]!.textContent).toContain(`the ${T} times are averaged into ${areaWidth} columns`);
    // The pooled columns still tile the whole time range.
    const times = record.result.timeFrequency!.times;
    const firstEdge = Math.min(...starts);
    expect(Math.abs(x.invert(firstEdge) - (times[0]! - (times[1]! - times[0]!) / 2))).toBeLessThan(PX * x.perPixel(0));
    expect(svg.length).toBeLessThan(600_000);
  });
});
