import { describe, expect, it } from 'vitest';
import { DomainError } from '../../src/common/errors.js';
import type { FeatureRecord, FeatureResult, TimeFrequencyResult } from '../../src/engine/record.js';
import type { Cell } from '../../src/tables/columns.js';
import { createCsvWriter } from '../../src/tables/csv.js';
import { createTableLayout, metadataColumns, tableLevels, tableRows, type TableContext, type TableLayoutOptions } from '../../src/tables/rows.js';
import { encodeTable } from '../../src/tables/writer.js';
import { csvObjects } from './csv-parse.js';
import { connectivityRecord, epochsRecord, fullWelchRecord, morletSummaryRecord, recording, recordOf } from './records.js';
import type { TableLevel } from '../../src/tables/columns.js';

const welch = fullWelchRecord();
const result = welch.result as FeatureResult;

/** The table as CSV text, read back by the test's own RFC 4180 reader. */
function csvTable(record: FeatureRecord, level: TableLevel, context: TableContext = {}, options: TableLayoutOptions = {}) {
  const layout = createTableLayout(record, level, options);
  const text = [...encodeTable(createCsvWriter(layout.columns, { chunkChars: 4096 }), tableRows(layout, record, context))].join('');
  return { layout, rows: csvObjects(text) };
}

/** A cell read back equals the record's value exactly: the same double (Object.is, so −0 ≠ 0), or empty for null. */
function expectCell(cell: string | undefined, value: Cell | undefined, where: string): void {
  if (value === null || value === undefined) {
    expect(cell, where).toBe('');
  } else if (typeof value === 'number') {
    expect(Object.is(Number(cell), value), `${where}: ${cell} read back for ${value}`).toBe(true);
  } else {
    expect(cell, where).toBe(String(value));
  }
}

/** The record's spectra, walked by hand: the mean, each label mean, each epoch. */
function spectraByHand(r: FeatureResult) {
  return [
    ...[{ scope: 'mean', epoch: '', label: '', channels: r.channels }],
    ...(r.groups ?? []).map((g) => ({ scope: 'label-mean', epoch: '', label: g.label, channels: g.channels })),
    ...(r.epochs ?? []).map((e) => ({ scope: 'epoch', epoch: String(e.index), label: r.epoching!.kept[e.index]!.label, channels: e.channels })),
  ];
}

