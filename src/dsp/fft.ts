/**
 * Discrete Fourier transform plans for any length n ≥ 1.
 *
 * Convention (as numpy.fft): X_k = Σ_j x_j·e^{−2πi·jk/n}; the inverse is unscaled.
 *
 * Lengths whose prime factors are all ≤ MAX_DIRECT_RADIX (61) run a mixed-radix Stockham
 * transform (radix 8, 4, 2, 3, 5 and a generic odd radix), which needs no bit reversal and keeps the
 * output in natural order. Other lengths use Bluestein's chirp-z algorithm on a power-of-two
 * (or 2^a·3^b·5^c) Stockham transform. Twiddles are precomputed per stage from exact integer angles.
 *
 * References: J. W. Cooley & J. W. Tukey (1965), Math. Comp. 19:297–301; T. G. Stockham (1966)
 * AFIPS 28:229–233 (autosort formulation); L. I. Bluestein (1970), IEEE Trans. Audio Electroacoust.
 * 18(4):451–455. (From memory; common practice.)
 */

export interface RealFftPlan {
  readonly size: number;
  /** X_k = Σ_j x_j·e^{−2πi·jk/n} for k = 0..floor(n/2). `input.length` may be ≤ n (implicit zero padding). */
  forward(input: Float64Array, re: Float64Array, im: Float64Array): void;
}

export interface ComplexFftPlan {
  readonly size: number;
  /** In place. `inverse` uses e^{+2πi·jk/n} and is unscaled (the caller divides by n). */
  transform(re: Float64Array, im: Float64Array, inverse?: boolean): void;
}

/** Prime factors up to this size are done as direct butterflies; larger ones go through Bluestein. */
const MAX_DIRECT_RADIX = 61;

function checkSize(size: number): void {
  if (!Number.isInteger(size) || size < 1) {
    throw new RangeError(`size must be an integer ≥ 1, got ${size}`);
  }
}

function checkBuffers(re: Float64Array, im: Float64Array, length: number, what: string): void {
  if (re.length < length || im.length < length) {
    throw new RangeError(`${what} re and im need at least ${length} elements, got ${re.length} and ${im.length}`);
  }
}

/**
 * Radices in the order the stages run: 8s (with 4s for a leftover 2², or 4·4 for 8·2, since radix 4
 * beats radix 2), then odd primes ascending.
 */
function factorize(n: number): number[] {
  const radices: number[] = [];
  let rest = n;
  let twos = 0;
  while (rest % 2 === 0) { twos++; rest /= 2; }
  const eights = Math.floor(twos / 3);
  const left = twos % 3;
  if (left === 1 && eights > 0) {
    for (let i = 1; i < eights; i++) radices.push(8);
    radices.push(4, 4);
  } else {
    for (let i = 0; i < eights; i++) radices.push(8);
    if (left === 2) radices.push(4);
    if (left === 1) radices.push(2);
  }
  for (let p = 3; p * p <= rest; p += 2) {
    while (rest % p === 0) { radices.push(p); rest /= p; }
  }
  if (rest > 1) radices.push(rest);
  return radices;
}

/**
 * e^{−2πi·k/n} into re[at], im[at], exact at quarter turns, where Math.cos(π/2) would leave 6e-17
 * and spoil the exact zeros that real input should give.
 */
