import { DomainError } from '../common/errors.js';
import type { FeatureRecord, FeatureResult } from '../engine/record.js';
import type { Band } from '../recipes/schema.js';
import { seriesColour } from './colour.js';
import type { PictureSize } from './frame.js';
import { defaultFrequencyRange, drawSpectra, type PowerScale, type SpectrumSeries } from './psd.js';
import { formatValue } from './scale.js';
import { selectChannels } from './select.js';

export interface CompareOptions extends PictureSize {
  /** the one channel compared */
  channel: string;
  /** @defaultValue 'db' */
  scale?: PowerScale;
  /** [low, high] Hz, both included. @defaultValue the first record's frequencies above 0 Hz */
  frequencyRange?: [number, number];
}

const DASHES = [undefined, '7 4', '2 3', '9 3 2 3'];

function channelOf(record: FeatureRecord<FeatureResult>, channel: string, pointer: string) {
  selectChannels(
    record.result.channels.map((c) => c.name),
    [channel],
    pointer,
  );
  return record.result.channels.find((c) => c.name === channel)!;
}

function sameUnits(records: FeatureRecord<FeatureResult>[], pointer: string): string {
  const units = [...new Set(records.map((r) => r.result.units.psd))];
  if (units.length > 1) throw new DomainError('plot-not-applicable', `the records' PSDs are in different units (${units.join(', ')}); only spectra in one unit can share an axis`, { pointer });
  return units[0]!;
}

function bandsOf(record: FeatureRecord): Band[] {
  return 'bands' in record.recipe ? record.recipe.bands : [];
}

/**
 * Several records' PSDs of one channel overlaid (e.g. two conditions of a study): colour and dash
 * tell the records apart, so the picture also reads in greyscale.
 *
 * @param records - spectral records, each with its legend label
 * @throws DomainError `unknown-channel` (pointer `/channel`), `plot-not-applicable` for mixed units
 */
export function comparePlot(records: { label: string; record: FeatureRecord }[], options: CompareOptions): string {
  const spectral = records.map((r) => r.record as FeatureRecord<FeatureResult>);
  const unit = sameUnits(spectral, '/jobs');
  const series: SpectrumSeries[] = records.map(({ label }, i) => {
    const channel = channelOf(spectral[i]!, options.channel, '/channel');
    const dash = DASHES[i % DASHES.length];
    return { label, colour: seriesColour(i), ...(dash ? { dash } : {}), frequencies: spectral[i]!.result.frequencies, psd: channel.psd };
  });
  const scale = options.scale ?? 'db';
  const range = options.frequencyRange ?? defaultFrequencyRange(spectral[0]!.result.frequencies);
  const title = `Power spectral density of ${options.channel}: ${records.map((r) => r.label).join(' vs ')}`;
  const description =
    `PSD of channel ${options.channel} in ${records.length} records overlaid (${records.map((r) => `${r.label}: ${r.record.recipe.method}, result ${r.record.resultHash.slice(0, 12)}`).join('; ')}), ` +
    `from ${formatValue(range[0])} to ${formatValue(range[1])} Hz, power ${scale === 'db' ? 'in dB' : 'on a log10 axis'}.`;
  return drawSpectra(series, { title, description, unit, bands: bandsOf(spectral[0]!) }, { width: options.width, height: options.height, scale, frequencyRange: range });
}

/**
 * Per group (e.g. condition) of a study run, the mean spectrum of one channel with its spread:
 * the mean and standard deviation are taken over the records' log power (dB), so the band is
 * mean ± 1 SD on the drawn axis and never reaches below zero power; the line is the geometric mean.
 *
 * @param groups - records per group, all with the same frequencies
 * @throws DomainError `unknown-channel` (pointer `/channel`), `plot-not-applicable` for mixed units or frequencies
 */
export function groupSpectraPlot(groups: { label: string; records: FeatureRecord[] }[], options: CompareOptions & { groupedBy: string }): string {
  const all = groups.flatMap((g) => g.records as FeatureRecord<FeatureResult>[]);
  const unit = sameUnits(all, '/');
  const frequencies = all[0]!.result.frequencies;
  if (all.some((r) => r.result.frequencies.length !== frequencies.length || r.result.frequencies.some((f, k) => f !== frequencies[k]))) {
    throw new DomainError('plot-not-applicable', "the run's records do not share one frequency grid; their spectra cannot be averaged", { pointer: '/' });
  }
  const series: SpectrumSeries[] = groups.map((g, i) => {
    const logs = (g.records as FeatureRecord<FeatureResult>[]).map((r) => channelOf(r, options.channel, '/channel').psd.map((p) => (p > 0 ? Math.log10(p) : Number.NaN)));
    const n = logs.length;
    const mean = frequencies.map((_, k) => logs.reduce((s, l) => s + l[k]!, 0) / n);
    const sd = frequencies.map((_, k) => (n > 1 ? Math.sqrt(logs.reduce((s, l) => s + (l[k]! - mean[k]!) ** 2, 0) / (n - 1)) : 0));
    const dash = DASHES[i % DASHES.length];
    return {
      label: `${g.label} (n = ${n})`,
      colour: seriesColour(i),
      ...(dash ? { dash } : {}),
      frequencies,
      psd: mean.map((m) => 10 ** m),
      spread: { lower: mean.map((m, k) => 10 ** (m - sd[k]!)), upper: mean.map((m, k) => 10 ** (m + sd[k]!)) },
    };
  });
  const scale = options.scale ?? 'db';
  const range = options.frequencyRange ?? defaultFrequencyRange(frequencies);
  const title = `Mean PSD of ${options.channel} by ${options.groupedBy}: ${groups.map((g) => g.label).join(', ')}`;
  const description =
    `Geometric mean PSD of channel ${options.channel} per ${options.groupedBy} (${groups.map((g) => `${g.label}: ${g.records.length} records`).join('; ')}), ` +
    `shaded ± 1 standard deviation of log power across records, from ${formatValue(range[0])} to ${formatValue(range[1])} Hz, power ${scale === 'db' ? 'in dB' : 'on a log10 axis'}.`;
  return drawSpectra(
    series,
    { title, description, unit, bands: bandsOf(all[0]!), ribbonLabel: '± 1 SD across records' },
    { width: options.width, height: options.height, scale, frequencyRange: range },
  );
}
