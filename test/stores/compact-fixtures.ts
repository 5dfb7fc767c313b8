import { createRandom } from '../../src/common/random.js';
import { writeEdf } from '../../src/signals/edf/index.js';

/**
 * Uploads whose signal ids were pinned before samples were stored compactly (int16 for EDF,
 * float32 for float32 uploads): the same bytes must keep giving the same ids and content hashes.
 */

/**
 * An EDF+C file of three channels, two in mV and one in µV (so the decimal shift of the physical
 * extremes is exercised), with uneven calibrations, 7 one-second records at 200 Hz and a
 * 'probe' annotation. Seeded: the same bytes every time.
 */
export function pinnedEdf(): Uint8Array {
  const random = createRandom(15);
  const fs = 200;
  const records = 7;
  const n = fs * records;
  const channel = (scale: number) => Float64Array.from({ length: n }, (_, i) => scale * (Math.sin((2 * Math.PI * 10 * i) / fs) + 0.3 * random.normal()));
  return writeEdf({
    signals: [
      { label: 'Fz', samples: channel(0.04), samplingRate: fs, physicalDimension: 'mV', physicalMinimum: -0.25, physicalMaximum: 0.2513, digitalMinimum: -2048, digitalMaximum: 2047 },
      { label: 'Cz', samples: channel(0.05), samplingRate: fs, physicalDimension: 'mV', physicalMinimum: -3.2768, physicalMaximum: 3.2767 },
      { label: 'Pz', samples: channel(37), samplingRate: fs, physicalDimension: 'uV', physicalMinimum: -187.3, physicalMaximum: 190.01, digitalMinimum: -30000, digitalMaximum: 31000 },
    ],
    recordDuration: 1,
    startDate: { year: 2026, month: 12, day: 1, hour: 8, minute: 30, second: 0 },
    annotations: [{ onset: 2.5, duration: 1, label: 'probe' }],
  });
}

/** Little-endian float32 samples: 2 epochs × 3 channels × 500 samples, seeded, with a few values that round awkwardly under × 1000 and / 1000. */
export function pinnedFloat32(): Uint8Array {
  const random = createRandom(16);
  const values = new Float32Array(2 * 3 * 500);
  for (let i = 0; i < values.length; i++) values[i] = 0.01 * random.normal() + 1e-7 * i;
  values[7] = 0.1;
  values[8] = 1e-38; // subnormal in float32 once shifted? kept finite either way
  values[9] = -0;
  return new Uint8Array(values.buffer);
}