function unitRoot(k: number, n: number, re: Float64Array, im: Float64Array, at: number): void {
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

interface Stage {
  readonly radix: number;
  /** number of interleaved sub-transforms handled together (the Stockham stride) */
  readonly stride: number;
  /** butterflies per sub-transform: current length / radix */
  readonly span: number;
  /** ω_L^{j·t} for j < span, t = 1..radix−1, at index j·(radix−1) + t − 1, L = current length */
  readonly twiddleRe: Float64Array;
  readonly twiddleIm: Float64Array;
  /** generic radix only: cos and −sin of 2πu/radix, u < radix */
  readonly rootRe?: Float64Array;
  readonly rootIm?: Float64Array;
}

function makeStages(n: number, radices: readonly number[]): Stage[] {
  const stages: Stage[] = [];
  let stride = 1;
  for (const radix of radices) {
    const length = n / stride;
    const span = length / radix;
    const twiddleRe = new Float64Array(span * (radix - 1));
    const twiddleIm = new Float64Array(span * (radix - 1));
    for (let j = 0; j < span; j++) {
      for (let t = 1; t < radix; t++) unitRoot(j * t, length, twiddleRe, twiddleIm, j * (radix - 1) + t - 1);
    }
    const stage: Stage = { radix, stride, span, twiddleRe, twiddleIm };
    if (radix !== 2 && radix !== 3 && radix !== 4 && radix !== 5 && radix !== 8) {
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

// Each stage reads x and writes y (decimation in frequency, Stockham autosort):
// for sub-transform q < s and butterfly j < m, the inputs x[q + s·(j + r·m)], r < p, give outputs
// y[q + s·(p·j + t)] = ω_L^{j·t} · Σ_r x[…r…]·ω_p^{r·t}.

function radix2(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array,
  twr: Float64Array, twi: Float64Array): void {
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const wr = twr[j]!;
    const wi = twi[j]!;
    const inBase = s * j;
    const outBase = 2 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const i1 = i0 + sm;
      const ar = xr[i0]!, ai = xi[i0]!, br = xr[i1]!, bi = xi[i1]!;
      const o0 = outBase + q;
      const o1 = o0 + s;
      yr[o0] = ar + br; yi[o0] = ai + bi;
      const dr = ar - br, di = ai - bi;
      yr[o1] = dr * wr - di * wi; yi[o1] = dr * wi + di * wr;
    }
  }
}

function radix3(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array,
  twr: Float64Array, twi: Float64Array): void {
  const c = Math.sqrt(3) / 2;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const w1r = twr[2 * j]!, w1i = twi[2 * j]!, w2r = twr[2 * j + 1]!, w2i = twi[2 * j + 1]!;
    const inBase = s * j;
    const outBase = 3 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q, i1 = i0 + sm, i2 = i1 + sm;
      const a0r = xr[i0]!, a0i = xi[i0]!;
      const t1r = xr[i1]! + xr[i2]!, t1i = xi[i1]! + xi[i2]!;
      const t2r = xr[i1]! - xr[i2]!, t2i = xi[i1]! - xi[i2]!;
      const mr = a0r - 0.5 * t1r, mi = a0i - 0.5 * t1i;
      const b1r = mr + c * t2i, b1i = mi - c * t2r;
      const b2r = mr - c * t2i, b2i = mi + c * t2r;
      const o0 = outBase + q, o1 = o0 + s, o2 = o1 + s;
      yr[o0] = a0r + t1r; yi[o0] = a0i + t1i;
      yr[o1] = b1r * w1r - b1i * w1i; yi[o1] = b1r * w1i + b1i * w1r;
      yr[o2] = b2r * w2r - b2i * w2i; yi[o2] = b2r * w2i + b2i * w2r;
    }
  }
}

