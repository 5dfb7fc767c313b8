/** The written-out butterflies of the Stockham stages (radix 2, 3, 4, 5, 8, 9, 12, 16) and the generic odd radix. */
import { unitRoot } from './factorization.js';
// Each stage reads x and writes y (decimation in frequency, Stockham autosort):
// for sub-transform q < s and butterfly j < m, the inputs x[q + s·(j + r·m)], r < p, give outputs
// y[q + s·(p·j + t)] = ω_L^{j·t} · Σ_r x[…r…]·ω_p^{r·t}.
// rows: each butterfly computes and stores its outputs t < rows, and may do more: the written-out
// ones skip whole groups of upper outputs (t ≥ 4 of radix 8, t ≥ 8 of 16 and 12, …), one branch
// each, since a branch per output slowed full transforms by up to 10%. Only the last stage (m = 1,
// whose output q + s·t is final) runs with rows < p, for a caller who needs a prefix of the outputs.

export function radix2(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tw: Float64Array, rows: number): void {
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const t = 2 * j;
    const w1r = tw[t]!,
      w1i = tw[t + 1]!;
    const inBase = s * j;
    const outBase = 2 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const i1 = (i0 + sm) | 0;
      const a0r = xr[i0]!,
        a0i = xi[i0]!,
        a1r = xr[i1]!,
        a1i = xi[i1]!;
      const o0 = outBase + q;
      const o1 = (o0 + s) | 0;
      yr[o0] = a0r + a1r;
      yi[o0] = a0i + a1i;
      if (rows > 1) {
        const x1r = a0r - a1r,
          x1i = a0i - a1i;
        yr[o1] = x1r * w1r - x1i * w1i;
        yi[o1] = x1r * w1i + x1i * w1r;
      }
    }
  }
}

export function radix3(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tw: Float64Array, rows: number): void {
  const c = Math.sqrt(3) / 2;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const t = 4 * j;
    const w1r = tw[t]!,
      w1i = tw[t + 1]!,
      w2r = tw[t + 2]!,
      w2i = tw[t + 3]!;
    const inBase = s * j;
    const outBase = 3 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const i1 = (i0 + sm) | 0,
        i2 = (i1 + sm) | 0;
      const a0r = xr[i0]!,
        a0i = xi[i0]!,
        a1r = xr[i1]!,
        a1i = xi[i1]!,
        a2r = xr[i2]!,
        a2i = xi[i2]!;
      const t1r = a1r + a2r,
        t1i = a1i + a2i,
        t2r = a1r - a2r,
        t2i = a1i - a2i;
      const mr = a0r - 0.5 * t1r,
        mi = a0i - 0.5 * t1i;
      const o0 = outBase + q;
      const o1 = (o0 + s) | 0,
        o2 = (o1 + s) | 0;
      yr[o0] = a0r + t1r;
      yi[o0] = a0i + t1i;
      const x1r = mr + c * t2i,
        x1i = mi - c * t2r;
      yr[o1] = x1r * w1r - x1i * w1i;
      yi[o1] = x1r * w1i + x1i * w1r;
      if (rows > 2) {
        const x2r = mr - c * t2i,
          x2i = mi + c * t2r;
        yr[o2] = x2r * w2r - x2i * w2i;
        yi[o2] = x2r * w2i + x2i * w2r;
      }
    }
  }
}

export function radix4(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tw: Float64Array, rows: number): void {
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const t = 6 * j;
    const w1r = tw[t]!,
      w1i = tw[t + 1]!,
      w2r = tw[t + 2]!,
      w2i = tw[t + 3]!,
      w3r = tw[t + 4]!,
      w3i = tw[t + 5]!;
    const inBase = s * j;
    const outBase = 4 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const i1 = (i0 + sm) | 0,
        i2 = (i1 + sm) | 0,
        i3 = (i2 + sm) | 0;
      const a0r = xr[i0]!,
        a0i = xi[i0]!,
        a1r = xr[i1]!,
        a1i = xi[i1]!,
        a2r = xr[i2]!,
        a2i = xi[i2]!,
        a3r = xr[i3]!,
        a3i = xi[i3]!;
      const t0r = a0r + a2r,
        t0i = a0i + a2i,
        t1r = a0r - a2r,
        t1i = a0i - a2i;
      const t2r = a1r + a3r,
        t2i = a1i + a3i,
        t3r = a1r - a3r,
        t3i = a1i - a3i;
      const o0 = outBase + q;
      const o1 = (o0 + s) | 0,
        o2 = (o1 + s) | 0,
        o3 = (o2 + s) | 0;
      yr[o0] = t0r + t2r;
      yi[o0] = t0i + t2i;
      const x1r = t1r + t3i,
        x1i = t1i - t3r;
      yr[o1] = x1r * w1r - x1i * w1i;
      yi[o1] = x1r * w1i + x1i * w1r;
      if (rows > 2) {
        const x2r = t0r - t2r,
          x2i = t0i - t2i;
        yr[o2] = x2r * w2r - x2i * w2i;
        yi[o2] = x2r * w2i + x2i * w2r;
        const x3r = t1r - t3i,
          x3i = t1i + t3r;
        yr[o3] = x3r * w3r - x3i * w3i;
        yi[o3] = x3r * w3i + x3i * w3r;
      }
    }
  }
}

