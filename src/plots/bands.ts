import type { FeatureRecord, FeatureResult } from '../engine/record.js';
import { seriesColour } from './colour.js';
import { idBaseOf, legend, plotArea, prettyUnit, svgDocument, yAxis, type PictureSize } from './frame.js';
import { formatValue, linearScale, linearTicks, niceDomain } from './scale.js';
import { selectChannels } from './select.js';
import { el, textEl } from './svg.js';

export type BandValue = 'absolute' | 'relative';

export interface BandsPlotOptions extends PictureSize {
  /** @defaultValue every channel */
  channels?: string[];
  /** absolute power (unit²) or the fraction of the power over the recipe's frequency range. @defaultValue 'absolute' */
  value?: BandValue;
}

/**
 * Band power per channel as grouped bars: one group per channel, one bar per band (colour), on a
 * linear axis from 0.
 *
 * @returns SVG text; the same record and options give the same bytes
 * @throws DomainError `unknown-channel` (pointer `/channels`)
 */
export function bandsPlot(record: FeatureRecord, options: BandsPlotOptions): string {
  const result = record.result as FeatureResult;
  const names = selectChannels(
    result.channels.map((c) => c.name),
    options.channels,
  );
  const value = options.value ?? 'absolute';
  const channels = names.map((n) => result.channels.find((c) => c.name === n)!);
  const bandNames = channels[0]?.bands.map((b) => b.name) ?? [];
  const read = (b: { absolute: number; relative: number | null }) => (value === 'absolute' ? b.absolute : b.relative);
  let max = 0;
  for (const c of channels) for (const b of c.bands) max = Math.max(max, read(b) ?? 0);
  const legendWidth = 24 + Math.max(0, ...(channels[0]?.bands ?? []).map((b) => `${b.name} ${b.low}–${b.high} Hz`.length)) * 7.5 + 10;
  const area = plotArea(options, { left: 78, bottom: 46, right: legendWidth + 16 });
  const [, top] = niceDomain(0, max > 0 ? max : 1, 6);
  const ys = linearScale([0, top], [area.top + area.height, area.top]);
  const unit = prettyUnit(result.units.power);
  const range = record.recipe.derived.frequencyRange;
  const yLabel = value === 'absolute' ? `Band power (${unit})` : `Relative band power (fraction of ${range[0]}–${range[1]} Hz)`;
  const groupWidth = area.width / Math.max(1, channels.length);
  const barWidth = (groupWidth * 0.8) / Math.max(1, bandNames.length);
  const bars: string[] = [];
  const categories: string[] = [];
  channels.forEach((c, i) => {
    const gx = area.left + i * groupWidth + groupWidth * 0.1;
    c.bands.forEach((b, j) => {
      const v = read(b);
      if (v === null || !Number.isFinite(v)) return;
      const y = ys(v);
      bars.push(
        el(
          'rect',
          { class: 'bar', 'data-channel': c.name, 'data-band': b.name, x: gx + j * barWidth, y, width: barWidth * 0.92, height: ys(0) - y, fill: seriesColour(j) },
          textEl('title', {}, `${c.name} ${b.name} (${b.low}–${b.high} Hz): ${formatValue(v)}${value === 'absolute' ? ` ${unit}` : ''}`),
        ),
      );
    });
    categories.push(textEl('text', { class: 'category', x: area.left + (i + 0.5) * groupWidth, y: area.top + area.height + 18, 'text-anchor': 'middle' }, c.name));
  });
  const title = `${value === 'absolute' ? 'Band power' : 'Relative band power'}: ${names.join(', ')}`;
  const description =
    `${value === 'absolute' ? `Absolute band power in ${unit}` : 'Band power as a fraction of the total'} per channel (${names.join(', ')}), bars for ${bandNames.join(', ')}` +
    `. Signal ${record.input.signal}, result ${record.resultHash.slice(0, 12)}.`;
  const idBase = idBaseOf(title, description, String(options.width), String(options.height));
  const body = [
    yAxis(area, ys, linearTicks(0, top, 6), yLabel, 62),
    el('line', { x1: area.left, y1: ys(0), x2: area.left + area.width, y2: ys(0), stroke: '#222222', 'stroke-width': 1 }),
    el('g', { class: 'bars' }, ...bars),
    el('g', { class: 'categories' }, ...categories, textEl('text', { class: 'axis-label', x: area.left + area.width / 2, y: area.top + area.height + 36, 'text-anchor': 'middle' }, 'Channel')),
    legend(
      area,
      bandNames.map((name, j) => {
        const band = channels[0]!.bands[j]!;
        return { label: `${name} ${band.low}–${band.high} Hz`, colour: seriesColour(j), shape: 'swatch' as const };
      }),
      true,
    ),
  ];
  return svgDocument(options, title, description, body, idBase);
}