function radix4(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array,
  twr: Float64Array, twi: Float64Array): void {
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const w1r = twr[3 * j]!, w1i = twi[3 * j]!;
    const w2r = twr[3 * j + 1]!, w2i = twi[3 * j + 1]!;
    const w3r = twr[3 * j + 2]!, w3i = twi[3 * j + 2]!;
    const inBase = s * j;
    const outBase = 4 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q, i1 = i0 + sm, i2 = i1 + sm, i3 = i2 + sm;
      const a0r = xr[i0]!, a0i = xi[i0]!, a1r = xr[i1]!, a1i = xi[i1]!;
      const a2r = xr[i2]!, a2i = xi[i2]!, a3r = xr[i3]!, a3i = xi[i3]!;
      const t0r = a0r + a2r, t0i = a0i + a2i, t1r = a0r - a2r, t1i = a0i - a2i;
      const t2r = a1r + a3r, t2i = a1i + a3i, t3r = a1r - a3r, t3i = a1i - a3i;
      const b1r = t1r + t3i, b1i = t1i - t3r;
      const b2r = t0r - t2r, b2i = t0i - t2i;
      const b3r = t1r - t3i, b3i = t1i + t3r;
      const o0 = outBase + q, o1 = o0 + s, o2 = o1 + s, o3 = o2 + s;
      yr[o0] = t0r + t2r; yi[o0] = t0i + t2i;
      yr[o1] = b1r * w1r - b1i * w1i; yi[o1] = b1r * w1i + b1i * w1r;
      yr[o2] = b2r * w2r - b2i * w2i; yi[o2] = b2r * w2i + b2i * w2r;
      yr[o3] = b3r * w3r - b3i * w3i; yi[o3] = b3r * w3i + b3i * w3r;
    }
  }
}

function radix5(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array,
  twr: Float64Array, twi: Float64Array): void {
  const c1 = Math.cos((2 * Math.PI) / 5), c2 = Math.cos((4 * Math.PI) / 5);
  const s1 = Math.sin((2 * Math.PI) / 5), s2 = Math.sin((4 * Math.PI) / 5);
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const w1r = twr[4 * j]!, w1i = twi[4 * j]!, w2r = twr[4 * j + 1]!, w2i = twi[4 * j + 1]!;
    const w3r = twr[4 * j + 2]!, w3i = twi[4 * j + 2]!, w4r = twr[4 * j + 3]!, w4i = twi[4 * j + 3]!;
    const inBase = s * j;
    const outBase = 5 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q, i1 = i0 + sm, i2 = i1 + sm, i3 = i2 + sm, i4 = i3 + sm;
      const a0r = xr[i0]!, a0i = xi[i0]!;
      const t1r = xr[i1]! + xr[i4]!, t1i = xi[i1]! + xi[i4]!;
      const t2r = xr[i2]! + xr[i3]!, t2i = xi[i2]! + xi[i3]!;
      const t3r = xr[i1]! - xr[i4]!, t3i = xi[i1]! - xi[i4]!;
      const t4r = xr[i2]! - xr[i3]!, t4i = xi[i2]! - xi[i3]!;
      const m1r = a0r + c1 * t1r + c2 * t2r, m1i = a0i + c1 * t1i + c2 * t2i;
      const m2r = a0r + c2 * t1r + c1 * t2r, m2i = a0i + c2 * t1i + c1 * t2i;
      const n1r = s1 * t3r + s2 * t4r, n1i = s1 * t3i + s2 * t4i;
      const n2r = s2 * t3r - s1 * t4r, n2i = s2 * t3i - s1 * t4i;
      // b1 = m1 − i·n1, b4 = m1 + i·n1, b2 = m2 − i·n2, b3 = m2 + i·n2
      const b1r = m1r + n1i, b1i = m1i - n1r, b4r = m1r - n1i, b4i = m1i + n1r;
      const b2r = m2r + n2i, b2i = m2i - n2r, b3r = m2r - n2i, b3i = m2i + n2r;
      const o0 = outBase + q, o1 = o0 + s, o2 = o1 + s, o3 = o2 + s, o4 = o3 + s;
      yr[o0] = a0r + t1r + t2r; yi[o0] = a0i + t1i + t2i;
      yr[o1] = b1r * w1r - b1i * w1i; yi[o1] = b1r * w1i + b1i * w1r;
      yr[o2] = b2r * w2r - b2i * w2i; yi[o2] = b2r * w2i + b2i * w2r;
      yr[o3] = b3r * w3r - b3i * w3i; yi[o3] = b3r * w3i + b3i * w3r;
      yr[o4] = b4r * w4r - b4i * w4i; yi[o4] = b4r * w4i + b4i * w4r;
    }
  }
}