export function radix5(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tw: Float64Array, rows: number): void {
  const c1 = Math.cos((2 * Math.PI) / 5),
    c2 = Math.cos((4 * Math.PI) / 5);
  const s1 = Math.sin((2 * Math.PI) / 5),
    s2 = Math.sin((4 * Math.PI) / 5);
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const t = 8 * j;
    const w1r = tw[t]!,
      w1i = tw[t + 1]!,
      w2r = tw[t + 2]!,
      w2i = tw[t + 3]!,
      w3r = tw[t + 4]!,
      w3i = tw[t + 5]!,
      w4r = tw[t + 6]!,
      w4i = tw[t + 7]!;
    const inBase = s * j;
    const outBase = 5 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const i1 = (i0 + sm) | 0,
        i2 = (i1 + sm) | 0,
        i3 = (i2 + sm) | 0,
        i4 = (i3 + sm) | 0;
      const a0r = xr[i0]!,
        a0i = xi[i0]!,
        a1r = xr[i1]!,
        a1i = xi[i1]!,
        a2r = xr[i2]!,
        a2i = xi[i2]!,
        a3r = xr[i3]!,
        a3i = xi[i3]!;
      const a4r = xr[i4]!,
        a4i = xi[i4]!;
      const t1r = a1r + a4r,
        t1i = a1i + a4i,
        t2r = a2r + a3r,
        t2i = a2i + a3i;
      const t3r = a1r - a4r,
        t3i = a1i - a4i,
        t4r = a2r - a3r,
        t4i = a2i - a3i;
      const m1r = a0r + c1 * t1r + c2 * t2r,
        m1i = a0i + c1 * t1i + c2 * t2i;
      const m2r = a0r + c2 * t1r + c1 * t2r,
        m2i = a0i + c2 * t1i + c1 * t2i;
      const n1r = s1 * t3r + s2 * t4r,
        n1i = s1 * t3i + s2 * t4i;
      const n2r = s2 * t3r - s1 * t4r,
        n2i = s2 * t3i - s1 * t4i;
      // X1 = m1 − i·n1, X4 = m1 + i·n1, X2 = m2 − i·n2, X3 = m2 + i·n2
      const o0 = outBase + q;
      const o1 = (o0 + s) | 0,
        o2 = (o1 + s) | 0,
        o3 = (o2 + s) | 0,
        o4 = (o3 + s) | 0;
      yr[o0] = a0r + t1r + t2r;
      yi[o0] = a0i + t1i + t2i;
      const x1r = m1r + n1i,
        x1i = m1i - n1r;
      yr[o1] = x1r * w1r - x1i * w1i;
      yi[o1] = x1r * w1i + x1i * w1r;
      const x2r = m2r + n2i,
        x2i = m2i - n2r;
      yr[o2] = x2r * w2r - x2i * w2i;
      yi[o2] = x2r * w2i + x2i * w2r;
      if (rows > 3) {
        const x3r = m2r - n2i,
          x3i = m2i + n2r;
        yr[o3] = x3r * w3r - x3i * w3i;
        yi[o3] = x3r * w3i + x3i * w3r;
      }
      if (rows > 4) {
        const x4r = m1r - n1i,
          x4i = m1i + n1r;
        yr[o4] = x4r * w4r - x4i * w4i;
        yi[o4] = x4r * w4i + x4i * w4r;
      }
    }
  }
}

/** ω_9^1, ω_9^2, ω_9^4 as (re, im) pairs: the inner twiddles of radix 9 */
const ROOTS9 = new Float64Array(6);
unitRoot(1, 9, ROOTS9, ROOTS9.subarray(1), 0);
unitRoot(2, 9, ROOTS9, ROOTS9.subarray(1), 2);
unitRoot(4, 9, ROOTS9, ROOTS9.subarray(1), 4);

/**
 * Radix 9 as 3 × 3: DFT3s over a_{r+3k}, k < 3, for each r < 3, inner twiddles ω_9^{r·t}, then DFT3s
 * across r (X_{t + 3·t2}); one pass over the data where two radix-3 stages would make two.
 */
