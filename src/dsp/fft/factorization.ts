/** Factorization of a length into radices, and the twiddle factors of each Stockham stage. */

/**
 * Radices for 2^twos: 2, 4 and 8·4 for twos = 1, 2 and 5; otherwise a 16 or two first when twos is not a
 * multiple of 3, then 8s (see factorize).
 */
export function powerOfTwoRadices(twos: number): number[] {
  if (twos === 0) return [];
  if (twos === 1) return [2];
  if (twos === 2) return [4];
  if (twos === 5) return [8, 4];
  const radices: number[] = [];
  if (twos % 3 === 1) {
    radices.push(16);
    twos -= 4;
  }
  if (twos % 3 === 2) {
    radices.push(16, 16);
    twos -= 8;
  }
  for (; twos >= 3; twos -= 3) radices.push(8);
  return radices;
}

/**
 * Radices in the order the stages run: for 2^a (a ∉ {1, 2, 5}, which get 2, 4 and 8·4) a 16 or two first
 * when a is not a multiple of 3, then 8s
 * (radix 8 costs least per factor of two, about 0.65 ns per point here against 0.77 for 16, 0.8–1.2 for 4
 * and 1.9 for 2; a 16 costs no more than an 8 as the first stage, whose twiddles change every
 * butterfly), then a 9 for each 3·3, then a lone 3 joined with a 4 of 2^a as one radix-12 stage when
 * that saves a stage (e.g. 12 = 12, 96 = 8·12, 1536 = 16·8·12 rather than 8·8·8·3, 108 = 9·12), then the
 * other odd primes ascending.
 */
export function factorize(n: number): number[] {
  let rest = n;
  let twos = 0;
  while (rest % 2 === 0) {
    twos++;
    rest /= 2;
  }
  let nines = 0;
  // 9 = 3·3 as one radix-9 stage: one pass over the data for two factors of three
  while (rest % 9 === 0) {
    nines++;
    rest /= 9;
  }
  const twelve = rest % 3 === 0 && twos >= 2 && powerOfTwoRadices(twos - 2).length < powerOfTwoRadices(twos).length;
  if (twelve) {
    twos -= 2;
    rest /= 3;
  }
  const radices = powerOfTwoRadices(twos);
  for (let k = 0; k < nines; k++) radices.push(9);
  if (twelve) radices.push(12);
  for (let p = 3; p * p <= rest; p += 2) {
    while (rest % p === 0) {
      radices.push(p);
      rest /= p;
    }
  }
  if (rest > 1) radices.push(rest);
  return radices;
}

/**
 * e^{−2πi·k/n} into re[at], im[at], exact at quarter turns, where Math.cos(π/2) would leave 6e-17
 * and spoil the exact zeros that real input should give.
 */
export function unitRoot(k: number, n: number, re: Float64Array, im: Float64Array, at: number): void {
  const r = k % n;
  if ((4 * r) % n === 0) {
    const quarter = (4 * r) / n;
    re[at] = quarter === 0 ? 1 : quarter === 2 ? -1 : 0;
    im[at] = quarter === 1 ? -1 : quarter === 3 ? 1 : 0;
    return;
  }
  const angle = (-2 * Math.PI * r) / n;
  re[at] = Math.cos(angle);
  im[at] = Math.sin(angle);
}

export interface Stage {
  readonly radix: number;
  /** number of interleaved sub-transforms handled together (the Stockham stride) */
  readonly stride: number;
  /** butterflies per sub-transform: current length / radix */
  readonly span: number;
  /** ω_L^{j·t} for j < span, t = 1..radix−1, as (re, im) at 2·(j·(radix−1) + t − 1), L = current length */
  readonly twiddles: Float64Array;
  /** generic radix only: cos and −sin of 2πu/radix, u < radix */
  readonly rootRe?: Float64Array;
  readonly rootIm?: Float64Array;
}

/** Radices with a written-out butterfly; other odd primes go through radixOdd. */
export const DIRECT_RADICES = new Set([2, 3, 4, 5, 8, 9, 12, 16]);

export function makeStages(n: number, radices: readonly number[]): Stage[] {
  const stages: Stage[] = [];
  let stride = 1;
  for (const radix of radices) {
    const length = n / stride;
    const span = length / radix;
    const twiddles = new Float64Array(2 * span * (radix - 1));
    // interleaved, so that a butterfly reads one array: re at even, im at odd indices
    const im = twiddles.subarray(1);
    for (let j = 0; j < span; j++) {
      for (let t = 1; t < radix; t++) unitRoot(j * t, length, twiddles, im, 2 * (j * (radix - 1) + t - 1));
    }
    const stage: Stage = { radix, stride, span, twiddles };
    if (!DIRECT_RADICES.has(radix)) {
      const rootRe = new Float64Array(radix);
      const rootIm = new Float64Array(radix);
      for (let u = 0; u < radix; u++) {
        rootRe[u] = Math.cos((2 * Math.PI * u) / radix);
        rootIm[u] = -Math.sin((2 * Math.PI * u) / radix);
      }
      stages.push({ ...stage, rootRe, rootIm });
    } else {
      stages.push(stage);
    }
    stride *= radix;
  }
  return stages;
}