/** Radix 8 as two radix-4 butterflies on the even and odd inputs, joined by ω_8^t. */
function radix8(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array,
  twr: Float64Array, twi: Float64Array): void {
  const h = Math.SQRT1_2;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const tw = 7 * j;
    const w1r = twr[tw]!, w1i = twi[tw]!, w2r = twr[tw + 1]!, w2i = twi[tw + 1]!;
    const w3r = twr[tw + 2]!, w3i = twi[tw + 2]!, w4r = twr[tw + 3]!, w4i = twi[tw + 3]!;
    const w5r = twr[tw + 4]!, w5i = twi[tw + 4]!, w6r = twr[tw + 5]!, w6i = twi[tw + 5]!;
    const w7r = twr[tw + 6]!, w7i = twi[tw + 6]!;
    const inBase = s * j;
    const outBase = 8 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const a0r = xr[i0]!, a0i = xi[i0]!, a1r = xr[i0 + sm]!, a1i = xi[i0 + sm]!;
      const a2r = xr[i0 + 2 * sm]!, a2i = xi[i0 + 2 * sm]!, a3r = xr[i0 + 3 * sm]!, a3i = xi[i0 + 3 * sm]!;
      const a4r = xr[i0 + 4 * sm]!, a4i = xi[i0 + 4 * sm]!, a5r = xr[i0 + 5 * sm]!, a5i = xi[i0 + 5 * sm]!;
      const a6r = xr[i0 + 6 * sm]!, a6i = xi[i0 + 6 * sm]!, a7r = xr[i0 + 7 * sm]!, a7i = xi[i0 + 7 * sm]!;
      // E = DFT4(a0, a2, a4, a6)
      const p0r = a0r + a4r, p0i = a0i + a4i, p1r = a0r - a4r, p1i = a0i - a4i;
      const p2r = a2r + a6r, p2i = a2i + a6i, p3r = a2r - a6r, p3i = a2i - a6i;
      const e0r = p0r + p2r, e0i = p0i + p2i, e2r = p0r - p2r, e2i = p0i - p2i;
      const e1r = p1r + p3i, e1i = p1i - p3r, e3r = p1r - p3i, e3i = p1i + p3r;
      // O = DFT4(a1, a3, a5, a7)
      const q0r = a1r + a5r, q0i = a1i + a5i, q1r = a1r - a5r, q1i = a1i - a5i;
      const q2r = a3r + a7r, q2i = a3i + a7i, q3r = a3r - a7r, q3i = a3i - a7i;
      const o0r = q0r + q2r, o0i = q0i + q2i, o2r = q0r - q2r, o2i = q0i - q2i;
      const o1r = q1r + q3i, o1i = q1i - q3r, o3r = q1r - q3i, o3i = q1i + q3r;
      // ω_8·O1 = (1 − i)/√2·O1, ω_8²·O2 = −i·O2, ω_8³·O3 = −(1 + i)/√2·O3
      const r1r = h * (o1r + o1i), r1i = h * (o1i - o1r);
      const r2r = o2i, r2i = -o2r;
      const r3r = h * (o3i - o3r), r3i = -h * (o3r + o3i);
      const b1r = e1r + r1r, b1i = e1i + r1i, b5r = e1r - r1r, b5i = e1i - r1i;
      const b2r = e2r + r2r, b2i = e2i + r2i, b6r = e2r - r2r, b6i = e2i - r2i;
      const b3r = e3r + r3r, b3i = e3i + r3i, b7r = e3r - r3r, b7i = e3i - r3i;
      const b4r = e0r - o0r, b4i = e0i - o0i;
      const o = outBase + q;
      yr[o] = e0r + o0r; yi[o] = e0i + o0i;
      yr[o + s] = b1r * w1r - b1i * w1i; yi[o + s] = b1r * w1i + b1i * w1r;
      yr[o + 2 * s] = b2r * w2r - b2i * w2i; yi[o + 2 * s] = b2r * w2i + b2i * w2r;
      yr[o + 3 * s] = b3r * w3r - b3i * w3i; yi[o + 3 * s] = b3r * w3i + b3i * w3r;
      yr[o + 4 * s] = b4r * w4r - b4i * w4i; yi[o + 4 * s] = b4r * w4i + b4i * w4r;
      yr[o + 5 * s] = b5r * w5r - b5i * w5i; yi[o + 5 * s] = b5r * w5i + b5i * w5r;
      yr[o + 6 * s] = b6r * w6r - b6i * w6i; yi[o + 6 * s] = b6r * w6i + b6i * w6r;
      yr[o + 7 * s] = b7r * w7r - b7i * w7i; yi[o + 7 * s] = b7r * w7i + b7i * w7r;
    }
  }
}