export function radix9(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tw: Float64Array, rows: number): void {
  const c = Math.sqrt(3) / 2;
  const k1r = ROOTS9[0]!,
    k1i = ROOTS9[1]!,
    k2r = ROOTS9[2]!,
    k2i = ROOTS9[3]!,
    k4r = ROOTS9[4]!,
    k4i = ROOTS9[5]!;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const t = 16 * j;
    const w1r = tw[t]!,
      w1i = tw[t + 1]!,
      w2r = tw[t + 2]!,
      w2i = tw[t + 3]!,
      w3r = tw[t + 4]!,
      w3i = tw[t + 5]!,
      w4r = tw[t + 6]!,
      w4i = tw[t + 7]!;
    const w5r = tw[t + 8]!,
      w5i = tw[t + 9]!,
      w6r = tw[t + 10]!,
      w6i = tw[t + 11]!,
      w7r = tw[t + 12]!,
      w7i = tw[t + 13]!,
      w8r = tw[t + 14]!,
      w8i = tw[t + 15]!;
    const inBase = s * j;
    const outBase = 9 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const i1 = (i0 + sm) | 0,
        i2 = (i1 + sm) | 0,
        i3 = (i2 + sm) | 0,
        i4 = (i3 + sm) | 0,
        i5 = (i4 + sm) | 0,
        i6 = (i5 + sm) | 0,
        i7 = (i6 + sm) | 0,
        i8 = (i7 + sm) | 0;
      const a0r = xr[i0]!,
        a0i = xi[i0]!,
        a1r = xr[i1]!,
        a1i = xi[i1]!,
        a2r = xr[i2]!,
        a2i = xi[i2]!,
        a3r = xr[i3]!,
        a3i = xi[i3]!;
      const a4r = xr[i4]!,
        a4i = xi[i4]!,
        a5r = xr[i5]!,
        a5i = xi[i5]!,
        a6r = xr[i6]!,
        a6i = xi[i6]!,
        a7r = xr[i7]!,
        a7i = xi[i7]!;
      const a8r = xr[i8]!,
        a8i = xi[i8]!;
      // b_0t = DFT3(a0, a3, a6)[t]
      const u0r = a3r + a6r,
        u0i = a3i + a6i,
        d0r = a3r - a6r,
        d0i = a3i - a6i;
      const m0r = a0r - 0.5 * u0r,
        m0i = a0i - 0.5 * u0i;
      const b00r = a0r + u0r,
        b00i = a0i + u0i;
      const b01r = m0r + c * d0i,
        b01i = m0i - c * d0r,
        b02r = m0r - c * d0i,
        b02i = m0i + c * d0r;
      // b_1t = DFT3(a1, a4, a7)[t], c_1t = ω_9^t·b_1t
      const u1r = a4r + a7r,
        u1i = a4i + a7i,
        d1r = a4r - a7r,
        d1i = a4i - a7i;
      const m1r = a1r - 0.5 * u1r,
        m1i = a1i - 0.5 * u1i;
      const b10r = a1r + u1r,
        b10i = a1i + u1i;
      const b11r = m1r + c * d1i,
        b11i = m1i - c * d1r,
        b12r = m1r - c * d1i,
        b12i = m1i + c * d1r;
      const c11r = b11r * k1r - b11i * k1i,
        c11i = b11r * k1i + b11i * k1r;
      const c12r = b12r * k2r - b12i * k2i,
        c12i = b12r * k2i + b12i * k2r;
      // b_2t = DFT3(a2, a5, a8)[t], c_2t = ω_9^(2t)·b_2t
      const u2r = a5r + a8r,
        u2i = a5i + a8i,
        d2r = a5r - a8r,
        d2i = a5i - a8i;
      const m2r = a2r - 0.5 * u2r,
        m2i = a2i - 0.5 * u2i;
      const b20r = a2r + u2r,
        b20i = a2i + u2i;
      const b21r = m2r + c * d2i,
        b21i = m2i - c * d2r,
        b22r = m2r - c * d2i,
        b22i = m2i + c * d2r;
      const c21r = b21r * k2r - b21i * k2i,
        c21i = b21r * k2i + b21i * k2r;
      const c22r = b22r * k4r - b22i * k4i,
        c22i = b22r * k4i + b22i * k4r;
      // X_(0+3·t2) = DFT3(b_00, b_10, b_20)[t2]
      const v0r = b10r + b20r,
        v0i = b10i + b20i,
        e0r = b10r - b20r,
        e0i = b10i - b20i;
      const n0r = b00r - 0.5 * v0r,
        n0i = b00i - 0.5 * v0i;
      // X_(1+3·t2) = DFT3(b_01, c_11, c_21)[t2]
      const v1r = c11r + c21r,
        v1i = c11i + c21i,
        e1r = c11r - c21r,
        e1i = c11i - c21i;
      const n1r = b01r - 0.5 * v1r,
        n1i = b01i - 0.5 * v1i;
      // X_(2+3·t2) = DFT3(b_02, c_12, c_22)[t2]
      const v2r = c12r + c22r,
        v2i = c12i + c22i,
        e2r = c12r - c22r,
        e2i = c12i - c22i;
      const n2r = b02r - 0.5 * v2r,
        n2i = b02i - 0.5 * v2i;
      const o0 = outBase + q;
      const o1 = (o0 + s) | 0,
        o2 = (o1 + s) | 0,
        o3 = (o2 + s) | 0,
        o4 = (o3 + s) | 0,
        o5 = (o4 + s) | 0,
        o6 = (o5 + s) | 0,
        o7 = (o6 + s) | 0,
        o8 = (o7 + s) | 0;
      yr[o0] = b00r + v0r;
      yi[o0] = b00i + v0i;
      const x1r = b01r + v1r,
        x1i = b01i + v1i;
      yr[o1] = x1r * w1r - x1i * w1i;
      yi[o1] = x1r * w1i + x1i * w1r;
      const x2r = b02r + v2r,
        x2i = b02i + v2i;
      yr[o2] = x2r * w2r - x2i * w2i;
      yi[o2] = x2r * w2i + x2i * w2r;
      const x3r = n0r + c * e0i,
        x3i = n0i - c * e0r;
      yr[o3] = x3r * w3r - x3i * w3i;
      yi[o3] = x3r * w3i + x3i * w3r;
      const x4r = n1r + c * e1i,
        x4i = n1i - c * e1r;
      yr[o4] = x4r * w4r - x4i * w4i;
      yi[o4] = x4r * w4i + x4i * w4r;
      const x5r = n2r + c * e2i,
        x5i = n2i - c * e2r;
      yr[o5] = x5r * w5r - x5i * w5i;
      yi[o5] = x5r * w5i + x5i * w5r;
      if (rows > 6) {
        const x6r = n0r - c * e0i,
          x6i = n0i + c * e0r;
        yr[o6] = x6r * w6r - x6i * w6i;
        yi[o6] = x6r * w6i + x6i * w6r;
        const x7r = n1r - c * e1i,
          x7i = n1i + c * e1r;
        yr[o7] = x7r * w7r - x7i * w7i;
        yi[o7] = x7r * w7i + x7i * w7r;
        const x8r = n2r - c * e2i,
          x8i = n2i + c * e2r;
        yr[o8] = x8r * w8r - x8i * w8i;
        yi[o8] = x8r * w8i + x8i * w8r;
      }
    }
  }
}

/**
 * Radix 12 as 4 × 3: DFT4s over a_{r+3k}, k < 4, for each r < 3, inner twiddles ω_12^{r·t}, then DFT3s
 * across r (X_{t + 4·t2}); it takes the 3 left over after the 9s (2^a·3^odd) together with a 4 in one pass.
 */
