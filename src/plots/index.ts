import { DomainError } from '../common/errors.js';
import type { FeatureRecord } from '../engine/record.js';
import type { Recipe } from '../recipes/schema.js';
import { psdPlot, type PowerScale } from './psd.js';

/** Options a plot route accepts; each kind reads the ones that concern it. */
export interface PlotOptions {
  /** px */
  width: number;
  /** px */
  height: number;
  channels?: string[];
  scale?: PowerScale;
  frequencyRange?: [number, number];
  epochs?: boolean;
}

/** What a plot kind needs besides the record (time–frequency matrices, read by the caller). */
export type PlotInputs = Record<string, never>;

interface PlotKind {
  /** methods whose records this kind can draw */
  methods: readonly Recipe['method'][];
  summary: string;
  render(record: FeatureRecord, options: PlotOptions): string;
}

const SPECTRAL = ['welch', 'multitaper', 'periodogram'] as const;

export const PLOT_KINDS = {
  psd: { methods: SPECTRAL, summary: 'power spectral density per channel against frequency', render: psdPlot },
} as const satisfies Record<string, PlotKind>;

export type PlotKindName = keyof typeof PLOT_KINDS;
export const PLOT_KIND_NAMES = Object.keys(PLOT_KINDS) as PlotKindName[];

/** The kind by name, or a problem listing the kinds there are (pointer relative to the caller). */
export function plotKind(name: string, pointer = '/kind'): PlotKind & { name: PlotKindName } {
  if (!Object.hasOwn(PLOT_KINDS, name)) {
    throw new DomainError('unknown-plot-kind', `there is no plot kind "${name}"; the kinds are ${PLOT_KIND_NAMES.join(', ')}`, { pointer, extensions: { allowed: PLOT_KIND_NAMES } });
  }
  return { ...PLOT_KINDS[name as PlotKindName], name: name as PlotKindName };
}

/** Refuses a kind that does not fit the record's method, naming the kinds that do. */
export function checkApplicable(kind: PlotKind & { name: PlotKindName }, method: Recipe['method'], pointer = '/kind'): void {
  if ((kind.methods as readonly string[]).includes(method)) return;
  const fitting = PLOT_KIND_NAMES.filter((k) => (PLOT_KINDS[k].methods as readonly string[]).includes(method));
  throw new DomainError('plot-not-applicable', `a "${kind.name}" plot needs a record of ${kind.methods.join(', ')}; this record is ${method}, which has ${fitting.length > 0 ? fitting.join(', ') : 'no'} plots`, {
    pointer,
    extensions: { allowed: fitting },
  });
}

export { psdPlot };