/** Any odd radix p: pairs r and p−r share a cosine and a sine, halving the multiplications. */
function radixOdd(p: number, s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array,
  yi: Float64Array, twr: Float64Array, twi: Float64Array, rootRe: Float64Array, rootIm: Float64Array,
  sumRe: Float64Array, sumIm: Float64Array, diffRe: Float64Array, diffIm: Float64Array): void {
  const half = (p - 1) >> 1;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const inBase = s * j;
    const outBase = p * s * j;
    const twBase = (p - 1) * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const a0r = xr[i0]!, a0i = xi[i0]!;
      let dcr = a0r, dci = a0i;
      for (let r = 1; r <= half; r++) {
        const ia = i0 + r * sm, ib = i0 + (p - r) * sm;
        const ur = xr[ia]!, ui = xi[ia]!, vr = xr[ib]!, vi = xi[ib]!;
        sumRe[r] = ur + vr; sumIm[r] = ui + vi;
        diffRe[r] = ur - vr; diffIm[r] = ui - vi;
        dcr += ur + vr; dci += ui + vi;
      }
      const o0 = outBase + q;
      yr[o0] = dcr; yi[o0] = dci;
      for (let t = 1; t <= half; t++) {
        let mr = a0r, mi = a0i, nr = 0, ni = 0;
        for (let r = 1; r <= half; r++) {
          const u = (r * t) % p;
          const cr = rootRe[u]!, si = -rootIm[u]!;
          mr += cr * sumRe[r]!; mi += cr * sumIm[r]!;
          nr += si * diffRe[r]!; ni += si * diffIm[r]!;
        }
        // b_t = m − i·n, b_{p−t} = m + i·n
        const btr = mr + ni, bti = mi - nr, bur = mr - ni, bui = mi + nr;
        const wtr = twr[twBase + t - 1]!, wti = twi[twBase + t - 1]!;
        const wur = twr[twBase + p - t - 1]!, wui = twi[twBase + p - t - 1]!;
        const ot = o0 + t * s, ou = o0 + (p - t) * s;
        yr[ot] = btr * wtr - bti * wti; yi[ot] = btr * wti + bti * wtr;
        yr[ou] = bur * wur - bui * wui; yi[ou] = bur * wui + bui * wur;
      }
    }
  }
}

/** Mixed-radix Stockham transform for lengths whose prime factors are all ≤ MAX_DIRECT_RADIX. */
class MixedRadixPlan implements ComplexFftPlan {
  readonly size: number;
  private readonly stages: Stage[];
  private readonly scratchRe: Float64Array;
  private readonly scratchIm: Float64Array;
  private readonly sumRe: Float64Array;
  private readonly sumIm: Float64Array;
  private readonly diffRe: Float64Array;
  private readonly diffIm: Float64Array;

