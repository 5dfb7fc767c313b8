import type { Band } from '../recipes/schema.js';
import type { FeatureRecord, FeatureResult } from '../engine/record.js';
import { clipPath, idBaseOf, legend, plotArea, prettyUnit, svgDocument, xAxis, yAxis, INK, type LegendEntry, type PictureSize } from './frame.js';
import { formatNumber, formatValue, linearScale, linearTicks, logDomain, logScale, logTicks, niceDomain, type Scale } from './scale.js';
import { requireBins, selectChannels } from './select.js';
import { seriesColour } from './colour.js';
import { el, num, pathData, textEl } from './svg.js';

export type PowerScale = 'db' | 'log10';

/** Single-epoch spectra drawn at most per channel: past that they only make the picture heavy. */
export const MAX_EPOCH_LINES = 100;

export interface PsdPlotOptions extends PictureSize {
  /** channel names to draw, in this order. @defaultValue every channel */
  channels?: string[];
  /** dB (10·log10 of the PSD, linear axis) or the PSD itself on a log10 axis. @defaultValue 'db' */
  scale?: PowerScale;
  /** [low, high] Hz, both included. @defaultValue the record's frequencies above 0 Hz */
  frequencyRange?: [number, number];
  /** draw per-epoch spectra faintly behind the mean when the record has them. @defaultValue true */
  epochs?: boolean;
}

/** One spectrum to draw, with what belongs to it. */
export interface SpectrumSeries {
  label: string;
  colour: string;
  dash?: string;
  frequencies: readonly number[];
  /** unit²/Hz */
  psd: readonly number[];
  lower?: readonly number[];
  upper?: readonly number[];
  epochs?: (readonly number[])[];
  /** a spread drawn as a band (e.g. mean ± SD over a study's records), unit²/Hz */
  spread?: { lower: readonly number[]; upper: readonly number[] };
  peak?: { frequency: number; power: number } | null;
}

export interface SpectraFigure {
  title: string;
  description: string;
  /** the PSD unit as the record writes it, e.g. uV^2/Hz */
  unit: string;
  bands: readonly Band[];
  /** legend label of the confidence ribbon, when any series has one */
  ribbonLabel?: string;
}

/**
 * A band's name above the plot, where neither the data nor the legend covers it; a name wider than
 * its band goes one row up when its neighbour took the lower row, so narrow bands stay readable.
 */
function bandLabel(name: string, x0: number, x1: number, top: number, row: number): string {
  return textEl('text', { x: (x0 + x1) / 2, y: top - 5 - row * 13, 'text-anchor': 'middle', 'font-size': 11, fill: '#555555' }, name);
}

/** Power as drawn: dB values or raw values on a log axis. */
function transform(scale: PowerScale): (p: number) => number {
  return scale === 'db' ? (p) => (p > 0 ? 10 * Math.log10(p) : Number.NaN) : (p) => (p > 0 ? p : Number.NaN);
}

/** The default range leaves out 0 Hz, whose power the detrending removes (common practice). */
export function defaultFrequencyRange(frequencies: readonly number[]): [number, number] {
  const positive = frequencies.filter((f) => f > 0);
  const first = positive[0] ?? frequencies[0] ?? 0;
  return [first, frequencies[frequencies.length - 1] ?? first];
}

/**
 * Draws one or several spectra on a power axis (dB, or log10) against frequency in Hz: bands shaded
 * and named, per-epoch spectra faint behind, confidence ribbons or spreads, and marked peaks.
 */
