import { el, escapeXml, num, shortHash, textEl } from './svg.js';
import type { Scale, Tick } from './scale.js';

export const FONT = 'DejaVu Sans, Verdana, Arial, sans-serif';
export const INK = '#222222';
export const GRID = '#e3e3e3';

/** The plotting rectangle inside the picture, in px. */
export interface Area {
  left: number;
  top: number;
  width: number;
  height: number;
}

export interface PictureSize {
  /** px */
  width: number;
  /** px */
  height: number;
}

/** The whole picture: an accessible title and description, real text, and a white ground. */
export function svgDocument(size: PictureSize, title: string, description: string, body: string[], idBase: string): string {
  const titleId = `${idBase}-title`;
  const descId = `${idBase}-desc`;
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="${num(size.width)}" height="${num(size.height)}" viewBox="0 0 ${num(size.width)} ${num(size.height)}"` +
    ` role="img" aria-labelledby="${titleId} ${descId}" font-family="${escapeXml(FONT)}" font-size="12" fill="${INK}">` +
    textEl('title', { id: titleId }, title) +
    textEl('desc', { id: descId }, description) +
    el('rect', { class: 'background', x: 0, y: 0, width: size.width, height: size.height, fill: '#ffffff' }) +
    textEl('text', { class: 'plot-title', x: size.width / 2, y: 20, 'text-anchor': 'middle', 'font-size': 14, 'font-weight': 'bold' }, title) +
    body.join('') +
    '</svg>\n'
  );
}

/** Element ids unique to this picture, so several plots can be inlined in one page. */
export function idBaseOf(...parts: string[]): string {
  return `rm${shortHash(parts.join('\u0000'))}`;
}

export function clipPath(id: string, area: Area): string {
  return el('clipPath', { id }, el('rect', { x: area.left, y: area.top, width: area.width, height: area.height }));
}

/** Bottom axis: grid lines, tick marks, tick labels and the axis label. */
export function xAxis(area: Area, scale: Scale, ticks: Tick[], label: string): string {
  const bottom = area.top + area.height;
  const parts = ticks.map((t) => {
    const x = scale(t.value);
    return el(
      'g',
      { class: 'tick x-tick' },
      el('line', { x1: x, y1: area.top, x2: x, y2: bottom, stroke: GRID, 'stroke-width': 1 }),
      el('line', { x1: x, y1: bottom, x2: x, y2: bottom + 5, stroke: INK, 'stroke-width': 1 }),
      textEl('text', { x, y: bottom + 18, 'text-anchor': 'middle' }, t.label),
    );
  });
  return el(
    'g',
    { class: 'axis x-axis' },
    ...parts,
    el('line', { x1: area.left, y1: bottom, x2: area.left + area.width, y2: bottom, stroke: INK, 'stroke-width': 1 }),
    label ? textEl('text', { class: 'axis-label', x: area.left + area.width / 2, y: bottom + 36, 'text-anchor': 'middle' }, label) : '',
  );
}

/** Left axis: grid lines, tick marks, tick labels and the (rotated) axis label. */
export function yAxis(area: Area, scale: Scale, ticks: Tick[], label: string, labelOffset = 48): string {
  const parts = ticks.map((t) => {
    const y = scale(t.value);
    return el(
      'g',
      { class: 'tick y-tick' },
      el('line', { x1: area.left, y1: y, x2: area.left + area.width, y2: y, stroke: GRID, 'stroke-width': 1 }),
      el('line', { x1: area.left - 5, y1: y, x2: area.left, y2: y, stroke: INK, 'stroke-width': 1 }),
      textEl('text', { x: area.left - 8, y: y + 4, 'text-anchor': 'end' }, t.label),
    );
  });
  const cy = area.top + area.height / 2;
  const lx = area.left - labelOffset;
  return el(
    'g',
    { class: 'axis y-axis' },
    ...parts,
    el('line', { x1: area.left, y1: area.top, x2: area.left, y2: area.top + area.height, stroke: INK, 'stroke-width': 1 }),
    textEl('text', { class: 'axis-label', x: lx, y: cy, 'text-anchor': 'middle', transform: `rotate(-90 ${num(lx)} ${num(cy)})` }, label),
  );
}

export interface LegendEntry {
  label: string;
  colour: string;
  /** a line (series), a filled swatch (ribbon, bar) or a dot (marker) */
  shape: 'line' | 'swatch' | 'dot';
  opacity?: number;
  dash?: string;
}

/** A legend box in the top-right corner of the area, or just right of it (`outside`). */
export function legend(area: Area, entries: LegendEntry[], outside = false): string {
  if (entries.length === 0) return '';
  const rowHeight = 16;
  const width = 24 + Math.max(...entries.map((e) => e.label.length)) * 7.5 + 10;
  const x = outside ? area.left + area.width + 8 : area.left + area.width - width - 6;
  const y = area.top + 6;
  const rows = entries.map((e, i) => {
    const cy = y + 10 + i * rowHeight;
    const mark =
      e.shape === 'line'
        ? el('line', { x1: x + 6, y1: cy, x2: x + 24, y2: cy, stroke: e.colour, 'stroke-width': 2, 'stroke-dasharray': e.dash })
        : e.shape === 'dot'
          ? el('circle', { cx: x + 15, cy, r: 4, fill: e.colour })
          : el('rect', { x: x + 6, y: cy - 5, width: 18, height: 10, fill: e.colour, 'fill-opacity': e.opacity });
    return el('g', { class: 'legend-entry' }, mark, textEl('text', { x: x + 30, y: cy + 4 }, e.label));
  });
  return el('g', { class: 'legend' }, el('rect', { x, y, width, height: entries.length * rowHeight + 4, fill: '#ffffff', 'fill-opacity': 0.85, stroke: '#bbbbbb', 'stroke-width': 0.5 }), ...rows);
}

/** "uV^2/Hz" → "µV²/Hz": record units in the form people read. */
export function prettyUnit(unit: string): string {
  return unit
    .replace(/\bu(?=[A-Za-z])/g, '\u00b5')
    .replace(/\^2/g, '\u00b2')
    .replace(/\^3/g, '\u00b3');
}

/** The picture's area left after margins for the title, axes and labels. */
export function plotArea(size: PictureSize, margins: { left?: number; right?: number; top?: number; bottom?: number } = {}): Area {
  const left = margins.left ?? 72;
  const right = margins.right ?? 20;
  const top = margins.top ?? 36;
  const bottom = margins.bottom ?? 50;
  return { left, top, width: Math.max(10, size.width - left - right), height: Math.max(10, size.height - top - bottom) };
}