  constructor(size: number, radices: readonly number[]) {
    this.size = size;
    this.stages = makeStages(size, radices);
    this.scratchRe = new Float64Array(size);
    this.scratchIm = new Float64Array(size);
    const largest = Math.max(1, ...radices);
    this.sumRe = new Float64Array(largest);
    this.sumIm = new Float64Array(largest);
    this.diffRe = new Float64Array(largest);
    this.diffIm = new Float64Array(largest);
  }

  transform(re: Float64Array, im: Float64Array, inverse = false): void {
    checkBuffers(re, im, this.size, 'transform:');
    // ifft(x) = swap(fft(swap(x))), swap exchanging real and imaginary parts: one kernel serves both
    // directions, and swapping costs nothing when the kernel is handed the arrays the other way round.
    if (inverse) this.forwardInPlace(im, re);
    else this.forwardInPlace(re, im);
  }

  private forwardInPlace(re: Float64Array, im: Float64Array): void {
    let xr = re, xi = im, yr = this.scratchRe, yi = this.scratchIm;
    for (const stage of this.stages) {
      const { radix, stride, span, twiddleRe, twiddleIm } = stage;
      switch (radix) {
        case 8: radix8(stride, span, xr, xi, yr, yi, twiddleRe, twiddleIm); break;
        case 4: radix4(stride, span, xr, xi, yr, yi, twiddleRe, twiddleIm); break;
        case 2: radix2(stride, span, xr, xi, yr, yi, twiddleRe, twiddleIm); break;
        case 3: radix3(stride, span, xr, xi, yr, yi, twiddleRe, twiddleIm); break;
        case 5: radix5(stride, span, xr, xi, yr, yi, twiddleRe, twiddleIm); break;
        default:
          radixOdd(radix, stride, span, xr, xi, yr, yi, twiddleRe, twiddleIm, stage.rootRe!, stage.rootIm!,
            this.sumRe, this.sumIm, this.diffRe, this.diffIm);
      }
      const tr = xr, ti = xi;
      xr = yr; xi = yi; yr = tr; yi = ti;
    }
    if (xr !== re) {
      re.set(xr.subarray(0, this.size));
      im.set(xi.subarray(0, this.size));
    }
  }
}

/**
 * Convolution length for Bluestein: the power of two ≥ n, unless a 2^a·3^b·5^c length is enough
 * shorter to pay for its slower radix-3/5 stages (measured about 1.4× the cost per point here).
 */
function convolutionLength(n: number): number {
  let pow2 = 1;
  while (pow2 < n) pow2 *= 2;
  let smooth = pow2;
  for (let p5 = 1; p5 < pow2; p5 *= 5) {
    for (let p35 = p5; p35 < pow2; p35 *= 3) {
      let m = p35;
      while (m < n) m *= 2;
      if (m < smooth) smooth = m;
    }
  }
  return smooth * 1.4 < pow2 ? smooth : pow2;
}

/** Bluestein's chirp-z algorithm: a length-n DFT as a circular convolution of a fast length. */
class BluesteinPlan implements ComplexFftPlan {
  readonly size: number;
  private readonly inner: ComplexFftPlan;
  private readonly chirpRe: Float64Array;
  private readonly chirpIm: Float64Array;
  private readonly kernelRe: Float64Array;
  private readonly kernelIm: Float64Array;
  private readonly workRe: Float64Array;
  private readonly workIm: Float64Array;