export function radix12(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tw: Float64Array, rows: number): void {
  const c = Math.sqrt(3) / 2;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const t = 22 * j;
    const w1r = tw[t]!,
      w1i = tw[t + 1]!,
      w2r = tw[t + 2]!,
      w2i = tw[t + 3]!,
      w3r = tw[t + 4]!,
      w3i = tw[t + 5]!,
      w4r = tw[t + 6]!,
      w4i = tw[t + 7]!;
    const w5r = tw[t + 8]!,
      w5i = tw[t + 9]!,
      w6r = tw[t + 10]!,
      w6i = tw[t + 11]!,
      w7r = tw[t + 12]!,
      w7i = tw[t + 13]!,
      w8r = tw[t + 14]!,
      w8i = tw[t + 15]!;
    const w9r = tw[t + 16]!,
      w9i = tw[t + 17]!,
      w10r = tw[t + 18]!,
      w10i = tw[t + 19]!,
      w11r = tw[t + 20]!,
      w11i = tw[t + 21]!;
    const inBase = s * j;
    const outBase = 12 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const i1 = (i0 + sm) | 0,
        i2 = (i1 + sm) | 0,
        i3 = (i2 + sm) | 0,
        i4 = (i3 + sm) | 0,
        i5 = (i4 + sm) | 0,
        i6 = (i5 + sm) | 0,
        i7 = (i6 + sm) | 0,
        i8 = (i7 + sm) | 0;
      const i9 = (i8 + sm) | 0,
        i10 = (i9 + sm) | 0,
        i11 = (i10 + sm) | 0;
      const a0r = xr[i0]!,
        a0i = xi[i0]!,
        a1r = xr[i1]!,
        a1i = xi[i1]!,
        a2r = xr[i2]!,
        a2i = xi[i2]!,
        a3r = xr[i3]!,
        a3i = xi[i3]!;
      const a4r = xr[i4]!,
        a4i = xi[i4]!,
        a5r = xr[i5]!,
        a5i = xi[i5]!,
        a6r = xr[i6]!,
        a6i = xi[i6]!,
        a7r = xr[i7]!,
        a7i = xi[i7]!;
      const a8r = xr[i8]!,
        a8i = xi[i8]!,
        a9r = xr[i9]!,
        a9i = xi[i9]!,
        a10r = xr[i10]!,
        a10i = xi[i10]!,
        a11r = xr[i11]!,
        a11i = xi[i11]!;
      // b_0t = DFT4(a0, a3, a6, a9)[t]
      const u00r = a0r + a6r,
        u00i = a0i + a6i,
        u01r = a0r - a6r,
        u01i = a0i - a6i;
      const u02r = a3r + a9r,
        u02i = a3i + a9i,
        u03r = a3r - a9r,
        u03i = a3i - a9i;
      const b00r = u00r + u02r,
        b00i = u00i + u02i,
        b02r = u00r - u02r,
        b02i = u00i - u02i;
      const b01r = u01r + u03i,
        b01i = u01i - u03r,
        b03r = u01r - u03i,
        b03i = u01i + u03r;
      // b_1t = DFT4(a1, a4, a7, a10)[t], c_1t = ω_12^t·b_1t (ω_12 = c − i/2, ω_12² = 1/2 − i·c, ω_12³ = −i)
      const u10r = a1r + a7r,
        u10i = a1i + a7i,
        u11r = a1r - a7r,
        u11i = a1i - a7i;
      const u12r = a4r + a10r,
        u12i = a4i + a10i,
        u13r = a4r - a10r,
        u13i = a4i - a10i;
      const c10r = u10r + u12r,
        c10i = u10i + u12i,
        b12r = u10r - u12r,
        b12i = u10i - u12i;
      const b11r = u11r + u13i,
        b11i = u11i - u13r,
        b13r = u11r - u13i,
        b13i = u11i + u13r;
      const c11r = c * b11r + 0.5 * b11i,
        c11i = c * b11i - 0.5 * b11r;
      const c12r = 0.5 * b12r + c * b12i,
        c12i = 0.5 * b12i - c * b12r;
      const c13r = b13i,
        c13i = -b13r;
      // b_2t = DFT4(a2, a5, a8, a11)[t], c_2t = ω_12^(2t)·b_2t (ω_12⁴ = −1/2 − i·c, ω_12⁶ = −1)
      const u20r = a2r + a8r,
        u20i = a2i + a8i,
        u21r = a2r - a8r,
        u21i = a2i - a8i;
      const u22r = a5r + a11r,
        u22i = a5i + a11i,
        u23r = a5r - a11r,
        u23i = a5i - a11i;
      const c20r = u20r + u22r,
        c20i = u20i + u22i,
        b22r = u20r - u22r,
        b22i = u20i - u22i;
      const b21r = u21r + u23i,
        b21i = u21i - u23r,
        b23r = u21r - u23i,
        b23i = u21i + u23r;
      const c21r = 0.5 * b21r + c * b21i,
        c21i = 0.5 * b21i - c * b21r;
      const c22r = c * b22i - 0.5 * b22r,
        c22i = -(0.5 * b22i + c * b22r);
      const c23r = -b23r,
        c23i = -b23i;
      // X_(t+4·t2) = DFT3(b_0t, c_1t, c_2t)[t2]
      const v0r = c10r + c20r,
        v0i = c10i + c20i,
        e0r = c10r - c20r,
        e0i = c10i - c20i;
      const n0r = b00r - 0.5 * v0r,
        n0i = b00i - 0.5 * v0i;
      const v1r = c11r + c21r,
        v1i = c11i + c21i,
        e1r = c11r - c21r,
        e1i = c11i - c21i;
      const n1r = b01r - 0.5 * v1r,
        n1i = b01i - 0.5 * v1i;
      const v2r = c12r + c22r,
        v2i = c12i + c22i,
        e2r = c12r - c22r,
        e2i = c12i - c22i;
      const n2r = b02r - 0.5 * v2r,
        n2i = b02i - 0.5 * v2i;
      const v3r = c13r + c23r,
        v3i = c13i + c23i,
        e3r = c13r - c23r,
        e3i = c13i - c23i;
      const n3r = b03r - 0.5 * v3r,
        n3i = b03i - 0.5 * v3i;
      const o0 = outBase + q;
      const o1 = (o0 + s) | 0,
        o2 = (o1 + s) | 0,
        o3 = (o2 + s) | 0,
        o4 = (o3 + s) | 0,
        o5 = (o4 + s) | 0,
        o6 = (o5 + s) | 0,
        o7 = (o6 + s) | 0,
        o8 = (o7 + s) | 0;
      const o9 = (o8 + s) | 0,
        o10 = (o9 + s) | 0,
        o11 = (o10 + s) | 0;
      yr[o0] = b00r + v0r;
      yi[o0] = b00i + v0i;
      const x1r = b01r + v1r,
        x1i = b01i + v1i;
      yr[o1] = x1r * w1r - x1i * w1i;
      yi[o1] = x1r * w1i + x1i * w1r;
      const x2r = b02r + v2r,
        x2i = b02i + v2i;
      yr[o2] = x2r * w2r - x2i * w2i;
      yi[o2] = x2r * w2i + x2i * w2r;
      const x3r = b03r + v3r,
        x3i = b03i + v3i;
      yr[o3] = x3r * w3r - x3i * w3i;
      yi[o3] = x3r * w3i + x3i * w3r;
      const x4r = n0r + c * e0i,
        x4i = n0i - c * e0r;
      yr[o4] = x4r * w4r - x4i * w4i;
      yi[o4] = x4r * w4i + x4i * w4r;
      const x5r = n1r + c * e1i,
        x5i = n1i - c * e1r;
      yr[o5] = x5r * w5r - x5i * w5i;
      yi[o5] = x5r * w5i + x5i * w5r;
      const x6r = n2r + c * e2i,
        x6i = n2i - c * e2r;
      yr[o6] = x6r * w6r - x6i * w6i;
      yi[o6] = x6r * w6i + x6i * w6r;
      const x7r = n3r + c * e3i,
        x7i = n3i - c * e3r;
      yr[o7] = x7r * w7r - x7i * w7i;
      yi[o7] = x7r * w7i + x7i * w7r;
      if (rows > 8) {
        const x8r = n0r - c * e0i,
          x8i = n0i + c * e0r;
        yr[o8] = x8r * w8r - x8i * w8i;
        yi[o8] = x8r * w8i + x8i * w8r;
        const x9r = n1r - c * e1i,
          x9i = n1i + c * e1r;
        yr[o9] = x9r * w9r - x9i * w9i;
        yi[o9] = x9r * w9i + x9i * w9r;
        const x10r = n2r - c * e2i,
          x10i = n2i + c * e2r;
        yr[o10] = x10r * w10r - x10i * w10i;
        yi[o10] = x10r * w10i + x10i * w10r;
        const x11r = n3r - c * e3i,
          x11i = n3i + c * e3r;
        yr[o11] = x11r * w11r - x11i * w11i;
        yi[o11] = x11r * w11i + x11i * w11r;
      }
    }
  }
}