describe('when a Welch record with label means, per-epoch spectra and confidence becomes tables', () => {
  it('should offer every spectrum level and the quality level, and nothing of the other kinds', () => {
    expect(tableLevels(welch)).toEqual(['bands', 'ratios', 'features', 'spectra', 'quality']);
  });

  it('should give one bands row per spectrum × channel × band holding exactly the record numbers after a CSV round trip', () => {
    const { rows } = csvTable(welch, 'bands');
    const spectra = spectraByHand(result);
    // 1 mean + 2 label means + 4 epochs (two blocks of each of the two labels) — from the recipe.
    expect(spectra.length).toBe(7);
    let i = 0;
    for (const s of spectra) {
      for (const ch of s.channels) {
        for (const b of ch.bands) {
          const row = rows[i++]!;
          const where = `${s.scope} ${s.epoch} ${ch.name} ${b.name}`;
          expect([row.scope, row.epoch, row.label, row.channel, row.band, row.signal, row.recipe, row.resultHash]).toEqual([
            s.scope,
            s.epoch,
            s.label,
            ch.name,
            b.name,
            'sig_demo',
            welch.recipe.id,
            welch.resultHash,
          ]);
          expectCell(row.low, b.low, where);
          expectCell(row.high, b.high, where);
          expectCell(row.absolute, b.absolute, where);
          expectCell(row.relative, b.relative, where);
          expectCell(row.decibels, b.decibels, where);
          expectCell(row.bins, b.bins, where);
        }
      }
    }
    expect(rows.length).toBe(i);
    expect(i).toBe(7 * 8 * 5);
  });

  it('should give one spectra row per spectrum × channel × frequency with psd, bounds and degrees of freedom read back exactly', () => {
    const { layout, rows } = csvTable(welch, 'spectra');
    expect(layout.columns.map((c) => c.name)).toContain('psdUpper');
    let i = 0;
    for (const s of spectraByHand(result)) {
      for (const ch of s.channels) {
        result.frequencies.forEach((f, k) => {
          const row = rows[i++]!;
          const where = `${s.scope} ${s.epoch} ${ch.name} ${f} Hz`;
          expectCell(row.frequency, f, where);
          expectCell(row.psd, ch.psd[k]!, where);
          // The record gives bounds only for the mean over epochs.
          expectCell(row.psdLower, ch.psdLower?.[k] ?? null, where);
          expectCell(row.psdUpper, ch.psdUpper?.[k] ?? null, where);
          expectCell(row.degreesOfFreedom, ch.degreesOfFreedom?.[k] ?? null, where);
        });
      }
    }
    expect(rows.length).toBe(i);
  });

  it('should give one features row per spectrum × channel with a column per named feature', () => {
    const { layout, rows } = csvTable(welch, 'features');
    const names = layout.columns.map((c) => c.name);
    expect(names).toEqual(
      expect.arrayContaining([
        'peakFrequency',
        'peakPower',
        'peakHeight',
        'centroid',
        'spectralEdge50',
        'spectralEdge90',
        'spectralEdge97_5',
        'entropy',
        'powerLawIntercept',
        'powerLawSlope',
        'lineNoiseRatio',
        'lineNoise50Hz',
        'lineNoise100Hz',
        'lineNoise150Hz',
        'flat',
        'clipped',
        'excessiveAmplitude',
      ]),
    );
    let i = 0;
    for (const s of spectraByHand(result)) {
      for (const ch of s.channels) {
        const row = rows[i++]!;
        const f = ch.features!;
        const where = `${s.scope} ${s.epoch} ${ch.name}`;
        expectCell(row.peakFrequency, f.peakFrequency!.frequency, where);
        expectCell(row.peakPower, f.peakFrequency!.power, where);
        expectCell(row.centroid, f.centroid!.frequency, where);
        for (const e of f.spectralEdge!.edges) expectCell(row[`spectralEdge${String(e.percentile).replace('.', '_')}`], e.frequency, where);
        expectCell(row.entropy, f.entropy!.value, where);
        expectCell(row.powerLawSlope, f.powerLaw!.slope, where);
        expectCell(row.powerLawInlierFraction, f.powerLaw!.inlierFraction, where);
        expectCell(row.lineNoiseMaxRatio, f.lineNoise!.maxRatio, where);
        for (const h of f.lineNoise!.harmonics) expectCell(row[`lineNoise${h.frequency}Hz`], h.ratio, where);
        // Quality flags belong to one epoch: empty on the means.
        const q = s.scope === 'epoch' ? result.quality!.find((x) => String(x.index) === s.epoch)!.channels.find((c) => c.name === ch.name)! : null;
        expectCell(row.flat, q ? q.flat : null, where);
        expectCell(row.clipped, q ? q.clipped : null, where);
      }
    }
    expect(rows.length).toBe(i);
  });

  it('should give ratios and quality rows with the record values', () => {
    const ratios = csvTable(welch, 'ratios').rows;
    expect(ratios.length).toBe(7 * 8);
    expect(ratios[0]).toMatchObject({ scope: 'mean', channel: 'F3', ratio: 'theta/beta', numerator: 'theta', denominator: 'beta' });
    expectCell(ratios[0]!.value, result.channels[0]!.ratios[0]!.value, 'F3 theta/beta');
    const quality = csvTable(welch, 'quality').rows;
    expect(quality.length).toBe(result.quality!.length * 8);
    const first = result.quality![0]!.channels[0]!;
    expect(quality[0]).toMatchObject({ scope: 'epoch', epoch: '0', channel: first.name, used: 'true', flat: String(first.flat) });
    expectCell(quality[0]!.peakToPeak, first.peakToPeak, 'quality epoch 0');
    expectCell(quality[0]!.standardDeviation, first.standardDeviation, 'quality epoch 0');
  });

  it('should place each epoch at its block onset with the block label, as the generator lays the blocks out', () => {
    // demoRecording(6): blocks of 6 s in the order eyes-open, eyes-closed, eyes-open, eyes-closed early, then late.
    const blockLabel = (t: number) => `${Math.floor(t / 6) % 2 === 0 ? 'eyes-open' : 'eyes-closed'}/${t < 24 ? 'early' : 'late'}`;
    const epochRows = csvTable(welch, 'features').rows.filter((r) => r.scope === 'epoch' && r.channel === 'Oz');
    expect(epochRows.map((r) => Number(r.epochStart))).toEqual([0, 6, 12, 18]);
    for (const r of epochRows) expect(r.label).toBe(blockLabel(Number(r.epochStart)));
    const means = csvTable(welch, 'features').rows.filter((r) => r.scope !== 'epoch');
    expect(new Set(means.map((r) => `${r.scope}:${r.label}:${r.epoch}:${r.epochStart}`))).toEqual(new Set(['mean:::', 'label-mean:eyes-closed/early::', 'label-mean:eyes-open/early::']));
  });
});

