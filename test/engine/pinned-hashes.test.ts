import { describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { analyze } from '../../src/engine/analyze.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { resolveRecipe } from '../../src/recipes/resolve.js';
import { demoEpochs, demoRecording } from '../../src/signals/demo-recording.js';
import type { SignalView } from '../../src/signals/view.js';
import type { Signal } from '../../src/signals/signal.js';

/*
 * Records change only on purpose. Each case below runs a recipe through the path a job takes
 * (normalizeRecipe → resolveRecipe → analyze) and compares the record's resultHash and attachment
 * SHA-256s with the values the engine gave before the methods were reorganized. A refactor that
 * moves code must keep every value; a change that alters numbers must change this table on purpose
 * and say so in its commit. This is a regression pin, not a check of correctness: the method tests
 * beside it check the numbers against outside references.
 */

// The invented demo study (src/signals/demo-recording.ts): eyes-closed epochs and a short
// continuous recording of eight 4-s blocks with condition events.
const epochs = demoEpochs('eyes-closed', 'late', 4, 2, 7);
const recording = demoRecording(4, 20261201);

function synthetic(fs: number, epochCount: number, channels: string[], samples: number, seed: number): Signal {
  const random = createRandom(seed);
  const data = new Float64Array(epochCount * channels.length * samples);
  for (let e = 0; e < epochCount; e++) {
    for (let c = 0; c < channels.length; c++) {
      for (let i = 0; i < samples; i++) data[(e * channels.length + c) * samples + i] = 2 * Math.sin((2 * Math.PI * (7 + 3 * c) * i) / fs) + random.normal();
    }
  }
  return { samplingRate: fs, channels, unit: 'uV', epochCount, samplesPerEpoch: samples, data };
}

const tone = synthetic(200, 3, ['A', 'B', 'C'], 500, 3);
const withGap = (() => {
  const s = synthetic(128, 3, ['A', 'B'], 256, 5);
  const data = s.data.slice();
  data[256 + 17] = Number.NaN; // epoch 0, channel B
  return { ...s, data };
})();

const allFeatures = {
  peakFrequency: {},
  centroid: {},
  spectralEdge: {},
  entropy: {},
  powerLaw: {},
  lineNoise: {},
  quality: { maxPeakToPeak: 400 },
};

interface Case {
  name: string;
  signal: Signal;
  recipe: Record<string, unknown>;
  view?: SignalView;
}

const CASES: Case[] = [
  { name: 'welch defaults on demo epochs', signal: epochs, recipe: { method: 'welch' } },
  {
    name: 'welch median, hamming, linear detrend, fftLength 300',
    signal: epochs,
    recipe: { method: 'welch', average: 'median', window: 'hamming', detrend: 'linear', segmentSeconds: 1, fftLength: 300 },
  },
  {
    name: 'welch tukey, no overlap, confidence, perEpoch, all features',
    signal: epochs,
    recipe: {
      method: 'welch',
      window: 'tukey',
      tukeyRatio: 0.25,
      overlap: 0,
      segmentSeconds: 0.5,
      confidence: 0.9,
      perEpoch: true,
      features: allFeatures,
      ratios: [{ numerator: 'theta', denominator: 'alpha' }],
    },
  },
  {
    name: 'welch blackman-harris, flat-top bands and range',
    signal: tone,
    recipe: {
      method: 'welch',
      window: 'blackman-harris',
      segmentSeconds: 1.25,
      frequencyRange: [1, 40],
      bands: [
        { name: 'low', low: 1, high: 9 },
        { name: 'high', low: 9, high: 40 },
      ],
    },
  },
  { name: 'welch flat-top, average reference', signal: tone, recipe: { method: 'welch', window: 'flat-top', reference: 'average' } },
  { name: 'welch channel reference', signal: epochs, recipe: { method: 'welch', reference: { channel: 'Cz' } } },
  { name: 'welch continuous with bad-span labels and peak-to-peak', signal: recording, recipe: { method: 'welch', segmentSeconds: 1, badSpans: { labels: ['eyes-open/early'], peakToPeak: 150 } } },
  {
    name: 'welch fixed epoching with bad spans',
    signal: recording,
    recipe: { method: 'welch', segmentSeconds: 1, epoching: { mode: 'fixed', epochSeconds: 3, stepSeconds: 2 }, badSpans: { labels: ['eyes-open/late'], peakToPeak: null } },
  },
  {
    name: 'welch events epoching with baseline',
    signal: recording,
    recipe: { method: 'welch', segmentSeconds: 1, epoching: { mode: 'events', beforeSeconds: 0, afterSeconds: 3, baseline: [0, 0.5] }, perEpoch: true },
  },
  {
    name: 'welch events epoching by label',
    signal: recording,
    recipe: { method: 'welch', segmentSeconds: 1, epoching: { mode: 'events', labels: ['eyes-closed/early', 'eyes-closed/late'], afterSeconds: 4 } },
  },
  { name: 'welch on a view', signal: recording, recipe: { method: 'welch', segmentSeconds: 1 }, view: { start: 2, end: 20, channels: ['O1', 'Fz'], badSpans: [[5, 6.5]] } },
  { name: 'welch skipping an epoch with a gap', signal: withGap, recipe: { method: 'welch', segmentSeconds: 0.5, nonFinite: 'skip-epoch' } },
  { name: 'multitaper adaptive with confidence and features', signal: epochs, recipe: { method: 'multitaper', confidence: 0.95, features: allFeatures } },
  { name: 'multitaper eigenvalue, NW 2.5, K 4, fftLength 700', signal: epochs, recipe: { method: 'multitaper', timeBandwidth: 2.5, taperCount: 4, taperWeighting: 'eigenvalue', fftLength: 700 } },
  { name: 'multitaper equal, perEpoch, linear detrend', signal: tone, recipe: { method: 'multitaper', taperWeighting: 'equal', perEpoch: true, detrend: 'linear', confidence: 0.8 } },
  { name: 'multitaper on peak-to-peak skipped epochs', signal: epochs, recipe: { method: 'multitaper', badSpans: { labels: [], peakToPeak: 120 } } },
  { name: 'periodogram default', signal: tone, recipe: { method: 'periodogram' } },
  { name: 'periodogram hann, fftLength 1000, no detrend', signal: epochs, recipe: { method: 'periodogram', window: 'hann', fftLength: 1000, detrend: 'none', confidence: 0.95, perEpoch: true } },
  { name: 'spectrogram hann matrix', signal: epochs, recipe: { method: 'spectrogram', segmentSeconds: 0.5, stepSeconds: 0.125 } },
  {
    name: 'spectrogram tapers, baseline, perTrial',
    signal: tone,
    recipe: {
      method: 'spectrogram',
      tapers: { timeBandwidth: 2 },
      segmentSeconds: 0.5,
      stepSeconds: 0.25,
      fftLength: 128,
      baseline: { start: 0, end: 0.5, mode: 'percent' },
      perEpoch: true,
      frequencyRange: [2, 40],
    },
  },
  {
    name: 'spectrogram summary output',
    signal: epochs,
    recipe: { method: 'spectrogram', output: 'summary', summary: [{ name: 'alpha', low: 8, high: 13, start: 0.25, end: 1.5 }], baseline: { start: 0.25, end: 0.75, mode: 'zscore' } },
  },
  { name: 'morlet list, decimation, phase consistency', signal: tone, recipe: { method: 'morlet', frequencies: [6, 10, 13], cycles: 5, decimation: 4, phaseConsistency: true } },
  {
    name: 'morlet range, growing cycles, baseline decibel, perTrial',
    signal: epochs,
    recipe: { method: 'morlet', frequencies: { low: 4, high: 30, count: 6 }, cycles: { low: 3, high: 8 }, decimation: 8, baseline: { start: 0.2, end: 0.6, mode: 'decibel' }, perEpoch: true },
  },
  {
    name: 'morlet summary output on events',
    signal: recording,
    recipe: {
      method: 'morlet',
      frequencies: [6, 10],
      epoching: { mode: 'events', beforeSeconds: 0.5, afterSeconds: 2 },
      output: 'summary',
      summary: [{ name: 'alpha', low: 8, high: 12, start: 0, end: 1 }],
      baseline: { start: -0.5, end: 0, mode: 'ratio' },
    },
  },
  { name: 'connectivity every pair, Welch segments', signal: epochs, recipe: { method: 'connectivity', segmentSeconds: 0.5 } },
  {
    name: 'connectivity pairs, bands, tapers, range',
    signal: tone,
    recipe: {
      method: 'connectivity',
      pairs: [
        ['A', 'B'],
        ['C', 'A'],
      ],
      tapers: { timeBandwidth: 2 },
      segmentSeconds: 1,
      bands: [{ name: 'mid', low: 5, high: 15 }],
      frequencyRange: [1, 50],
    },
  },
];

// resultHash and attachment SHA-256s computed by the engine before the methods were reorganized;
// the two cases with powerLaw were re-pinned on purpose for engine 0.3.0 (bisquare scale about zero).
const PINNED: Record<string, { resultHash: string; attachments?: string[] }> = {
  'welch defaults on demo epochs': { resultHash: '4bb2fdd4ecaccfbc929dbd8cfeeb8814926a608ca06007c01b7411d1da0ba98e' },
  'welch median, hamming, linear detrend, fftLength 300': { resultHash: '1dc7416aed9fa58d04a278cdc5ac38da80810dbbfc2853594ca46923954ea5f7' },
  'welch tukey, no overlap, confidence, perEpoch, all features': { resultHash: '73b33c5ffeaac0c94495fb434c6bb45ea3135654620fe3c739dbb35dd36e1326' },
  'welch blackman-harris, flat-top bands and range': { resultHash: '98290ea9530fb9a7cf20e47d227c53ae9df9a4d66a8e331f1180923fcbc5c209' },
  'welch flat-top, average reference': { resultHash: '44d97baf9298d80e3314c14d95cc9cb28217a9eb0dcbb34dd2919f7eec8b6512' },
  'welch channel reference': { resultHash: '092b1a7eb196b99419a7f1f95c5cddc9d259acb26876979640c3de3b16980ec0' },
  'welch continuous with bad-span labels and peak-to-peak': { resultHash: '186706da0672c9f816bb71230ae92a8c9425068ac96e9e6512e7bc6ea8ebbe73' },
  'welch fixed epoching with bad spans': { resultHash: 'f42e27c4e339f913d34847f610aa8f6b6e57e2e1df5ef00915a119cc4d610efc' },
  'welch events epoching with baseline': { resultHash: '8e35cb00ab2b7d645b7504d02253391d775dae14bffbf738b7428f4281082c4e' },
  'welch events epoching by label': { resultHash: '04cfc716500ea8c3c01a77b24e2cdfca8b6c3cfe364db26d3bd0cc2c4b2d557b' },
  'welch on a view': { resultHash: '3fc91dbcb477158344276b7c482415d0bfcf0555d80aba0f69649f92a83a901f' },
  'welch skipping an epoch with a gap': { resultHash: '55ca7d46111d75d13430508d46882bf48329dac4ccdc04e51149cc276d573cdd' },
  'multitaper adaptive with confidence and features': { resultHash: '7ba50429c3d619adea45786231dabd8b8b11588639c5d5c5aede2195f72b4322' },
  'multitaper eigenvalue, NW 2.5, K 4, fftLength 700': { resultHash: '844a0830ca048719f3c1cc026112fc478194461536402c2bd6726b5cbe57cdbd' },
  'multitaper equal, perEpoch, linear detrend': { resultHash: '2ca18b48570fe92616e7a8e91d66550cbd3bec48ebb8b8573f5a4fa922608684' },
  'multitaper on peak-to-peak skipped epochs': { resultHash: 'ccdfbe875da9633bcee3f277281916a9bb5a626c3d4fdf6bbbf802911be00e96' },
  'periodogram default': { resultHash: '890c30c94ee36a86acd2e0a9d75fca6c011695864074cdc506079b1b9dfec1d5' },
  'periodogram hann, fftLength 1000, no detrend': { resultHash: '778bc695ab15a1b98cfd64c1c29cf57d5ebe5821c93c26c4a869351f6df2a79d' },
  'spectrogram hann matrix': {
    resultHash: '6ea9cf660b19c5b53bc36a530adb2be7ca43e67bc5e1bdfda151b335ffa4958a',
    attachments: [
      '698f1aa1bed0ad2a435cf6c8c65cac79729bd8ceb03c992894aa7e96882985fe',
      '7def462a4482b4f36b46fb1676a93e255cd976d9b095598f6cadf8b21e2fb195',
      '20def907fbf825067b6f3ffbcefbaa70a9ccfcf0eb21e3863579916b6be6748f',
      'd348ebcbffcb69f184128a5570f56908d01e84f502c95eb004833e1827ccba87',
      'b6fbd3e899da2f3663677bcfbc47f481f52dbb4c976efeddf34d2ec7d8453e6e',
      '4948425fc146e5e7b24b94a38aeb44663c270f589b812dc7a6e5c5a1281fd5ac',
      '5fbaa8840ad22060dfb916bcf8da6a4ad1a5ac16d6e23948feeed8c87caeb14d',
      'a09cc085631c27628b8e1466269d569dc6a7d6a66c3cf18e5fd324f93956a40a',
    ],
  },
  'spectrogram tapers, baseline, perTrial': {
    resultHash: 'cfc12a2aa3b8e8c84c371c5f5ce84e8d8b38ca990abf94869b9864a7848bf809',
    attachments: [
      'a9ab56b05e21d7f5bafa2108811cedc28e9bac8355f9c5e3e4433a1115b28ec1',
      'd773e5754ae86c56ab72e932f446686663f6aa966a15a2a32aa97c05a4d4b53e',
      'e9f64e22293f2da38e4d7d5aca691a590a574a775bb80ada6d5ec3d33b068039',
      '281518e99852a29ef33d1c4e112d14aa8ac727aea3f605376adcbdb3dcc891d5',
      '34262d45e98c470ecbad709299fbde23d4f58f9dc5cd9185d551dc458cc1f621',
      'b98803c1581f6471e7e0920b3be5b4ae51fe0d86fd8a643fe1a92c8d5ca45f2a',
    ],
  },
  'spectrogram summary output': { resultHash: 'a3dc034c91e39763b5430fd95122b8759558036b5b35f320388aa04c75762568' },
  'morlet list, decimation, phase consistency': {
    resultHash: 'b38a99bbc2c1b8f59dd4e6deb1683adc4d866faa507f30ac7f0a65124b433bba',
    attachments: [
      'd22ea9d6988977e4f5196d5f596c9b0b8df738c4f9d33876d962631938ffda65',
      'c6af9d954a3d307b20392a578459be140a9d7497b013f10832b88051e12c63f8',
      'f9afa74dd3d316b0ea2a12de1e566fea0743e9597e7153ef37302a6cd4f761c8',
      'b3772a76f4978f38c9a1906e0627b018b81f0288d31ec04b06a1f3f536a89ea5',
      '9436b7e352d809ba8e2f5684ac235ac269424894d11bccc2e622ee8b2677023d',
      '3a0207e46c90c343e27503396c249c1a3904a972752a92c3f2a694d215e25603',
      '64cb384647920e4df7f6bf0fa2a926ea38cc0ebc596ef5b8613869de0c0ee67c',
    ],
  },
  'morlet range, growing cycles, baseline decibel, perTrial': {
    resultHash: 'a53fbf3785c83ecadf11061864eecd06f115081a433112f6d3e608f07b5e7a70',
    attachments: [
      '493dfecd3d8b378841c45fb69a37a966550ef07a78a10b67251306df64d7e9e4',
      '230e5e29b66eb95f233e2792561e9d57d2c083f96e2ebe6948eead4723d66a17',
      '179fa7b8a63b42f6f81cf80fcbbc184d487f14b94dd7acf332a501e24bd37abc',
      '6fefd8e31a228ee2740d620e0cc0d5de1dacd18cd7b04d585ef9975dc3b75168',
      '6de102a9af80b606ec668cdc9e6086d0d4fb70c81b8c1ad5b0543910f6f465df',
      '451777450a2e9f084a279ed8e49a583e64d9b3b6af199952b3c59f775857ac4d',
      '6bc5e4f1b1427deede9e25992e793b52752d35631b257997314cc1580a946604',
      '2f43e3fb8172073ab5f96184ba122b8fe1dfdfd86054280555e07d7a4edd24b2',
      '1ef803847d527ba4e4d2eb091ce5cfd8516d090211ad395950385162ec57dc0f',
      'd1f343ed12755f7f2179e854086037233a2b70b1ba004190f4330990123dd446',
      '3ac3462ff00f80a000a554bf23d3aaba04301fdf3caa444d4c4a7a3dec26c16e',
      '6a7f3347ad6af3323a620b41de3b35e335e5f9f6aab33b02650ee19cf43836fa',
      '77cd05b0bfca127b7f5c742bb990dc5fdae4729570fa34e556bf7128d9c972c9',
      'a6927fa22b23e67e00b3530969b861040a77177100625351028de7590dca88a9',
      'b33bc76ef53322c390eed73487ce2a625935fc881e31ce29ebff3177f00795fd',
      '75f59b19b83c1fcd4448ac6be7e310a20cbd9b3c690ec5bbeb8c5dc496b5ce23',
      '92080262f6d52c88d83a0aebecddfe4650250b96ac7420115f798615267b90fe',
    ],
  },
  'morlet summary output on events': { resultHash: 'b218c13ffe166b8d2ce28674900711ff4c6f581839677e77f966b2d7c4fd9fd7' },
  'connectivity every pair, Welch segments': { resultHash: '50f9b54a33cc88c2474dcb9d83ff3cfac8ea382e65fdf54759d4d2c1b6149ba8' },
  'connectivity pairs, bands, tapers, range': { resultHash: 'a0f76aa82e3161e86ec23b87c78aed4cfd3bdcf5c3a88c9a7282990db02c2135' },
};

function run(c: Case) {
  const pinned = normalizeRecipe(c.recipe);
  const resolved = resolveRecipe(pinned.recipe, pinned.hash, c.signal);
  return analyze(c.signal, resolved, { signalId: 'sig_pinned', sha256: 'pinned', recipeId: pinned.id, mode: 'local', ...(c.view ? { view: c.view } : {}) });
}

describe('when the records of every method are computed again', () => {
  for (const c of CASES) {
    it(`should give the pinned result hash for ${c.name}`, () => {
      const record = run(c);
      const got = { resultHash: record.resultHash, ...(record.attachments ? { attachments: record.attachments.map((a) => a.sha256) } : {}) };
      if (process.env.PRINT_PINNED) process.stdout.write(`PINNED ${JSON.stringify(c.name)}: ${JSON.stringify(got)},\n`);
      expect(got).toEqual(PINNED[c.name]);
    });
  }

  it('should pin every case', () => {
    expect(Object.keys(PINNED).sort()).toEqual(CASES.map((c) => c.name).sort());
  });
});
