import type { FeatureRecord, TimeFrequencyResult } from '../engine/record.js';
import { divergingColour, sequentialColour } from './colour.js';
import { clipPath, GRID, idBaseOf, INK, plotArea, prettyUnit, svgDocument, xAxis, yAxis, type Area, type PictureSize } from './frame.js';
import type { PowerScale } from './psd.js';
import { formatValue, linearScale, linearTicks, logDomain, logScale, logTicks, type Scale, type Tick } from './scale.js';
import { selectChannels } from './select.js';
import { el, num, textEl } from './svg.js';

export interface TimeFrequencyPlotOptions extends PictureSize {
  /** channels drawn as stacked panels. @defaultValue the first channel */
  channels?: string[];
  /** colour of un-normalized power: dB, or log10 with the colour bar in the record's unit. @defaultValue 'db' */
  scale?: PowerScale;
}

/** The matrices a time–frequency plot draws, read from the record's attachments by the caller. */
export interface TimeFrequencyMatrices {
  /** times × frequencies, row-major, by channel name */
  power: Record<string, Float64Array>;
  /** times × frequencies, 1 where the cell is an edge cell */
  edgeMask?: Uint8Array | null;
}

/** Colour levels of the heat map and of its colour bar. */
const LEVELS = 128;

/** Names of the attachments a time–frequency plot of these channels needs. */
export function timeFrequencyAttachments(record: FeatureRecord, channels: string[] | undefined): { power: Record<string, string>; edgeMask: string | null } {
  const tf = (record.result as TimeFrequencyResult).timeFrequency;
  const listed = tf?.attachments ?? [];
  const names = selectChannels(
    record.result.channels.map((c) => c.name),
    channels,
  );
  const chosen = channels && channels.length > 0 ? names : names.slice(0, 1);
  const power: Record<string, string> = {};
  for (const name of chosen) {
    const entry = listed.find((a) => a.kind === 'power' && a.channel === name);
    if (entry) power[name] = entry.name;
  }
  return { power, edgeMask: listed.find((a) => a.kind === 'edgeMask')?.name ?? null };
}

/** Whether frequencies are closer to even spacing in log f than in f (Morlet's default is log). */
export function isLogSpaced(frequencies: readonly number[]): boolean {
  if (frequencies.length < 3 || frequencies.some((f) => !(f > 0))) return false;
  const spread = (xs: number[]) => {
    const steps = xs.slice(1).map((x, i) => x - xs[i]!);
    const mean = steps.reduce((a, b) => a + b, 0) / steps.length;
    return Math.max(...steps.map((s) => Math.abs(s - mean))) / Math.abs(mean);
  };
  return spread(frequencies.map(Math.log10)) < spread([...frequencies]);
}

/** Cell boundaries around centres: midpoints (in log when `log`), the ends half a step out. */
function edgesOf(centres: readonly number[], log: boolean): number[] {
  const f = (v: number) => (log ? Math.log10(v) : v);
  const g = (v: number) => (log ? 10 ** v : v);
  const c = centres.map(f);
  if (c.length === 1) return [g(c[0]! - 0.5), g(c[0]! + 0.5)];
  const edges = [c[0]! - (c[1]! - c[0]!) / 2];
  for (let i = 1; i < c.length; i++) edges.push((c[i - 1]! + c[i]!) / 2);
  edges.push(c[c.length - 1]! + (c[c.length - 1]! - c[c.length - 2]!) / 2);
  return edges.map(g);
}

interface ColourAxis {
  label: string;
  /** a matrix value → the value the colour bar is drawn in (dB, log10 or the value itself) */
  display(v: number): number;
  /** ends of the colour bar, in display units: the data range (symmetric around no change when diverging) */
  ends: [number, number];
  /** the ends as printed, in the colour bar's unit */
  endLabels: [string, string];
  /** ticks at display positions */
  ticks: { at: number; label: string }[];
  colour(position: number): string;
  diverging: boolean;
}

const NORMALIZED_LABEL: Record<string, (unit: string) => string> = {
  decibel: () => 'Power change (dB from baseline)',
  percent: () => 'Power change (% of baseline)',
  ratio: () => 'Power ratio to baseline',
  zscore: () => 'Power (z-score against baseline)',
};