describe('when epochs are cut inside labelled blocks', () => {
  it('should tile each eyes-closed block with 2-s epochs every 1 s and label every row with its block', () => {
    const record = recordOf(recording(), {
      method: 'welch',
      segmentSeconds: 1,
      perEpoch: true,
      epoching: { mode: 'blocks', labels: ['eyes-closed/early', 'eyes-closed/late'], epochSeconds: 2, stepSeconds: 1 },
    });
    // demoRecording(6): eyes-closed blocks at 6, 18 (early) and 30, 42 s (late); a 6-s block holds epochs at +0, +1, +2, +3, +4 s.
    const expected = [6, 18, 30, 42].flatMap((onset) => [0, 1, 2, 3, 4].map((k) => [onset + k, `eyes-closed/${onset < 24 ? 'early' : 'late'}`]));
    const { rows } = csvTable(record, 'bands');
    const epochs = rows.filter((r) => r.scope === 'epoch' && r.channel === 'Oz' && r.band === 'alpha');
    expect(epochs.map((r) => [Number(r.epochStart), r.label])).toEqual(expected);
    const labelMeans = rows.filter((r) => r.scope === 'label-mean' && r.channel === 'Oz' && r.band === 'alpha').map((r) => r.label);
    expect(labelMeans).toEqual(['eyes-closed/early', 'eyes-closed/late']);
    expect((record.result as FeatureResult).groups!.map((g) => g.epochs)).toEqual([10, 10]);
  });
});

describe('when the record comes from part of a stored signal or from uploaded epochs', () => {
  it('should count epoch starts from the start of the stored signal, not of the view', () => {
    const record = recordOf(recording(), { method: 'welch', segmentSeconds: 1, perEpoch: true, epoching: { mode: 'fixed', epochSeconds: 2 } }, { start: 12, end: 20 });
    const starts = csvTable(record, 'bands')
      .rows.filter((r) => r.scope === 'epoch' && r.band === 'alpha' && r.channel === 'O1')
      .map((r) => Number(r.epochStart));
    expect(starts).toEqual([12, 14, 16, 18]);
  });

  it('should leave the epoch start empty for uploaded epochs, and give only the mean without perEpoch', () => {
    const record = epochsRecord();
    const { rows } = csvTable(record, 'bands');
    expect(rows.length).toBe(8 * 5);
    expect(rows.every((r) => r.scope === 'mean' && r.epoch === '' && r.epochStart === '' && r.label === '')).toBe(true);
    expect(tableLevels(record)).toEqual(['bands', 'spectra']);
  });
});

