import {
  CHANNEL_COLUMN,
  CONFIDENCE_COLUMNS,
  ENTRY_COLUMN,
  FEATURE_COLUMNS,
  LEVEL_COLUMNS,
  LOCATION_COLUMNS,
  PAIR_COLUMNS,
  PROVENANCE_COLUMNS,
  SIGNAL_COLUMN,
  TABLE_LEVELS,
  type Column,
} from './columns.js';

const LEVEL_GRAIN: Record<(typeof TABLE_LEVELS)[number], string> = {
  bands: 'one row per spectrum × channel × band (welch, multitaper, periodogram)',
  ratios: 'one row per spectrum × channel × band ratio (when the recipe has ratios)',
  features: 'one row per spectrum × channel, one column per feature the recipe names',
  spectra: 'one row per spectrum × channel × frequency bin',
  quality: 'one row per screened epoch × channel (with the quality feature)',
  summary: 'one row per channel × band-and-window summary (morlet, spectrogram with `summary`)',
  'pair-bands': 'one row per channel pair × band (connectivity)',
  'pair-spectra': 'one row per channel pair × frequency bin (connectivity)',
};

const row = (c: Column) => `| \`${c.name}\` | ${c.type} | ${c.unit ?? ''} | ${c.meaning} |`;
const HEAD = '| column | type | unit | meaning |\n|---|---|---|---|';

/**
 * Every column of every table level as Markdown, from the same lists that make the CSV header and
 * the Parquet schema: the README and the OpenAPI description show this text.
 */
export function tableColumnsMarkdown(): string {
  const lead = [
    ENTRY_COLUMN,
    { name: '<metadata key>', type: 'string', unit: null, meaning: "one column per entry metadata key (run-level tables); double when every entry's value is a number" } as Column,
    SIGNAL_COLUMN,
    ...LOCATION_COLUMNS,
    CHANNEL_COLUMN,
    ...PAIR_COLUMNS,
  ];
  const parts = [
    'Every row starts with where it comes from and ends with provenance:',
    '',
    HEAD,
    ...lead.map(row),
    ...PROVENANCE_COLUMNS.map(row),
    '',
    '`channel` is replaced by `channelA`, `channelB` in the pair levels. Then the values of each level:',
  ];
  for (const level of TABLE_LEVELS) {
    parts.push('', `**\`${level}\`**: ${LEVEL_GRAIN[level]}.`, '', HEAD);
    if (level === 'features') {
      for (const [feature, cols] of Object.entries(FEATURE_COLUMNS)) parts.push(...cols.map((c) => row({ ...c, meaning: `${c.meaning} (feature \`${feature}\`)` })));
    } else {
      parts.push(...LEVEL_COLUMNS[level].map(row));
      if (level === 'spectra') parts.push(...CONFIDENCE_COLUMNS.map((c) => row({ ...c, meaning: `${c.meaning} (recipes with \`confidence\`)` })));
    }
  }
  return parts.join('\n');
}
