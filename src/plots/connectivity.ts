import type { FeatureRecord, TimeFrequencyResult } from '../engine/record.js';
import { seriesColour } from './colour.js';
import { clipPath, idBaseOf, INK, legend, plotArea, svgDocument, xAxis, yAxis, type Area, type PictureSize } from './frame.js';
import { formatValue, linearScale, linearTicks, niceDomain } from './scale.js';
import { requireBins, selectChannels } from './select.js';
import { defaultFrequencyRange } from './psd.js';
import { el, pathData, textEl } from './svg.js';

export interface ConnectivityPlotOptions extends PictureSize {
  /** pairs touching any of these channels. @defaultValue every pair */
  channels?: string[];
  /** [low, high] Hz, both included. @defaultValue the record's frequencies above 0 Hz */
  frequencyRange?: [number, number];
}

interface PairValues {
  channels: [string, string];
  coherence: (number | null)[];
  imaginaryCoherency: (number | null)[];
  phaseLocking?: (number | null)[];
}

interface ConnectivityPart {
  pairs: PairValues[];
  coherenceThreshold?: number;
  alpha?: number;
}

const MEASURES = [
  { key: 'coherence', label: 'Coherence (magnitude squared)', short: 'coherence', symmetric: false },
  { key: 'imaginaryCoherency', label: 'Imaginary part of coherency', short: 'imag. coherency', symmetric: true },
  { key: 'phaseLocking', label: 'Phase locking value across epochs', short: 'phase locking', symmetric: false },
] as const;

/**
 * Coherence, imaginary coherency and (when the record has it) phase locking per channel pair
 * against frequency, one panel each, with the coherence threshold under independence dashed.
 *
 * @returns SVG text; the same record and options give the same bytes
 * @throws DomainError `unknown-channel` (pointer `/channels`), `invalid-request` for a range with no bin
 */
export function connectivityPlot(record: FeatureRecord, options: ConnectivityPlotOptions): string {
  const result = record.result as TimeFrequencyResult;
  const part = result.connectivity as unknown as ConnectivityPart;
  const asked = selectChannels(
    result.channels.map((c) => c.name),
    options.channels,
  );
  const pairs = part.pairs.filter((p) => !options.channels || options.channels.length === 0 || p.channels.some((c) => asked.includes(c)));
  const frequencies = result.frequencies;
  const range = options.frequencyRange ?? defaultFrequencyRange(frequencies);
  const bins = requireBins(frequencies, range);
  const measures = MEASURES.filter((m) => m.key !== 'phaseLocking' || pairs.some((p) => Array.isArray(p.phaseLocking)));
  const outer = plotArea(options, { left: 72, right: 20, top: 52, bottom: 50 });
  const gap = 44;
  const panelHeight = (outer.height - gap * (measures.length - 1)) / measures.length;
  const title = `Connectivity: ${pairs.map((p) => p.channels.join('–')).join(', ')}`;
  const description =
    `${measures.map((m) => m.label.toLowerCase()).join(', ')} of ${pairs.length} channel pair(s) from ${formatValue(range[0])} to ${formatValue(range[1])} Hz` +
    `${part.coherenceThreshold !== undefined ? `; dashed: the level-${part.alpha ?? 0.05} coherence threshold under independence, ${formatValue(part.coherenceThreshold)}` : ''}` +
    `. Signal ${record.input.signal}, result ${record.resultHash.slice(0, 12)}.`;
  const idBase = idBaseOf(title, description, String(options.width), String(options.height));
  const defs: string[] = [];
  const panels: string[] = [];
  measures.forEach((m, i) => {
    const area: Area = { left: outer.left, top: outer.top + i * (panelHeight + gap), width: outer.width, height: panelHeight };
    const clip = `${idBase}-clip-${i}`;
    defs.push(clipPath(clip, area));
    const xs = linearScale(range, [area.left, area.left + area.width]);
    let domain: [number, number] = [0, 1];
    if (m.symmetric) {
      let reach = 0;
      for (const p of pairs) for (const k of bins) reach = Math.max(reach, Math.abs(p[m.key]?.[k] ?? 0));
      const top = niceDomain(0, reach || 0.1, 4)[1];
      domain = [-top, top];
    }
    const ys = linearScale(domain, [area.top + area.height, area.top]);
    const lines = pairs.map((p, j) =>
      el('path', {
        class: 'series',
        'data-measure': m.key,
        'data-series': p.channels.join('-'),
        d: pathData(
          bins.map((k) => xs(frequencies[k]!)),
          bins.map((k) => ys(p[m.key]?.[k] ?? Number.NaN)),
        ),
        fill: 'none',
        stroke: seriesColour(j),
        'stroke-width': 1.5,
      }),
    );
    if (m.key === 'coherence' && part.coherenceThreshold !== undefined) {
      const y = ys(part.coherenceThreshold);
      lines.push(el('line', { class: 'threshold', x1: area.left, y1: y, x2: area.left + area.width, y2: y, stroke: INK, 'stroke-width': 1, 'stroke-dasharray': '5 4' }));
    }
    panels.push(
      el(
        'g',
        { class: 'panel', 'data-measure': m.key },
        yAxis(area, ys, linearTicks(domain[0], domain[1], 4), m.short, 46),
        xAxis(area, xs, linearTicks(range[0], range[1], 8), i === measures.length - 1 ? 'Frequency (Hz)' : ''),
        el('g', { class: 'data', 'clip-path': `url(#${clip})` }, ...lines),
        textEl('text', { class: 'panel-title', x: area.left + 4, y: area.top - 5, 'font-weight': 'bold' }, m.label),
      ),
    );
  });
  const body = [
    el('defs', {}, ...defs),
    ...panels,
    legend(
      { ...outer, height: panelHeight },
      pairs.map((p, j) => ({ label: p.channels.join('–'), colour: seriesColour(j), shape: 'line' as const })),
    ),
  ];
  return svgDocument(options, title, description, body, idBase);
}