function colourAxis(result: TimeFrequencyResult, values: number[], scale: PowerScale): ColourAxis {
  const mode = result.units.normalized ?? 'none';
  const unit = prettyUnit(result.units.power ?? '');
  let min = Infinity;
  let max = -Infinity;
  for (const v of values) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (!Number.isFinite(min)) [min, max] = [0, 1];
  if (mode !== 'none') {
    // Change from baseline: a diverging map centred on "no change" (1 for a ratio, else 0).
    const centre = mode === 'ratio' ? 1 : 0;
    const reach = Math.max(Math.abs(max - centre), Math.abs(min - centre)) || 1;
    const ends: [number, number] = [centre - reach, centre + reach];
    return {
      label: (NORMALIZED_LABEL[mode] ?? (() => `Power (${mode})`))(unit),
      display: (v) => v,
      ends,
      endLabels: [formatValue(ends[0]), formatValue(ends[1])],
      ticks: linearTicks(ends[0], ends[1], 6).map((t) => ({ at: t.value, label: t.label })),
      colour: (p) => divergingColour(2 * p - 1),
      diverging: true,
    };
  }
  const floor = Number.MIN_VALUE;
  if (scale === 'log10') {
    const lo = Math.max(min, floor);
    const hi = Math.max(max, floor);
    const [d0, d1] = logDomain(lo, hi);
    return {
      label: `Power (${unit})`,
      display: (v) => Math.log10(Math.max(v, floor)),
      ends: [Math.log10(lo), Math.log10(hi)],
      endLabels: [formatValue(lo), formatValue(hi)],
      ticks: logTicks(d0, d1).map((t) => ({ at: Math.log10(t.value), label: t.label })),
      colour: sequentialColour,
      diverging: false,
    };
  }
  const dB = (v: number) => 10 * Math.log10(Math.max(v, floor));
  const ends: [number, number] = [dB(min), dB(max)];
  return {
    label: `Power (dB re 1 ${unit})`,
    display: dB,
    ends,
    endLabels: [formatValue(ends[0]), formatValue(ends[1])],
    ticks: linearTicks(ends[0], ends[1], 6).map((t) => ({ at: t.value, label: t.label })),
    colour: sequentialColour,
    diverging: false,
  };
}

/** Position 0…1 of a display value along the colour bar. */
function positionOf(axis: ColourAxis, d: number): number {
  const span = axis.ends[1] - axis.ends[0];
  return span > 0 ? (d - axis.ends[0]) / span : 0.5;
}

function level(position: number): number {
  return Math.min(LEVELS - 1, Math.max(0, Math.floor(position * LEVELS)));
}

/**
 * Time columns narrower than a pixel cannot be seen: past `columns` times, neighbouring times are
 * pooled into `columns` columns, each the mean of its display values (dB, log10 or the value) and an
 * edge column when any of its cells is an edge cell. Otherwise every time is its own column.
 */
export function poolColumns(
  display: Float64Array,
  mask: Uint8Array | null,
  T: number,
  F: number,
  tEdges: number[],
  columns: number,
): { display: Float64Array; mask: Uint8Array | null; T: number; tEdges: number[] } {
  if (T <= columns) return { display, mask, T, tEdges };
  const C = Math.max(1, Math.floor(columns));
  const out = new Float64Array(C * F);
  const outMask = mask ? new Uint8Array(C * F) : null;
  const edges: number[] = [];
  for (let c = 0; c < C; c++) {
    const from = Math.floor((c * T) / C);
    const to = Math.floor(((c + 1) * T) / C);
    edges.push(tEdges[from]!);
    for (let f = 0; f < F; f++) {
      let sum = 0;
      let n = 0;
      let edge = 0;
      for (let t = from; t < to; t++) {
        const v = display[t * F + f]!;
        if (Number.isFinite(v)) {
          sum += v;
          n++;
        }
        if (mask && mask[t * F + f] === 1) edge = 1;
      }
      out[c * F + f] = n > 0 ? sum / n : Number.NaN;
      if (outMask) outMask[c * F + f] = edge;
    }
  }
  edges.push(tEdges[T]!);
  return { display: out, mask: outMask, T: C, tEdges: edges };
}