  constructor(size: number) {
    this.size = size;
    const m = convolutionLength(2 * size - 1);
    this.inner = complexFftPlan(m);
    this.chirpRe = new Float64Array(size);
    this.chirpIm = new Float64Array(size);
    for (let k = 0; k < size; k++) {
      // k² mod 2n keeps the angle exact for large k.
      const angle = (Math.PI * ((k * k) % (2 * size))) / size;
      this.chirpRe[k] = Math.cos(angle);
      this.chirpIm[k] = -Math.sin(angle);
    }
    this.kernelRe = new Float64Array(m);
    this.kernelIm = new Float64Array(m);
    for (let k = 0; k < size; k++) {
      const cr = this.chirpRe[k]!;
      const ci = -this.chirpIm[k]!;
      this.kernelRe[k] = cr; this.kernelIm[k] = ci;
      if (k > 0) { this.kernelRe[m - k] = cr; this.kernelIm[m - k] = ci; }
    }
    this.inner.transform(this.kernelRe, this.kernelIm);
    // Fold the 1/m of the inverse transform into the kernel.
    for (let k = 0; k < m; k++) { this.kernelRe[k] = this.kernelRe[k]! / m; this.kernelIm[k] = this.kernelIm[k]! / m; }
    this.workRe = new Float64Array(m);
    this.workIm = new Float64Array(m);
  }

  transform(re: Float64Array, im: Float64Array, inverse = false): void {
    const n = this.size;
    checkBuffers(re, im, n, 'transform:');
    if (inverse) this.forward(im, re);
    else this.forward(re, im);
  }

  /** In place, forward; the inverse hands the arrays over swapped (see MixedRadixPlan.transform). */
  private forward(re: Float64Array, im: Float64Array): void {
    const n = this.size;
    const m = this.inner.size;
    const wr = this.workRe, wi = this.workIm;
    for (let k = 0; k < n; k++) {
      const cr = this.chirpRe[k]!, ci = this.chirpIm[k]!;
      const xr = re[k]!, xi = im[k]!;
      wr[k] = xr * cr - xi * ci;
      wi[k] = xr * ci + xi * cr;
    }
    wr.fill(0, n, m);
    wi.fill(0, n, m);
    this.inner.transform(wr, wi);
    for (let k = 0; k < m; k++) {
      const kr = this.kernelRe[k]!, ki = this.kernelIm[k]!;
      const xr = wr[k]!, xi = wi[k]!;
      // multiply and conjugate, so the next forward transform acts as an inverse one
      wr[k] = xr * kr - xi * ki;
      wi[k] = -(xr * ki + xi * kr);
    }
    this.inner.transform(wr, wi);
    for (let k = 0; k < n; k++) {
      const cr = this.chirpRe[k]!, ci = this.chirpIm[k]!;
      const xr = wr[k]!, xi = -wi[k]!;
      re[k] = xr * cr - xi * ci;
      im[k] = xr * ci + xi * cr;
    }
  }
}

/**
 * Real input of even length n through one complex transform of length n/2 on the packed
 * sequence z_j = x_{2j} + i·x_{2j+1}, then a split into even and odd halves
 * (common practice; e.g. Press et al., Numerical Recipes, §12.3, from memory).
 */
class EvenRealPlan implements RealFftPlan {
  readonly size: number;
  private readonly half: ComplexFftPlan;
  private readonly packRe: Float64Array;
  private readonly packIm: Float64Array;
  private readonly rotRe: Float64Array;
  private readonly rotIm: Float64Array;

  constructor(size: number) {
    this.size = size;
    const h = size / 2;
    this.half = complexFftPlan(h);
    this.packRe = new Float64Array(h);
    this.packIm = new Float64Array(h);
    this.rotRe = new Float64Array(h + 1);
    this.rotIm = new Float64Array(h + 1);
    for (let k = 0; k <= h; k++) unitRoot(k, size, this.rotRe, this.rotIm, k);
  }