/** Radix 8 as two radix-4 butterflies on the even and odd inputs, joined by ω_8^t. */
export function radix8(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tw: Float64Array, rows: number): void {
  const h = Math.SQRT1_2;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const t = 14 * j;
    const w1r = tw[t]!,
      w1i = tw[t + 1]!,
      w2r = tw[t + 2]!,
      w2i = tw[t + 3]!,
      w3r = tw[t + 4]!,
      w3i = tw[t + 5]!,
      w4r = tw[t + 6]!,
      w4i = tw[t + 7]!;
    const w5r = tw[t + 8]!,
      w5i = tw[t + 9]!,
      w6r = tw[t + 10]!,
      w6i = tw[t + 11]!,
      w7r = tw[t + 12]!,
      w7i = tw[t + 13]!;
    const inBase = s * j;
    const outBase = 8 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const i1 = (i0 + sm) | 0,
        i2 = (i1 + sm) | 0,
        i3 = (i2 + sm) | 0,
        i4 = (i3 + sm) | 0,
        i5 = (i4 + sm) | 0,
        i6 = (i5 + sm) | 0,
        i7 = (i6 + sm) | 0;
      const a0r = xr[i0]!,
        a0i = xi[i0]!,
        a1r = xr[i1]!,
        a1i = xi[i1]!,
        a2r = xr[i2]!,
        a2i = xi[i2]!,
        a3r = xr[i3]!,
        a3i = xi[i3]!;
      const a4r = xr[i4]!,
        a4i = xi[i4]!,
        a5r = xr[i5]!,
        a5i = xi[i5]!,
        a6r = xr[i6]!,
        a6i = xi[i6]!,
        a7r = xr[i7]!,
        a7i = xi[i7]!;
      // E = DFT4(a0, a2, a4, a6)
      const p0r = a0r + a4r,
        p0i = a0i + a4i,
        p1r = a0r - a4r,
        p1i = a0i - a4i;
      const p2r = a2r + a6r,
        p2i = a2i + a6i,
        p3r = a2r - a6r,
        p3i = a2i - a6i;
      const e0r = p0r + p2r,
        e0i = p0i + p2i,
        e2r = p0r - p2r,
        e2i = p0i - p2i;
      const e1r = p1r + p3i,
        e1i = p1i - p3r,
        e3r = p1r - p3i,
        e3i = p1i + p3r;
      // O = DFT4(a1, a3, a5, a7)
      const q0r = a1r + a5r,
        q0i = a1i + a5i,
        q1r = a1r - a5r,
        q1i = a1i - a5i;
      const q2r = a3r + a7r,
        q2i = a3i + a7i,
        q3r = a3r - a7r,
        q3i = a3i - a7i;
      const o0r = q0r + q2r,
        o0i = q0i + q2i,
        o2r = q0r - q2r,
        o2i = q0i - q2i;
      const o1r = q1r + q3i,
        o1i = q1i - q3r,
        o3r = q1r - q3i,
        o3i = q1i + q3r;
      // ω_8·O1 = (1 − i)/√2·O1, ω_8²·O2 = −i·O2, ω_8³·O3 = −(1 + i)/√2·O3
      const r1r = h * (o1r + o1i),
        r1i = h * (o1i - o1r);
      const r3r = h * (o3i - o3r),
        r3i = -h * (o3r + o3i);
      const o0 = outBase + q;
      const o1 = (o0 + s) | 0,
        o2 = (o1 + s) | 0,
        o3 = (o2 + s) | 0,
        o4 = (o3 + s) | 0,
        o5 = (o4 + s) | 0,
        o6 = (o5 + s) | 0,
        o7 = (o6 + s) | 0;
      yr[o0] = e0r + o0r;
      yi[o0] = e0i + o0i;
      const x1r = e1r + r1r,
        x1i = e1i + r1i;
      yr[o1] = x1r * w1r - x1i * w1i;
      yi[o1] = x1r * w1i + x1i * w1r;
      const x2r = e2r + o2i,
        x2i = e2i - o2r;
      yr[o2] = x2r * w2r - x2i * w2i;
      yi[o2] = x2r * w2i + x2i * w2r;
      const x3r = e3r + r3r,
        x3i = e3i + r3i;
      yr[o3] = x3r * w3r - x3i * w3i;
      yi[o3] = x3r * w3i + x3i * w3r;
      if (rows > 4) {
        const x4r = e0r - o0r,
          x4i = e0i - o0i;
        yr[o4] = x4r * w4r - x4i * w4i;
        yi[o4] = x4r * w4i + x4i * w4r;
        const x5r = e1r - r1r,
          x5i = e1i - r1i;
        yr[o5] = x5r * w5r - x5i * w5i;
        yi[o5] = x5r * w5i + x5i * w5r;
        const x6r = e2r - o2i,
          x6i = e2i + o2r;
        yr[o6] = x6r * w6r - x6i * w6i;
        yi[o6] = x6r * w6i + x6i * w6r;
        const x7r = e3r - r3r,
          x7i = e3i - r3i;
        yr[o7] = x7r * w7r - x7i * w7i;
        yi[o7] = x7r * w7i + x7i * w7r;
      }
    }
  }
}