/** Heat-map cells of one panel (display values); runs of equal colour along time are merged into one rect. */
function heatMap(matrix: Float64Array, T: number, F: number, tEdges: number[], fEdges: number[], xs: Scale, ys: Scale, axis: ColourAxis): string[] {
  const rects: string[] = [];
  for (let f = 0; f < F; f++) {
    const y0 = ys(fEdges[f + 1]!);
    const y1 = ys(fEdges[f]!);
    let t = 0;
    while (t < T) {
      const v = matrix[t * F + f]!;
      if (!Number.isFinite(v)) {
        t++;
        continue;
      }
      const lv = level(positionOf(axis, v));
      let end = t + 1;
      while (end < T && Number.isFinite(matrix[end * F + f]!) && level(positionOf(axis, matrix[end * F + f]!)) === lv) end++;
      const x0 = xs(tEdges[t]!);
      const x1 = xs(tEdges[end]!);
      // A hair of overlap hides the anti-aliasing seams between neighbouring cells.
      rects.push(el('rect', { x: x0, y: y0, width: x1 - x0 + 0.3, height: y1 - y0 + 0.3, fill: axis.colour((lv + 0.5) / LEVELS) }));
      t = end;
    }
  }
  return rects;
}

/** Rects over the cells where `on(i)` holds (i = t·F + f), runs along time merged: edge cells, cells without a value. */
function markedCells(on: (i: number) => boolean, T: number, F: number, tEdges: number[], fEdges: number[], xs: Scale, ys: Scale, cls: string, fill: string): string[] {
  const rects: string[] = [];
  for (let f = 0; f < F; f++) {
    let t = 0;
    while (t < T) {
      if (!on(t * F + f)) {
        t++;
        continue;
      }
      let end = t + 1;
      while (end < T && on(end * F + f)) end++;
      const x0 = xs(tEdges[t]!);
      const y0 = ys(fEdges[f + 1]!);
      rects.push(el('rect', { class: cls, x: x0, y: y0, width: xs(tEdges[end]!) - x0, height: ys(fEdges[f]!) - y0, fill }));
      t = end;
    }
  }
  return rects;
}

function colourBar(area: Area, axis: ColourAxis): string {
  const x = area.left + area.width + 18;
  const width = 16;
  const steps: string[] = [];
  for (let i = 0; i < LEVELS; i++) {
    const y0 = area.top + area.height * (1 - (i + 1) / LEVELS);
    steps.push(el('rect', { x, y: y0, width, height: area.height / LEVELS + 0.3, fill: axis.colour((i + 0.5) / LEVELS) }));
  }
  const yOf = (d: number) => area.top + area.height * (1 - positionOf(axis, d));
  const ticks = axis.ticks
    .filter((t) => positionOf(axis, t.at) >= -1e-9 && positionOf(axis, t.at) <= 1 + 1e-9)
    .map((t) =>
      el(
        'g',
        { class: 'tick colour-tick' },
        el('line', { x1: x + width, y1: yOf(t.at), x2: x + width + 4, y2: yOf(t.at), stroke: INK, 'stroke-width': 1 }),
        textEl('text', { x: x + width + 7, y: yOf(t.at) + 4 }, t.label),
      ),
    );
  const ends = axis.endLabels.map((label, i) =>
    textEl(
      'text',
      { class: 'colour-bar-end', 'data-end': i === 0 ? 'low' : 'high', x: x + width / 2, y: i === 0 ? area.top + area.height + 14 : area.top - 6, 'text-anchor': 'middle', 'font-size': 11 },
      label,
    ),
  );
  const lx = x + width + 52;
  const ly = area.top + area.height / 2;
  return el(
    'g',
    { class: 'colour-bar' },
    ...steps,
    el('rect', { x, y: area.top, width, height: area.height, fill: 'none', stroke: INK, 'stroke-width': 0.5 }),
    ...ticks,
    ...ends,
    textEl('text', { class: 'axis-label colour-label', x: lx, y: ly, 'text-anchor': 'middle', transform: `rotate(-90 ${num(lx)} ${num(ly)})` }, axis.label),
  );
}