export function drawSpectra(series: SpectrumSeries[], figure: SpectraFigure, options: PictureSize & { scale: PowerScale; frequencyRange: [number, number] }): string {
  const power = transform(options.scale);
  const [lo, hi] = options.frequencyRange;
  const kept = series.map((s) => requireBins(s.frequencies, [lo, hi]));
  let min = Infinity;
  let max = -Infinity;
  const see = (values: readonly number[] | undefined, bins: number[]) => {
    if (!values) return;
    for (const k of bins) {
      const v = power(values[k]!);
      if (Number.isFinite(v)) {
        if (v < min) min = v;
        if (v > max) max = v;
      }
    }
  };
  series.forEach((s, i) => {
    const bins = kept[i]!;
    see(s.psd, bins);
    see(s.lower, bins);
    see(s.upper, bins);
    see(s.spread?.lower, bins);
    see(s.spread?.upper, bins);
    for (const e of s.epochs ?? []) see(e, bins);
  });
  if (!Number.isFinite(min)) [min, max] = options.scale === 'db' ? [-1, 1] : [0.1, 10];
  const area = plotArea(options, { left: 78, top: 60 });
  const xs = linearScale([lo, hi], [area.left, area.left + area.width]);
  const unit = prettyUnit(figure.unit);
  let ys: Scale;
  let yLabel: string;
  let yTicks;
  if (options.scale === 'db') {
    const [d0, d1] = niceDomain(min, max, 6);
    ys = linearScale([d0, d1], [area.top + area.height, area.top]);
    yTicks = linearTicks(d0, d1, 6);
    yLabel = `Power (dB re 1 ${unit})`;
  } else {
    const [d0, d1] = logDomain(min, max);
    ys = logScale([d0, d1], [area.top + area.height, area.top]);
    yTicks = logTicks(d0, d1);
    yLabel = `Power (${unit})`;
  }
  const yOf = (p: number) => ys(power(p));
  const idBase = idBaseOf(figure.title, figure.description, String(options.width), String(options.height), options.scale);
  const clip = `${idBase}-clip`;
  const body: string[] = [el('defs', {}, clipPath(clip, area))];

  // Bands behind everything, each cut to the shown range and named at its top.
  const bandParts: string[] = [];
  const rowRight = [-Infinity, -Infinity];
  figure.bands.forEach((band, b) => {
    const from = Math.max(band.low, lo);
    const to = Math.min(band.high, hi);
    if (!(to > from)) return;
    const x0 = xs(from);
    const x1 = xs(to);
    const half = (band.name.length * 6.5) / 2;
    const left = (x0 + x1) / 2 - half;
    const row = left > rowRight[0]! + 4 || left <= rowRight[1]! + 4 ? 0 : 1;
    rowRight[row] = (x0 + x1) / 2 + half;
    bandParts.push(
      el(
        'g',
        { class: 'band', 'data-band': band.name },
        el('rect', { x: x0, y: area.top, width: x1 - x0, height: area.height, fill: b % 2 === 0 ? '#eeeeee' : '#f7f7f7' }),
        bandLabel(band.name, x0, x1, area.top, row),
      ),
    );
  });
  body.push(el('g', { class: 'bands' }, ...bandParts));
  body.push(yAxis(area, ys, yTicks, yLabel, 62));
  body.push(xAxis(area, xs, linearTicks(lo, hi, 8), 'Frequency (Hz)'));

  const layers: string[] = [];
  series.forEach((s, i) => {
    const bins = kept[i]!;
    const fx = bins.map((k) => xs(s.frequencies[k]!));
    for (const e of s.epochs ?? []) {
      layers.push(
        el('path', {
          class: 'epoch',
          'data-series': s.label,
          d: pathData(
            fx,
            bins.map((k) => yOf(e[k]!)),
          ),
          fill: 'none',
          stroke: s.colour,
          'stroke-width': 0.75,
          'stroke-opacity': 0.18,
        }),
      );
    }
    const band = s.spread ?? (s.lower && s.upper ? { lower: s.lower, upper: s.upper } : null);
    if (band) {
      const upper = bins.map((k) => yOf(band.upper[k]!));
      const lower = bins.map((k) => yOf(band.lower[k]!));
      const ok = bins.map((_, j) => Number.isFinite(upper[j]!) && Number.isFinite(lower[j]!));
      const forward = pathData(
        fx.filter((_, j) => ok[j]),
        upper.filter((_, j) => ok[j]),
      );
      const back = pathData(fx.filter((_, j) => ok[j]).reverse(), lower.filter((_, j) => ok[j]).reverse()).replace(/^M/, 'L');
      if (forward) layers.push(el('path', { class: s.spread ? 'spread' : 'ribbon', 'data-series': s.label, d: `${forward} ${back} Z`, fill: s.colour, 'fill-opacity': 0.2, stroke: 'none' }));
    }
  });
  series.forEach((s, i) => {
    const bins = kept[i]!;
    layers.push(
      el('path', {
        class: 'series',
        'data-series': s.label,
        d: pathData(
          bins.map((k) => xs(s.frequencies[k]!)),
          bins.map((k) => yOf(s.psd[k]!)),
        ),
        fill: 'none',
        stroke: s.colour,
        'stroke-width': 1.75,
        'stroke-dasharray': s.dash,
        'stroke-linejoin': 'round',
      }),
    );
  });
  body.push(el('g', { class: 'data', 'clip-path': `url(#${clip})` }, ...layers));

  const peaks: string[] = [];
  series.forEach((s) => {
    const p = s.peak;
    if (!p || p.frequency < lo || p.frequency > hi || !(p.power > 0)) return;
    const cx = xs(p.frequency);
    const cy = yOf(p.power);
    peaks.push(
      el(
        'g',
        { class: 'peak', 'data-series': s.label },
        el('circle', { cx, cy, r: 4, fill: '#ffffff', stroke: s.colour, 'stroke-width': 2 }),
        // With many series the labels would pile up on one another; the description lists every peak.
        series.length <= 3 ? textEl('text', { x: cx + 7, y: cy - 7, 'font-size': 11, fill: INK }, `${s.label} peak ${formatNumber(p.frequency, 2)} Hz`) : '',
      ),
    );
  });
  body.push(el('g', { class: 'peaks' }, ...peaks));

  const entries: LegendEntry[] = series.map((s) => ({ label: s.label, colour: s.colour, shape: 'line', ...(s.dash ? { dash: s.dash } : {}) }));
  if (figure.ribbonLabel && series.some((s) => s.spread || (s.lower && s.upper))) entries.push({ label: figure.ribbonLabel, colour: '#777777', shape: 'swatch', opacity: 0.35 });
  if (series.some((s) => s.epochs && s.epochs.length > 0)) entries.push({ label: 'single epochs', colour: '#aaaaaa', shape: 'line' });
  body.push(legend(area, entries));
  return svgDocument(options, figure.title, figure.description, body, idBase);
}

