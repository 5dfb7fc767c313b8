import { DomainError } from '../common/errors.js';
import type { FeatureRecord, TimeFrequencyResult } from '../engine/record.js';
import type { Recipe } from '../recipes/schema.js';
import { bandsPlot, type BandValue } from './bands.js';
import { connectivityPlot } from './connectivity.js';
import { psdPlot, type PowerScale } from './psd.js';
import { timeFrequencyAttachments, timeFrequencyPlot } from './time-frequency.js';

/** Options a plot route accepts; each kind reads the ones that concern it. */
export interface PlotOptions {
  /** px */
  width: number;
  /** px */
  height: number;
  channels?: string[];
  scale?: PowerScale;
  value?: BandValue;
  frequencyRange?: [number, number];
  epochs?: boolean;
}

/** Binary attachments a kind draws, by attachment name, as the caller read them from the store. */
export type PlotAttachments = Record<string, Float64Array | Uint8Array>;

interface PlotKind {
  /** methods whose records this kind can draw */
  methods: readonly Recipe['method'][];
  summary: string;
  /** names of the attachments this plot needs (read by the caller, who has the store) */
  attachments?(record: FeatureRecord, options: PlotOptions): string[];
  render(record: FeatureRecord, options: PlotOptions, attachments: PlotAttachments): string;
}

const SPECTRAL = ['welch', 'multitaper', 'periodogram'] as const;

export const PLOT_KINDS = {
  psd: { methods: SPECTRAL, summary: 'power spectral density per channel against frequency', render: (record, options) => psdPlot(record, options) },
  bands: { methods: SPECTRAL, summary: 'band power per channel as bars, absolute or relative', render: (record, options) => bandsPlot(record, options) },
  'time-frequency': {
    methods: ['morlet', 'spectrogram'],
    summary: 'time–frequency power as a heat map with a colour bar, edge cells hatched',
    attachments: (record, options) => {
      const names = timeFrequencyAttachments(record, options.channels);
      return [...Object.values(names.power), ...(names.edgeMask ? [names.edgeMask] : [])];
    },
    render: (record, options, attachments) => {
      const names = timeFrequencyAttachments(record, options.channels);
      const power: Record<string, Float64Array> = {};
      for (const [channel, name] of Object.entries(names.power)) {
        const data = attachments[name];
        if (data instanceof Float64Array) power[channel] = data;
      }
      const mask = names.edgeMask ? attachments[names.edgeMask] : undefined;
      return timeFrequencyPlot(record, options, { power, edgeMask: mask instanceof Uint8Array ? mask : null });
    },
  },
  connectivity: { methods: ['connectivity'], summary: 'coherence, imaginary coherency and phase locking per pair against frequency', render: (record, options) => connectivityPlot(record, options) },
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

/** Refuses a kind that does not fit the record, naming the kinds that do. */
export function checkApplicable(kind: PlotKind & { name: PlotKindName }, record: FeatureRecord, pointer = '/kind'): void {
  const method = record.recipe.method;
  const fitting = PLOT_KIND_NAMES.filter((k) => (PLOT_KINDS[k].methods as readonly string[]).includes(method));
  if (!(kind.methods as readonly string[]).includes(method)) {
    throw new DomainError(
      'plot-not-applicable',
      `a "${kind.name}" plot needs a record of ${kind.methods.join(', ')}; this record is ${method}, which has ${fitting.length > 0 ? fitting.join(', ') : 'no'} plots`,
      {
        pointer,
        extensions: { allowed: fitting },
      },
    );
  }
  if (kind.name === 'time-frequency' && !(record.result as TimeFrequencyResult).timeFrequency?.attachments.some((a) => a.kind === 'power')) {
    throw new DomainError('plot-not-applicable', 'this record keeps only band-and-window summaries (output "summary"); a time–frequency plot needs the matrices of output "matrix"', {
      pointer,
      extensions: { allowed: [] },
    });
  }
}

export { bandsPlot, connectivityPlot, psdPlot, timeFrequencyPlot };