/**
 * Radix 16 as 4 × 4 (the same split once more): DFT4s over a_{r+4k}, k < 4, for each r < 4, inner
 * twiddles ω_16^{r·t}, then DFT4s across r.
 */
export function radix16(s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tw: Float64Array, rows: number): void {
  const h = Math.SQRT1_2,
    c = Math.cos(Math.PI / 8),
    d = Math.sin(Math.PI / 8);
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const t = 30 * j;
    const w1r = tw[t]!,
      w1i = tw[t + 1]!,
      w2r = tw[t + 2]!,
      w2i = tw[t + 3]!,
      w3r = tw[t + 4]!,
      w3i = tw[t + 5]!,
      w4r = tw[t + 6]!,
      w4i = tw[t + 7]!;
    const w5r = tw[t + 8]!,
      w5i = tw[t + 9]!,
      w6r = tw[t + 10]!,
      w6i = tw[t + 11]!,
      w7r = tw[t + 12]!,
      w7i = tw[t + 13]!,
      w8r = tw[t + 14]!,
      w8i = tw[t + 15]!;
    const w9r = tw[t + 16]!,
      w9i = tw[t + 17]!,
      w10r = tw[t + 18]!,
      w10i = tw[t + 19]!,
      w11r = tw[t + 20]!,
      w11i = tw[t + 21]!,
      w12r = tw[t + 22]!,
      w12i = tw[t + 23]!;
    const w13r = tw[t + 24]!,
      w13i = tw[t + 25]!,
      w14r = tw[t + 26]!,
      w14i = tw[t + 27]!,
      w15r = tw[t + 28]!,
      w15i = tw[t + 29]!;
    const inBase = s * j;
    const outBase = 16 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const i1 = (i0 + sm) | 0,
        i2 = (i1 + sm) | 0,
        i3 = (i2 + sm) | 0,
        i4 = (i3 + sm) | 0,
        i5 = (i4 + sm) | 0,
        i6 = (i5 + sm) | 0,
        i7 = (i6 + sm) | 0,
        i8 = (i7 + sm) | 0;
      const i9 = (i8 + sm) | 0,
        i10 = (i9 + sm) | 0,
        i11 = (i10 + sm) | 0,
        i12 = (i11 + sm) | 0,
        i13 = (i12 + sm) | 0,
        i14 = (i13 + sm) | 0,
        i15 = (i14 + sm) | 0;
      const a0r = xr[i0]!,
        a0i = xi[i0]!,
        a1r = xr[i1]!,
        a1i = xi[i1]!,
        a2r = xr[i2]!,
        a2i = xi[i2]!,
        a3r = xr[i3]!,
        a3i = xi[i3]!;
      const a4r = xr[i4]!,
        a4i = xi[i4]!,
        a5r = xr[i5]!,
        a5i = xi[i5]!,
        a6r = xr[i6]!,
        a6i = xi[i6]!,
        a7r = xr[i7]!,
        a7i = xi[i7]!;
      const a8r = xr[i8]!,
        a8i = xi[i8]!,
        a9r = xr[i9]!,
        a9i = xi[i9]!,
        a10r = xr[i10]!,
        a10i = xi[i10]!,
        a11r = xr[i11]!,
        a11i = xi[i11]!;
      const a12r = xr[i12]!,
        a12i = xi[i12]!,
        a13r = xr[i13]!,
        a13i = xi[i13]!,
        a14r = xr[i14]!,
        a14i = xi[i14]!,
        a15r = xr[i15]!,
        a15i = xi[i15]!;
      // b_0t = DFT4(a0, a4, a8, a12)[t]
      const u00r = a0r + a8r,
        u00i = a0i + a8i,
        u01r = a0r - a8r,
        u01i = a0i - a8i;
      const u02r = a4r + a12r,
        u02i = a4i + a12i,
        u03r = a4r - a12r,
        u03i = a4i - a12i;
      const c00r = u00r + u02r,
        c00i = u00i + u02i,
        c02r = u00r - u02r,
        c02i = u00i - u02i;
      const c01r = u01r + u03i,
        c01i = u01i - u03r,
        c03r = u01r - u03i,
        c03i = u01i + u03r;
      // b_1t = DFT4(a1, a5, a9, a13)[t], c_1t = ω_16^(1·t)·b_1t
      const u10r = a1r + a9r,
        u10i = a1i + a9i,
        u11r = a1r - a9r,
        u11i = a1i - a9i;
      const u12r = a5r + a13r,
        u12i = a5i + a13i,
        u13r = a5r - a13r,
        u13i = a5i - a13i;
      const b10r = u10r + u12r,
        b10i = u10i + u12i,
        b12r = u10r - u12r,
        b12i = u10i - u12i;
      const b11r = u11r + u13i,
        b11i = u11i - u13r,
        b13r = u11r - u13i,
        b13i = u11i + u13r;
      const c10r = b10r,
        c10i = b10i;
      const c11r = b11r * c + b11i * d,
        c11i = b11i * c - b11r * d;
      const c12r = h * (b12r + b12i),
        c12i = h * (b12i - b12r);
      const c13r = b13r * d + b13i * c,
        c13i = b13i * d - b13r * c;
      // b_2t = DFT4(a2, a6, a10, a14)[t], c_2t = ω_16^(2·t)·b_2t
      const u20r = a2r + a10r,
        u20i = a2i + a10i,
        u21r = a2r - a10r,
        u21i = a2i - a10i;
      const u22r = a6r + a14r,
        u22i = a6i + a14i,
        u23r = a6r - a14r,
        u23i = a6i - a14i;
      const b20r = u20r + u22r,
        b20i = u20i + u22i,
        b22r = u20r - u22r,
        b22i = u20i - u22i;
      const b21r = u21r + u23i,
        b21i = u21i - u23r,
        b23r = u21r - u23i,
        b23i = u21i + u23r;
      const c20r = b20r,
        c20i = b20i;
      const c21r = h * (b21r + b21i),
        c21i = h * (b21i - b21r);
      const c22r = b22i,
        c22i = -b22r;
      const c23r = h * (b23i - b23r),
        c23i = -h * (b23r + b23i);
      // b_3t = DFT4(a3, a7, a11, a15)[t], c_3t = ω_16^(3·t)·b_3t
      const u30r = a3r + a11r,
        u30i = a3i + a11i,
        u31r = a3r - a11r,
        u31i = a3i - a11i;
      const u32r = a7r + a15r,
        u32i = a7i + a15i,
        u33r = a7r - a15r,
        u33i = a7i - a15i;
      const b30r = u30r + u32r,
        b30i = u30i + u32i,
        b32r = u30r - u32r,
        b32i = u30i - u32i;
      const b31r = u31r + u33i,
        b31i = u31i - u33r,
        b33r = u31r - u33i,
        b33i = u31i + u33r;
      const c30r = b30r,
        c30i = b30i;
      const c31r = b31r * d + b31i * c,
        c31i = b31i * d - b31r * c;
      const c32r = h * (b32i - b32r),
        c32i = -h * (b32r + b32i);
      const c33r = -(c * b33r + d * b33i),
        c33i = d * b33r - c * b33i;
      // X_(0+4·t2) = DFT4(c_00, c_10, c_20, c_30)[t2]
      const v00r = c00r + c20r,
        v00i = c00i + c20i,
        v01r = c00r - c20r,
        v01i = c00i - c20i;
      const v02r = c10r + c30r,
        v02i = c10i + c30i,
        v03r = c10r - c30r,
        v03i = c10i - c30i;
      // X_(1+4·t2) = DFT4(c_01, c_11, c_21, c_31)[t2]
      const v10r = c01r + c21r,
        v10i = c01i + c21i,
        v11r = c01r - c21r,
        v11i = c01i - c21i;
      const v12r = c11r + c31r,
        v12i = c11i + c31i,
        v13r = c11r - c31r,
        v13i = c11i - c31i;
      // X_(2+4·t2) = DFT4(c_02, c_12, c_22, c_32)[t2]
      const v20r = c02r + c22r,
        v20i = c02i + c22i,
        v21r = c02r - c22r,
        v21i = c02i - c22i;
      const v22r = c12r + c32r,
        v22i = c12i + c32i,
        v23r = c12r - c32r,
        v23i = c12i - c32i;
      // X_(3+4·t2) = DFT4(c_03, c_13, c_23, c_33)[t2]
      const v30r = c03r + c23r,
        v30i = c03i + c23i,
        v31r = c03r - c23r,
        v31i = c03i - c23i;
      const v32r = c13r + c33r,
        v32i = c13i + c33i,
        v33r = c13r - c33r,
        v33i = c13i - c33i;
      const o0 = outBase + q;
      const o1 = (o0 + s) | 0,
        o2 = (o1 + s) | 0,
        o3 = (o2 + s) | 0,
        o4 = (o3 + s) | 0,
        o5 = (o4 + s) | 0,
        o6 = (o5 + s) | 0,
        o7 = (o6 + s) | 0,
        o8 = (o7 + s) | 0;
      const o9 = (o8 + s) | 0,
        o10 = (o9 + s) | 0,
        o11 = (o10 + s) | 0,
        o12 = (o11 + s) | 0,
        o13 = (o12 + s) | 0,
        o14 = (o13 + s) | 0,
        o15 = (o14 + s) | 0;
      yr[o0] = v00r + v02r;
      yi[o0] = v00i + v02i;
      const x1r = v10r + v12r,
        x1i = v10i + v12i;
      yr[o1] = x1r * w1r - x1i * w1i;
      yi[o1] = x1r * w1i + x1i * w1r;
      const x2r = v20r + v22r,
        x2i = v20i + v22i;
      yr[o2] = x2r * w2r - x2i * w2i;
      yi[o2] = x2r * w2i + x2i * w2r;
      const x3r = v30r + v32r,
        x3i = v30i + v32i;
      yr[o3] = x3r * w3r - x3i * w3i;
      yi[o3] = x3r * w3i + x3i * w3r;
      const x4r = v01r + v03i,
        x4i = v01i - v03r;
      yr[o4] = x4r * w4r - x4i * w4i;
      yi[o4] = x4r * w4i + x4i * w4r;
      const x5r = v11r + v13i,
        x5i = v11i - v13r;
      yr[o5] = x5r * w5r - x5i * w5i;
      yi[o5] = x5r * w5i + x5i * w5r;
      const x6r = v21r + v23i,
        x6i = v21i - v23r;
      yr[o6] = x6r * w6r - x6i * w6i;
      yi[o6] = x6r * w6i + x6i * w6r;
      const x7r = v31r + v33i,
        x7i = v31i - v33r;
      yr[o7] = x7r * w7r - x7i * w7i;
      yi[o7] = x7r * w7i + x7i * w7r;
      if (rows > 8) {
        const x8r = v00r - v02r,
          x8i = v00i - v02i;
        yr[o8] = x8r * w8r - x8i * w8i;
        yi[o8] = x8r * w8i + x8i * w8r;
        const x9r = v10r - v12r,
          x9i = v10i - v12i;
        yr[o9] = x9r * w9r - x9i * w9i;
        yi[o9] = x9r * w9i + x9i * w9r;
        const x10r = v20r - v22r,
          x10i = v20i - v22i;
        yr[o10] = x10r * w10r - x10i * w10i;
        yi[o10] = x10r * w10i + x10i * w10r;
        const x11r = v30r - v32r,
          x11i = v30i - v32i;
        yr[o11] = x11r * w11r - x11i * w11i;
        yi[o11] = x11r * w11i + x11i * w11r;
        const x12r = v01r - v03i,
          x12i = v01i + v03r;
        yr[o12] = x12r * w12r - x12i * w12i;
        yi[o12] = x12r * w12i + x12i * w12r;
        const x13r = v11r - v13i,
          x13i = v11i + v13r;
        yr[o13] = x13r * w13r - x13i * w13i;
        yi[o13] = x13r * w13i + x13i * w13r;
        const x14r = v21r - v23i,
          x14i = v21i + v23r;
        yr[o14] = x14r * w14r - x14i * w14i;
        yi[o14] = x14r * w14i + x14i * w14r;
        const x15r = v31r - v33i,
          x15i = v31i + v33r;
        yr[o15] = x15r * w15r - x15i * w15i;
        yi[o15] = x15r * w15i + x15i * w15r;
      }
    }
  }
}

