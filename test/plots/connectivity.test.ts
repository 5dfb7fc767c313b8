import { describe, expect, it } from 'vitest';
import { connectivityPlot } from '../../src/plots/connectivity.js';
import { demoRecord, timeFrequency } from './records.js';
import { attr, byClass, parseSvg, pathPoints, readAxis } from './svg-reader.js';

const PX = 0.02;
const record = timeFrequency(
  demoRecord(
    {
      method: 'connectivity',
      pairs: [
        ['O1', 'O2'],
        ['Fz', 'Oz'],
      ],
    },
    'eyes-closed',
    'late',
    10,
    4,
  ),
);
const part = record.result.connectivity as { pairs: { channels: string[]; coherence: number[]; imaginaryCoherency: number[]; phaseLocking: number[] }[]; coherenceThreshold: number };

describe('when connectivity of the demo study is drawn', () => {
  const doc = parseSvg(connectivityPlot(record, { width: 800, height: 600, frequencyRange: [1, 40] }));
  const frequencies = record.result.frequencies;
  const keep = frequencies.map((f, k) => [f, k] as const).filter(([f]) => f >= 1 && f <= 40);

  it('should draw coherence, imaginary coherency and phase locking per pair, each point at its value', () => {
    expect(byClass(doc, 'panel').map((p) => p.getAttribute('data-measure'))).toEqual(['coherence', 'imaginaryCoherency', 'phaseLocking']);
    for (const panel of byClass(doc, 'panel')) {
      const measure = panel.getAttribute('data-measure') as 'coherence' | 'imaginaryCoherency' | 'phaseLocking';
      const x = readAxis(panel, 'x');
      const y = readAxis(panel, 'y');
      for (const line of byClass(panel, 'series')) {
        const pair = part.pairs.find((p) => p.channels.join('-') === line.getAttribute('data-series'))!;
        const points = pathPoints(line.getAttribute('d')!);
        expect(points).toHaveLength(keep.length);
        for (const j of [0, 17, keep.length - 1]) {
          const [f, k] = keep[j]!;
          expect(Math.abs(x.invert(points[j]!.x) - f)).toBeLessThan(PX * x.perPixel(f));
          expect(Math.abs(y.invert(points[j]!.y) - pair[measure][k]!)).toBeLessThan(PX * y.perPixel(0));
        }
      }
    }
  });

  it('should dash the coherence threshold under independence at its level', () => {
    const panel = byClass(doc, 'panel')[0]!;
    const y = readAxis(panel, 'y');
    const line = byClass(panel, 'threshold')[0]!;
    expect(Math.abs(y.invert(attr(line, 'y1')) - part.coherenceThreshold)).toBeLessThan(PX * y.perPixel(0));
  });

  it('should show O1–O2 alpha coherence above the threshold near 10 Hz', () => {
    // Occipital alpha shares its phase across O1/O2 in the invented generator.
    const o = part.pairs.find((p) => p.channels.join('-') === 'O1-O2')!;
    const k = frequencies.indexOf(10);
    expect(o.coherence[k]!).toBeGreaterThan(part.coherenceThreshold);
  });
});