/**
 * Spectrogram or Morlet power as a heat map (time × frequency) per channel, stacked panels sharing
 * one colour bar. The frequency axis is logarithmic when the frequencies are log-spaced. Edge cells
 * are hatched. Baseline-normalized power uses a diverging map centred on no change.
 *
 * The colour bar spans the finite values outside edge cells of the drawn channels; edge cells keep
 * their colour (clamped) under the hatching.
 *
 * @param matrices - the power matrices (times × frequencies, row-major) by channel name, and the edge mask
 * @returns SVG text; the same inputs give the same bytes
 */
export function timeFrequencyPlot(record: FeatureRecord, options: TimeFrequencyPlotOptions, matrices: TimeFrequencyMatrices): string {
  const result = record.result as TimeFrequencyResult;
  const tf = result.timeFrequency!;
  const names = Object.keys(matrices.power);
  const times = tf.times;
  const frequencies = result.frequencies;
  const T = times.length;
  const F = frequencies.length;
  const mask = matrices.edgeMask ?? null;
  const values: number[] = [];
  for (const name of names) {
    const m = matrices.power[name]!;
    for (let i = 0; i < T * F; i++) if (Number.isFinite(m[i]!) && (!mask || mask[i] !== 1)) values.push(m[i]!);
  }
  const axis = colourAxis(result, values, options.scale ?? 'db');
  const hasUndefined = names.some((name) => matrices.power[name]!.some((v) => !Number.isFinite(v)));
  const log = isLogSpaced(frequencies);
  const tEdges = edgesOf(times, false);
  const fEdges = edgesOf(frequencies, log);
  const outer = plotArea(options, { left: 72, right: 120, top: 50, bottom: mask || hasUndefined ? 66 : 50 });
  const gap = 40;
  const panelHeight = (outer.height - gap * (names.length - 1)) / names.length;
  const title = `${tf.method === 'morlet' ? 'Morlet' : 'Spectrogram'} power: ${names.join(', ')}`;
  const description =
    `${tf.method === 'morlet' ? 'Morlet wavelet' : 'Spectrogram'} power of ${names.join(', ')} from ${formatValue(times[0]!)} to ${formatValue(times[T - 1]!)} s ` +
    `(${tf.timeOrigin === 'event' ? 'relative to the event' : 'from the epoch start'}) and ${formatValue(frequencies[0]!)} to ${formatValue(frequencies[F - 1]!)} Hz on a ${log ? 'logarithmic' : 'linear'} frequency axis; ` +
    `colour: ${axis.label}, from ${axis.endLabels[0]} to ${axis.endLabels[1]}${axis.diverging ? ', diverging around no change' : ''}` +
    `${mask ? '; hatched cells are edge cells, where the wavelet reaches past the epoch' : ''}${hasUndefined ? '; dotted cells have no value (for example an undefined baseline)' : ''}` +
    `${T > Math.floor(outer.width) ? `; the ${T} times are averaged into ${Math.floor(outer.width)} columns, one per pixel` : ''}. Signal ${record.input.signal}, result ${record.resultHash.slice(0, 12)}.`;
  const idBase = idBaseOf(title, description, String(options.width), String(options.height));
  const hatch = `${idBase}-hatch`;
  const dots = `${idBase}-dots`;
  // Light and dark strokes side by side, so the hatching shows on pale and on deep colours alike.
  const defs = [
    el(
      'pattern',
      { id: hatch, patternUnits: 'userSpaceOnUse', width: 8, height: 8 },
      el('path', { d: 'M0,8 L8,0 M-2,2 L2,-2 M6,10 L10,6', stroke: '#ffffff', 'stroke-width': 1.3, 'stroke-opacity': 0.85 }),
      el('path', { d: 'M-2,8 L6,0 M2,10 L10,2', stroke: '#333333', 'stroke-width': 1, 'stroke-opacity': 0.6 }),
    ),
    el(
      'pattern',
      { id: dots, patternUnits: 'userSpaceOnUse', width: 5, height: 5 },
      el('rect', { x: 0, y: 0, width: 5, height: 5, fill: '#ffffff' }),
      el('circle', { cx: 2.5, cy: 2.5, r: 1, fill: '#666666' }),
    ),
  ];
  const panels: string[] = [];
  names.forEach((name, i) => {
    const area: Area = { left: outer.left, top: outer.top + i * (panelHeight + gap), width: outer.width, height: panelHeight };
    const clip = `${idBase}-clip-${i}`;
    defs.push(clipPath(clip, area));
    const xs = linearScale([tEdges[0]!, tEdges[T]!], [area.left, area.left + area.width]);
    const ys = log ? logScale([fEdges[0]!, fEdges[F]!], [area.top + area.height, area.top]) : linearScale([fEdges[0]!, fEdges[F]!], [area.top + area.height, area.top]);
    const yTicks = log ? logTicksDense(fEdges[0]!, fEdges[F]!) : linearTicks(fEdges[0]!, fEdges[F]!, 6);
    const shown = poolColumns(matrices.power[name]!.map(axis.display), mask, T, F, tEdges, area.width);
    panels.push(
      el(
        'g',
        { class: 'panel', 'data-channel': name },
        el('rect', { x: area.left, y: area.top, width: area.width, height: area.height, fill: GRID }),
        yAxis(area, ys, yTicks, 'Frequency (Hz)', 46),
        xAxis(area, xs, linearTicks(tEdges[0]!, tEdges[T]!, 8), i < names.length - 1 ? '' : tf.timeOrigin === 'event' ? 'Time from event (s)' : 'Time from epoch start (s)'),
        el('g', { class: 'heat-map', 'clip-path': `url(#${clip})` }, ...heatMap(shown.display, shown.T, F, shown.tEdges, fEdges, xs, ys, axis)),
        el('g', { class: 'no-values' }, ...markedCells((j) => !Number.isFinite(shown.display[j]!), shown.T, F, shown.tEdges, fEdges, xs, ys, 'no-value', `url(#${dots})`)),
        shown.mask
          ? el('g', { class: 'edge-cells', 'clip-path': `url(#${clip})` }, ...markedCells((j) => shown.mask![j] === 1, shown.T, F, shown.tEdges, fEdges, xs, ys, 'edge-cell', `url(#${hatch})`))
          : '',
        textEl('text', { class: 'panel-title', x: area.left + 4, y: area.top - 5, 'font-weight': 'bold' }, name),
      ),
    );
  });
  const body = [el('defs', {}, ...defs), ...panels, colourBar(outer, axis)];
  const keys: string[] = [];
  const y = outer.top + outer.height + 54;
  if (mask) {
    keys.push(
      el(
        'g',
        { class: 'edge-key' },
        el('rect', { x: outer.left, y: y - 10, width: 18, height: 12, fill: '#777777' }),
        el('rect', { x: outer.left, y: y - 10, width: 18, height: 12, fill: `url(#${hatch})` }),
        textEl('text', { x: outer.left + 24, y, 'font-size': 11 }, 'hatched: edge cells, where the wavelet reaches past the epoch'),
      ),
    );
  }
  if (hasUndefined) {
    const x = outer.left + (mask ? 400 : 0);
    keys.push(
      el(
        'g',
        { class: 'no-value-key' },
        el('rect', { x, y: y - 10, width: 18, height: 12, fill: `url(#${dots})`, stroke: '#999999', 'stroke-width': 0.5 }),
        textEl('text', { x: x + 24, y, 'font-size': 11 }, 'dotted: no value'),
      ),
    );
  }
  body.push(...keys);
  return svgDocument(options, title, description, body, idBase);
}

/** Log ticks for a frequency axis that spans little more than a decade: 1-2-5 and 10s between. */
function logTicksDense(lo: number, hi: number): Tick[] {
  const decades = logTicks(lo, hi);
  if (decades.length >= 4) return decades;
  return linearTicks(lo, hi, 6).filter((t) => t.value > 0);
}
