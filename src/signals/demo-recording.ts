import { createRandom, type Random } from '../common/random.js';
import type { Signal, SignalEvent } from './signal.js';

/**
 * The invented demo study: a night-shift alertness study at an imaginary sleep lab ("Lantern Ward").
 * Eight scalp channels at 256 Hz, rest blocks alternating eyes open / eyes closed, recorded early
 * and late in a shift. Everything is synthetic and seeded:
 * - a 1/f-like background (a sum of first-order low-pass noises with octave-spaced corners);
 * - occipital alpha near 10 Hz, about three times stronger with the eyes closed;
 * - frontal theta near 6 Hz that grows in the late-shift blocks;
 * - blink-like deflections on F3/F4 while the eyes are open;
 * - 50 Hz mains hum on Cz.
 */
export const DEMO_CHANNELS = ['F3', 'F4', 'Fz', 'Cz', 'Pz', 'O1', 'Oz', 'O2'] as const;
export const DEMO_SAMPLING_RATE = 256;

export type DemoCondition = 'eyes-open' | 'eyes-closed';
export type DemoShift = 'early' | 'late';

const ALPHA_WEIGHT: Record<string, number> = { O1: 1, Oz: 1, O2: 1, Pz: 0.6, Cz: 0.25, Fz: 0.1, F3: 0.1, F4: 0.1 };
const THETA_WEIGHT: Record<string, number> = { Fz: 1, F3: 0.8, F4: 0.8, Cz: 0.5, Pz: 0.2, O1: 0.05, Oz: 0.05, O2: 0.05 };

function pinkish(random: Random, n: number, fs: number, rms: number): Float64Array {
  const out = new Float64Array(n);
  const corners = [0.5, 1, 2, 4, 8, 16, 32, 64];
  for (const fc of corners) {
    const a = Math.exp((-2 * Math.PI * fc) / fs);
    // Equal variance per octave gives a spectrum falling roughly as 1/f between the corners.
    const gain = Math.sqrt(1 - a * a);
    let y = 0;
    for (let i = 0; i < n; i++) {
      y = a * y + gain * random.normal();
      out[i]! += y;
    }
  }
  let sum = 0;
  for (let i = 0; i < n; i++) sum += out[i]! * out[i]!;
  const scale = rms / Math.sqrt(sum / n);
  for (let i = 0; i < n; i++) out[i]! *= scale;
  return out;
}

/** One block of `seconds` for one condition and shift, channel × sample in µV. */
export function demoBlock(condition: DemoCondition, shift: DemoShift, seconds: number, seed: number): Float64Array[] {
  const random = createRandom(seed);
  const fs = DEMO_SAMPLING_RATE;
  const n = Math.round(seconds * fs);
  const alphaAmplitude = condition === 'eyes-closed' ? 24 : 8;
  const thetaAmplitude = shift === 'late' ? 9 : 3;
  const alphaFrequency = 9.8 + 0.4 * random.uniform();
  const thetaFrequency = 5.6 + 0.6 * random.uniform();
  const alphaPhase = 2 * Math.PI * random.uniform();
  const thetaPhase = 2 * Math.PI * random.uniform();
  const blinks: number[] = [];
  if (condition === 'eyes-open') for (let t = 0.7 + 2 * random.uniform(); t < seconds - 0.5; t += 2.5 + 3 * random.uniform()) blinks.push(t);
  return DEMO_CHANNELS.map((name) => {
    const x = pinkish(random, n, fs, 9);
    // Alpha waxes and wanes over a few seconds, as it does in real recordings.
    const waxPhase = 2 * Math.PI * random.uniform();
    for (let i = 0; i < n; i++) {
      const t = i / fs;
      const envelope = 1 + 0.3 * Math.sin(2 * Math.PI * 0.15 * t + waxPhase);
      x[i]! += ALPHA_WEIGHT[name]! * alphaAmplitude * envelope * Math.sin(2 * Math.PI * alphaFrequency * t + alphaPhase);
      x[i]! += THETA_WEIGHT[name]! * thetaAmplitude * Math.sin(2 * Math.PI * thetaFrequency * t + thetaPhase);
      if (name === 'Cz') x[i]! += 6 * Math.sin(2 * Math.PI * 50 * t);
      if (name === 'F3' || name === 'F4') {
        for (const b of blinks) {
          const d = (t - b) / 0.08;
          if (Math.abs(d) < 6) x[i]! += 110 * Math.exp(-0.5 * d * d);
        }
      }
    }
    return x;
  });
}

/** Cuts a block into `epochSeconds` epochs and packs them as a {@link Signal}. */
export function demoEpochs(condition: DemoCondition, shift: DemoShift, epochCount: number, epochSeconds: number, seed: number): Signal {
  const block = demoBlock(condition, shift, epochCount * epochSeconds, seed);
  const perEpoch = Math.round(epochSeconds * DEMO_SAMPLING_RATE);
  const data = new Float64Array(epochCount * DEMO_CHANNELS.length * perEpoch);
  for (let e = 0; e < epochCount; e++) {
    block.forEach((row, c) => data.set(row.subarray(e * perEpoch, (e + 1) * perEpoch), (e * DEMO_CHANNELS.length + c) * perEpoch));
  }
  return { samplingRate: DEMO_SAMPLING_RATE, channels: [...DEMO_CHANNELS], unit: 'uV', epochCount, samplesPerEpoch: perEpoch, data };
}

/** A continuous recording: EO, EC, EO, EC blocks early in the shift, then the same late, with block events. */
export function demoRecording(blockSeconds = 30, seed = 20261201): Signal {
  const order: [DemoCondition, DemoShift][] = [
    ['eyes-open', 'early'],
    ['eyes-closed', 'early'],
    ['eyes-open', 'early'],
    ['eyes-closed', 'early'],
    ['eyes-open', 'late'],
    ['eyes-closed', 'late'],
    ['eyes-open', 'late'],
    ['eyes-closed', 'late'],
  ];
  const n = Math.round(blockSeconds * DEMO_SAMPLING_RATE);
  const total = n * order.length;
  const data = new Float64Array(DEMO_CHANNELS.length * total);
  const events: SignalEvent[] = [];
  order.forEach(([condition, shift], b) => {
    demoBlock(condition, shift, blockSeconds, seed + b).forEach((row, c) => data.set(row, c * total + b * n));
    events.push({ onset: b * blockSeconds, duration: blockSeconds, label: `${condition}/${shift}` });
  });
  return { samplingRate: DEMO_SAMPLING_RATE, channels: [...DEMO_CHANNELS], unit: 'uV', epochCount: 1, samplesPerEpoch: total, data, events };
}

/** The JSON upload body of a signal (numbers rounded to 0.001 µV to keep files small). */
export function toUploadJson(signal: Signal): Record<string, unknown> {
  const round = (v: number) => Math.round(v * 1000) / 1000;
  const rows = (e: number) =>
    signal.channels.map((_, c) => Array.from(signal.data.subarray((e * signal.channels.length + c) * signal.samplesPerEpoch, (e * signal.channels.length + c + 1) * signal.samplesPerEpoch), round));
  const body: Record<string, unknown> = { samplingRate: signal.samplingRate, channels: signal.channels, unit: signal.unit };
  if (signal.epochCount === 1) body.data = rows(0);
  else body.epochs = Array.from({ length: signal.epochCount }, (_, e) => rows(e));
  if (signal.events) body.events = signal.events;
  return body;
}
