import { describe, expect, it } from 'vitest';
import { DomainError } from '../../src/common/errors.js';
import { comparePlot, groupSpectraPlot } from '../../src/plots/compare.js';
import { demoRecord, spectral } from './records.js';
import { byClass, parseSvg, pathPoints, readAxis } from './svg-reader.js';

const PX = 0.02;
const dB = (p: number) => 10 * Math.log10(p); // common practice
const closed = spectral(demoRecord({ method: 'welch' }, 'eyes-closed', 'late'));
const open = spectral(demoRecord({ method: 'welch' }, 'eyes-open', 'late'));

describe('when two records of the demo study are compared on one channel', () => {
  const doc = parseSvg(
    comparePlot(
      [
        { label: 'eyes closed', record: closed },
        { label: 'eyes open', record: open },
      ],
      { width: 800, height: 480, channel: 'Oz' },
    ),
  );
  const x = readAxis(doc, 'x');
  const y = readAxis(doc, 'y');

  it("should draw each record's spectrum through its own values, told apart by colour and dash", () => {
    const lines = byClass(doc, 'series');
    expect(lines.map((l) => l.getAttribute('data-series'))).toEqual(['eyes closed', 'eyes open']);
    expect(lines[0]!.getAttribute('stroke')).not.toBe(lines[1]!.getAttribute('stroke'));
    expect(lines[0]!.getAttribute('stroke-dasharray')).toBeNull();
    expect(lines[1]!.getAttribute('stroke-dasharray')).not.toBeNull();
    [closed, open].forEach((record, i) => {
      const points = pathPoints(lines[i]!.getAttribute('d')!);
      const psd = record.result.channels.find((c) => c.name === 'Oz')!.psd;
      const k = record.result.frequencies.indexOf(10);
      expect(Math.abs(x.invert(points[k - 1]!.x) - 10)).toBeLessThan(PX * x.perPixel(10));
      expect(Math.abs(y.invert(points[k - 1]!.y) - dB(psd[k]!))).toBeLessThan(PX * y.perPixel(0));
    });
  });

  it('should show the alpha of closed eyes above that of open eyes', () => {
    // The generator's alpha amplitude is 3× with the eyes closed: about 9.5 dB more power at the peak.
    const [c, o] = byClass(doc, 'series').map((l) => pathPoints(l.getAttribute('d')!));
    const k = closed.result.frequencies.indexOf(10) - 1;
    expect(y.invert(c![k]!.y) - y.invert(o![k]!.y)).toBeGreaterThan(5);
  });

  it('should refuse a channel one record does not have', () => {
    expect(() =>
      comparePlot(
        [
          { label: 'a', record: closed },
          { label: 'b', record: open },
        ],
        { width: 800, height: 480, channel: 'T7' },
      ),
    ).toThrow(DomainError);
  });
});

describe('when records are grouped by condition', () => {
  const groups = [
    { label: 'eyes-closed', records: [1, 2, 3].map((s) => demoRecord({ method: 'welch' }, 'eyes-closed', s === 1 ? 'early' : 'late', 4, 4)) },
    { label: 'eyes-open', records: [1, 2, 3].map((s) => demoRecord({ method: 'welch' }, 'eyes-open', s === 1 ? 'early' : 'late', 4, 4)) },
  ];
  const doc = parseSvg(groupSpectraPlot(groups, { width: 800, height: 480, channel: 'O2', groupedBy: 'condition' }));
  const y = readAxis(doc, 'y');

  it("should draw the mean of the records' dB values, with ± 1 SD shaded around it", () => {
    const psds = groups[0]!.records.map((r) => spectral(r).result.channels.find((c) => c.name === 'O2')!.psd);
    const k = spectral(groups[0]!.records[0]!).result.frequencies.indexOf(10);
    const values = psds.map((p) => dB(p[k]!));
    const mean = values.reduce((a, b) => a + b, 0) / values.length;
    const sd = Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (values.length - 1));
    const line = pathPoints(byClass(doc, 'series')[0]!.getAttribute('d')!);
    expect(Math.abs(y.invert(line[k - 1]!.y) - mean)).toBeLessThan(PX * y.perPixel(0));
    const spread = pathPoints(byClass(doc, 'spread')[0]!.getAttribute('d')!);
    const n = line.length;
    expect(Math.abs(y.invert(spread[k - 1]!.y) - (mean + sd))).toBeLessThan(PX * y.perPixel(0));
    expect(Math.abs(y.invert(spread[2 * n - k]!.y) - (mean - sd))).toBeLessThan(PX * y.perPixel(0));
    expect(byClass(doc, 'series').map((l) => l.getAttribute('data-series'))).toEqual(['eyes-closed (n = 3)', 'eyes-open (n = 3)']);
  });
});