  forward(input: Float64Array, re: Float64Array, im: Float64Array): void {
    const n = this.size;
    const h = n / 2;
    checkInput(input, n);
    checkBuffers(re, im, h + 1, 'forward:');
    const pr = this.packRe, pi = this.packIm;
    const len = input.length;
    for (let j = 0; j < h; j++) {
      const e = 2 * j;
      pr[j] = e < len ? input[e]! : 0;
      pi[j] = e + 1 < len ? input[e + 1]! : 0;
    }
    this.half.transform(pr, pi);
    for (let k = 0; k <= h; k++) {
      const a = k === h ? 0 : k;
      const b = k === 0 ? 0 : h - k;
      const zr = pr[a]!, zi = pi[a]!, yr = pr[b]!, yi = pi[b]!;
      // E = (Z_k + conj Z_{h−k})/2, O = (Z_k − conj Z_{h−k})/(2i), X_k = E + ω_n^k·O
      const er = 0.5 * (zr + yr), ei = 0.5 * (zi - yi);
      const or = 0.5 * (zi + yi), oi = -0.5 * (zr - yr);
      const wr = this.rotRe[k]!, wi = this.rotIm[k]!;
      re[k] = er + wr * or - wi * oi;
      im[k] = ei + wr * oi + wi * or;
    }
    // exact for real input; rounding would otherwise leave ±1e-16 here
    im[0] = 0;
    im[h] = 0;
  }
}

/** Odd lengths: a complex transform with zero imaginary part (no split exists). */
class OddRealPlan implements RealFftPlan {
  readonly size: number;
  private readonly full: ComplexFftPlan;
  private readonly bufRe: Float64Array;
  private readonly bufIm: Float64Array;

  constructor(size: number) {
    this.size = size;
    this.full = complexFftPlan(size);
    this.bufRe = new Float64Array(size);
    this.bufIm = new Float64Array(size);
  }

  forward(input: Float64Array, re: Float64Array, im: Float64Array): void {
    const n = this.size;
    checkInput(input, n);
    const bins = (n >> 1) + 1;
    checkBuffers(re, im, bins, 'forward:');
    this.bufRe.set(input);
    this.bufRe.fill(0, input.length);
    this.bufIm.fill(0);
    this.full.transform(this.bufRe, this.bufIm);
    re.set(this.bufRe.subarray(0, bins));
    im.set(this.bufIm.subarray(0, bins));
    im[0] = 0; // exact for real input
  }
}

function checkInput(input: Float64Array, n: number): void {
  if (input.length > n) throw new RangeError(`input length ${input.length} exceeds the plan size ${n}`);
}

// Bounded, oldest first out: sizes come from user recipes, and an evicted plan stays valid for
// whoever still holds it.
const PLAN_CACHE_LIMIT = 64;
const complexPlans = new Map<number, ComplexFftPlan>();
const realPlans = new Map<number, RealFftPlan>();

function remember<P>(cache: Map<number, P>, size: number, plan: P): P {
  if (cache.size >= PLAN_CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  cache.set(size, plan);
  return plan;
}

/**
 * A cached in-place complex DFT plan.
 *
 * @param size - transform length n, any integer ≥ 1
 * @returns the plan for `size`, shared by every caller in this thread (its scratch buffers are
 *   internal, so calls must not interleave, which single-threaded JavaScript guarantees); the cache
 *   keeps the 64 most recently created sizes
 * @throws RangeError when `size` is not an integer ≥ 1
 */
export function complexFftPlan(size: number): ComplexFftPlan {
  checkSize(size);
  let plan = complexPlans.get(size);
  if (plan === undefined) {
    const radices = factorize(size);
    const largest = radices.length === 0 ? 1 : radices[radices.length - 1]!;
    plan = remember(complexPlans, size, largest <= MAX_DIRECT_RADIX ? new MixedRadixPlan(size, radices) : new BluesteinPlan(size));
  }
  return plan;
}

/**
 * A cached real-input DFT plan returning bins 0..floor(n/2).
 *
 * @param size - transform length n, any integer ≥ 1
 * @throws RangeError when `size` is not an integer ≥ 1
 */
export function realFftPlan(size: number): RealFftPlan {
  checkSize(size);
  let plan = realPlans.get(size);
  if (plan === undefined) {
    plan = remember(realPlans, size, size % 2 === 0 ? new EvenRealPlan(size) : new OddRealPlan(size));
  }
  return plan;
}