function isSpectralRecord(record: FeatureRecord): record is FeatureRecord<FeatureResult> {
  return Array.isArray((record.result as FeatureResult).channels) && (record.result as FeatureResult).channels.every((c) => Array.isArray(c.psd));
}

/**
 * The PSD plot of a spectral record (Welch, multitaper, periodogram).
 *
 * @param record - a feature record whose channels carry `psd` (unit²/Hz at `result.frequencies`)
 * @returns SVG text; the same record and options give the same bytes
 * @throws DomainError `unknown-channel` (pointer `/channels`), `invalid-request` for a range with no bin
 */
export function psdPlot(record: FeatureRecord, options: PsdPlotOptions): string {
  if (!isSpectralRecord(record)) throw new TypeError('psdPlot needs a spectral record');
  const result = record.result;
  const names = selectChannels(
    result.channels.map((c) => c.name),
    options.channels,
  );
  const scale = options.scale ?? 'db';
  const range = options.frequencyRange ?? defaultFrequencyRange(result.frequencies);
  const showEpochs = options.epochs ?? true;
  const confidence = result.estimate.confidence;
  const series: SpectrumSeries[] = names.map((name, i) => {
    const channel = result.channels.find((c) => c.name === name)!;
    const peak = channel.features?.peakFrequency;
    const epochs =
      showEpochs && result.epochs
        ? result.epochs
            .slice(0, MAX_EPOCH_LINES)
            .map((e) => e.channels.find((c) => c.name === name)?.psd)
            .filter((p): p is number[] => Array.isArray(p))
        : [];
    return {
      label: name,
      colour: seriesColour(i),
      frequencies: result.frequencies,
      psd: channel.psd,
      ...(channel.psdLower && channel.psdUpper ? { lower: channel.psdLower, upper: channel.psdUpper } : {}),
      ...(epochs.length > 0 ? { epochs } : {}),
      peak: peak && peak.frequency !== null && peak.power !== null ? { frequency: peak.frequency, power: peak.power } : null,
    };
  });
  const method = record.recipe.method;
  const bands: Band[] = 'bands' in record.recipe ? record.recipe.bands : [];
  const title = `Power spectral density: ${names.join(', ')}`;
  const extras = [
    series.some((s) => s.lower) && confidence ? `${Math.round(confidence * 100)} % confidence ribbons` : null,
    series.some((s) => s.epochs)
      ? `single epochs drawn faintly behind the mean${(result.epochs?.length ?? 0) > MAX_EPOCH_LINES ? ` (the first ${MAX_EPOCH_LINES} of ${result.epochs!.length})` : ''}`
      : null,
    ...series.filter((s) => s.peak).map((s) => `${s.label} peak at ${formatNumber(s.peak!.frequency, 2)} Hz`),
  ].filter((x): x is string => x !== null);
  const description =
    `${method} PSD of ${names.join(', ')} from ${formatValue(range[0])} to ${formatValue(range[1])} Hz, power ${scale === 'db' ? 'in dB' : 'on a log10 axis'}` +
    `${bands.length > 0 ? `; bands ${bands.map((b) => `${b.name} ${b.low}–${b.high} Hz`).join(', ')} shaded` : ''}` +
    `${extras.length > 0 ? `; ${extras.join('; ')}` : ''}. Signal ${record.input.signal}, result ${record.resultHash.slice(0, 12)}.`;
  return drawSpectra(
    series,
    { title, description, unit: result.units.psd, bands, ...(confidence ? { ribbonLabel: `${Math.round(confidence * 100)} % confidence` } : {}) },
    {
      width: options.width,
      height: options.height,
      scale,
      frequencyRange: range,
    },
  );
}