describe('when rows belong to a study entry', () => {
  it('should carry the entry and its metadata on every row, empty where an entry lacks a key', () => {
    const metadata = metadataColumns([
      { subject: 'p01', age: 31 },
      { subject: 'p02', condition: 'late' },
    ]);
    expect(metadata).toEqual([
      { name: 'subject', type: 'string' },
      { name: 'age', type: 'double' },
      { name: 'condition', type: 'string' },
    ]);
    const { layout, rows } = csvTable(welch, 'ratios', { entryId: 'ent_1', metadata: { subject: 'p01, "A"', age: 31 } }, { entry: true, metadata });
    expect(layout.columns.slice(0, 5).map((c) => c.name)).toEqual(['entry', 'subject', 'age', 'condition', 'signal']);
    for (const r of rows) expect([r.entry, r.subject, r.age, r.condition]).toEqual(['ent_1', 'p01, "A"', '31', '']);
  });

  it('should make a key numeric in one entry and text in another a text column', () => {
    expect(metadataColumns([{ session: 1 }, { session: 'b' }])).toEqual([{ name: 'session', type: 'string' }]);
  });

  it('should refuse a metadata key that clashes with a table column, naming it', () => {
    expect(() => createTableLayout(welch, 'bands', { metadata: [{ name: 'band', type: 'string' }] })).toThrow(/metadata key "band" clashes/);
  });
});

describe('when the record is a time–frequency or connectivity record', () => {
  it('should refuse a spectrum level with the levels the record gives', () => {
    const morlet = morletSummaryRecord();
    try {
      createTableLayout(morlet, 'bands');
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(DomainError);
      expect((error as DomainError).code).toBe('table-level-unavailable');
      expect((error as DomainError).extensions).toEqual({ levels: ['summary'] });
    }
  });

  it('should give one summary row per channel × window with the record values', () => {
    const morlet = morletSummaryRecord();
    const { rows } = csvTable(morlet, 'summary');
    const channels = (morlet.result as TimeFrequencyResult).channels;
    expect(rows.length).toBe(channels.length * 2);
    let i = 0;
    for (const ch of channels) {
      for (const w of ch.summary!) {
        const row = rows[i++]!;
        expect([row.channel, row.window, row.scope]).toEqual([ch.name, w.name, 'mean']);
        for (const key of ['low', 'high', 'start', 'end', 'value', 'cells'] as const) expectCell(row[key], w[key], `${ch.name} ${w.name} ${key}`);
      }
    }
  });

  it('should give pair-bands and pair-spectra rows with the record values', () => {
    const record = connectivityRecord();
    expect(tableLevels(record)).toEqual(['pair-bands', 'pair-spectra']);
    const pairs = (record.result as TimeFrequencyResult).connectivity!.pairs as {
      channels: [string, string];
      coherence: (number | null)[];
      imaginaryCoherency: (number | null)[];
      phaseLocking?: (number | null)[];
      bands: Record<string, number | string | null>[];
    }[];
    const bands = csvTable(record, 'pair-bands').rows;
    const spectra = csvTable(record, 'pair-spectra').rows;
    let b = 0;
    let s = 0;
    for (const pair of pairs) {
      for (const band of pair.bands) {
        const row = bands[b++]!;
        expect([row.channelA, row.channelB, row.band]).toEqual([...pair.channels, band.name]);
        for (const key of ['coherence', 'imaginaryCoherency', 'phaseLocking', 'bins', 'low', 'high']) expectCell(row[key], band[key] as Cell, `${pair.channels} ${String(band.name)} ${key}`);
      }
      record.result.frequencies.forEach((f, k) => {
        const row = spectra[s++]!;
        expectCell(row.frequency, f, `${pair.channels} ${f}`);
        expectCell(row.coherence, pair.coherence[k]!, `${pair.channels} ${f}`);
        expectCell(row.imaginaryCoherency, pair.imaginaryCoherency[k]!, `${pair.channels} ${f}`);
        expectCell(row.phaseLocking, pair.phaseLocking?.[k] ?? null, `${pair.channels} ${f}`);
      });
    }
    expect([bands.length, spectra.length]).toEqual([b, s]);
  });
});
