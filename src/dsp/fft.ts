/**
 * Discrete Fourier transform plans for any length n ≥ 1.
 *
 * Convention (as numpy.fft): X_k = Σ_j x_j·e^{−2πi·jk/n}; the inverse is unscaled.
 *
 * Lengths whose prime factors are all ≤ MAX_DIRECT_RADIX (61) run a mixed-radix Stockham
 * transform (radix 16, 8, 4, 2, 9, 12, 3, 5 and a generic odd radix), which needs no bit reversal and keeps the
 * output in natural order. Other lengths use Bluestein's chirp-z algorithm on a power-of-two
 * (or 2^a·3^b·5^c) Stockham transform. Twiddles are precomputed per stage from exact integer angles.
 *
 * References: J. W. Cooley & J. W. Tukey (1965), Math. Comp. 19:297–301; T. G. Stockham (1966)
 * AFIPS 28:229–233 (autosort formulation); L. I. Bluestein (1970), IEEE Trans. Audio Electroacoust.
 * 18(4):451–455. (From memory; common practice.)
 */

// The parts live in fft/: types, checks, factorization (radices and twiddles), butterflies,
// mixed-radix (Stockham plans), bluestein, real (real-input plans) and plans (the cached entry points).
export { complexFftPlan, realFftPlan } from './fft/plans.js';
export type { ComplexFftPlan, RealFftPlan } from './fft/types.js';