/** Any odd radix p: pairs r and p−r share a cosine and a sine, halving the multiplications. */
export function radixOdd(
  p: number,
  s: number,
  m: number,
  xr: Float64Array,
  xi: Float64Array,
  yr: Float64Array,
  yi: Float64Array,
  tw: Float64Array,
  rootRe: Float64Array,
  rootIm: Float64Array,
  sumRe: Float64Array,
  sumIm: Float64Array,
  diffRe: Float64Array,
  diffIm: Float64Array,
  rows: number,
): void {
  const half = (p - 1) >> 1;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const inBase = s * j;
    const outBase = p * s * j;
    const twBase = (p - 1) * j;
    for (let q = 0; q < s; q++) {
      const i0 = inBase + q;
      const a0r = xr[i0]!,
        a0i = xi[i0]!;
      let dcr = a0r,
        dci = a0i;
      for (let r = 1; r <= half; r++) {
        const ia = i0 + r * sm,
          ib = i0 + (p - r) * sm;
        const ur = xr[ia]!,
          ui = xi[ia]!,
          vr = xr[ib]!,
          vi = xi[ib]!;
        sumRe[r] = ur + vr;
        sumIm[r] = ui + vi;
        diffRe[r] = ur - vr;
        diffIm[r] = ui - vi;
        dcr += ur + vr;
        dci += ui + vi;
      }
      const o0 = outBase + q;
      yr[o0] = dcr;
      yi[o0] = dci;
      // t < p − t: once t reaches rows, so has p − t
      for (let t = 1; t <= half && t < rows; t++) {
        let mr = a0r,
          mi = a0i,
          nr = 0,
          ni = 0;
        for (let r = 1; r <= half; r++) {
          const u = (r * t) % p;
          const cr = rootRe[u]!,
            si = -rootIm[u]!;
          mr += cr * sumRe[r]!;
          mi += cr * sumIm[r]!;
          nr += si * diffRe[r]!;
          ni += si * diffIm[r]!;
        }
        // b_t = m − i·n, b_{p−t} = m + i·n
        const btr = mr + ni,
          bti = mi - nr,
          bur = mr - ni,
          bui = mi + nr;
        const at = 2 * (twBase + t - 1),
          au = 2 * (twBase + p - t - 1);
        const wtr = tw[at]!,
          wti = tw[at + 1]!,
          wur = tw[au]!,
          wui = tw[au + 1]!;
        const ot = o0 + t * s,
          ou = o0 + (p - t) * s;
        yr[ot] = btr * wtr - bti * wti;
        yi[ot] = btr * wti + bti * wtr;
        if (p - t < rows) {
          yr[ou] = bur * wur - bui * wui;
          yi[ou] = bur * wui + bui * wur;
        }
      }
    }
  }
}
