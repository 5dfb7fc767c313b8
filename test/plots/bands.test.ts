import { describe, expect, it } from 'vitest';
import { bandsPlot } from '../../src/plots/bands.js';
import { demoRecord, spectral } from './records.js';
import { attr, byClass, isNiceSequence, parseSvg, readAxis } from './svg-reader.js';

const PX = 0.02;
const record = spectral(demoRecord({ method: 'welch' }));

function bars(svg: string) {
  const doc = parseSvg(svg);
  const y = readAxis(doc, 'y');
  return {
    doc,
    y,
    bars: byClass(doc, 'bar').map((r) => ({ channel: r.getAttribute('data-channel')!, band: r.getAttribute('data-band')!, top: attr(r, 'y'), bottom: attr(r, 'y') + attr(r, 'height') })),
  };
}

describe('when band power of the demo study is drawn as bars', () => {
  it('should draw one bar per channel and band, its top at the absolute power on the axis', () => {
    const { y, bars: drawn } = bars(bandsPlot(record, { width: 800, height: 420 }));
    expect(drawn).toHaveLength(8 * 5);
    for (const bar of drawn) {
      const band = record.result.channels.find((c) => c.name === bar.channel)!.bands.find((b) => b.name === bar.band)!;
      expect(Math.abs(y.invert(bar.top) - band.absolute)).toBeLessThan(PX * y.perPixel(0));
      expect(Math.abs(y.invert(bar.bottom))).toBeLessThan(PX * y.perPixel(0));
    }
    // Eyes closed: occipital alpha is the tallest bar (invented data, src/signals/demo-recording.ts).
    const tallest = drawn.reduce((a, b) => (b.top < a.top ? b : a));
    expect(tallest.band).toBe('alpha');
    expect(['O1', 'Oz', 'O2']).toContain(tallest.channel);
  });

  it('should draw relative power as fractions of the total on a 0–1 axis of nice ticks', () => {
    const { doc, y, bars: drawn } = bars(bandsPlot(record, { width: 600, height: 400, channels: ['Fz', 'Oz'], value: 'relative' }));
    expect(drawn.map((b) => b.channel)).toEqual([...Array(5).fill('Fz'), ...Array(5).fill('Oz')]);
    for (const bar of drawn) {
      const band = record.result.channels.find((c) => c.name === bar.channel)!.bands.find((b) => b.name === bar.band)!;
      expect(Math.abs(y.invert(bar.top) - band.relative!)).toBeLessThan(PX * y.perPixel(0));
    }
    expect(isNiceSequence(y.ticks.map((t) => t.value))).toBe(true);
    expect(y.ticks[y.ticks.length - 1]!.value).toBeLessThanOrEqual(1);
    expect(byClass(doc, 'axis-label')[0]!.textContent).toBe('Relative band power (fraction of 0–128 Hz)');
    expect(byClass(doc, 'category').map((t) => t.textContent)).toEqual(['Fz', 'Oz']);
  });
});
