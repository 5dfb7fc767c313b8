/**
 * Phase consistency across trials (inter-trial phase locking) at each time–frequency point:
 * R = |(1/n)·Σ_r e^{iφ_r}|, the mean resultant length of the n trial phases.
 *
 * Null reference. For n independent phases uniform on the circle, S = Σ e^{iφ_r} is a planar walk of
 * n unit steps. Exactly, E[R²] = E|S|²/n² = 1/n, so the root-mean-square of R is 1/√n — the "≈ 1/√n"
 * scale. The mean is smaller: E|S| = ∫_0^∞ (1 − J_0(t)^n)/t² dt (Kluyver's walk; the integral form
 * is the standard one for planar random walks), with E[R] = 1 for n = 1 and 2/π for n = 2. For
 * n ≥ 3 we use its large-n expansion, derived here by a Laguerre (Edgeworth-type) series for
 * ρ = |S|²/n whose moments E[ρ²] = 2 − 1/n, E[ρ³] = 6 − 9/n + 4/n², E[ρ⁴] = 24 − 72/n + 82/n² − 33/n³ are exact:
 *   E[R] ≈ √(π/(4n))·(1 + 1/(16n) + 19/(1536n²)).
 * Checked against scipy quadrature of the integral (test/fixtures/tf/phase-null.json): relative error
 * 3.5e−3 at n = 3, 3.7e−4 at n = 5, 1.4e−6 at n = 10, below 1e−8 from n = 20. The leading term
 * √(π/(4n)) = √π/(2√n) ≈ 0.886/√n is the Rayleigh-distribution limit (common practice).
 */

/** Expected values of R under no phase locking. */
export interface PhaseConsistencyNull {
  trialCount: number;
  /** E[R]: exact for n = 1, 2; the three-term expansion above for n ≥ 3 */
  mean: number;
  /** √(π/(4n)), the large-n (Rayleigh) limit of E[R] */
  largeSampleMean: number;
  /** √E[R²] = 1/√n exactly */
  rootMeanSquare: number;
}

export interface PhaseConsistencyOptions {
  /** level of {@link phaseConsistencyThreshold}. @defaultValue 0.05 */
  alpha?: number;
  /** cells marked 1 (e.g. a Morlet edge mask) are reported as NaN rather than used. @defaultValue none */
  exclude?: Uint8Array;
}

export interface PhaseConsistencyResult {
  /** R per cell, in [0, 1], in the layout of the inputs */
  values: Float64Array;
  trialCount: number;
  null: PhaseConsistencyNull;
  /** level of {@link phaseConsistencyThreshold} used */
  alpha: number;
  /** R above which a cell is locked at level alpha (Rayleigh test) */
  threshold: number;
  /** cells × trials whose coefficient was exactly 0 (no phase): they add nothing to the sum */
  zeroCoefficients: number;
}

function requireTrialCount(trialCount: number): void {
  if (!Number.isInteger(trialCount) || trialCount < 1) throw new RangeError(`trialCount must be an integer ≥ 1, got ${trialCount}`);
}

/**
 * Expected mean resultant length of n uniform, independent phases.
 *
 * @param trialCount - n, integer ≥ 1
 * @returns mean (E[R], see the module note for the form and its accuracy), largeSampleMean √(π/(4n)),
 *   rootMeanSquare 1/√n
 * @throws RangeError when `trialCount` is not an integer ≥ 1
 * @see J. C. Kluyver (1906), Proc. Sect. Sci. K. Akad. Wet. Amst. 8:341–350 (planar random walk;
 *   from memory); K. V. Mardia & P. E. Jupp (2000), Directional Statistics, §5.3 (Rayleigh limit; from memory)
 */
export function phaseConsistencyNull(trialCount: number): PhaseConsistencyNull {
  requireTrialCount(trialCount);
  const n = trialCount;
  const largeSampleMean = Math.sqrt(Math.PI / (4 * n));
  let mean: number;
  if (n === 1) mean = 1;
  else if (n === 2)
    mean = 2 / Math.PI; // E|1 + e^{iθ}|/2 = E|cos(θ/2)| = 2/π
  else mean = largeSampleMean * (1 + 1 / (16 * n) + 19 / (1536 * n * n));
  return { trialCount: n, mean, largeSampleMean, rootMeanSquare: 1 / Math.sqrt(n) };
}

/**
 * Level-α threshold of R for n trials (Rayleigh test of uniformity).
 *
 * Uses the small-sample approximation of the Rayleigh p-value for the resultant length nR,
 * p ≈ exp(√(1 + 4n + 4(n² − (nR)²)) − (1 + 2n)), solved for R; for large n it tends to √(−ln α / n)
 * (from p ≈ exp(−nR²)).
 *
 * @param trialCount - n, integer ≥ 2
 * @param alpha - false-alarm level in (0, 1)
 * @returns R_α with P(R ≥ R_α) ≈ α under no locking
 * @throws RangeError for a bad `trialCount` or `alpha`
 * @see J. H. Zar (1999), Biostatistical Analysis, 4th ed., §27.1, citing Greenwood & Durand (1955)
 *   (from memory); checked here by seeded Monte Carlo
 */
export function phaseConsistencyThreshold(trialCount: number, alpha: number): number {
  requireTrialCount(trialCount);
  if (trialCount < 2) throw new RangeError(`trialCount must be ≥ 2 for a threshold, got ${trialCount}`);
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`alpha must be in (0, 1), got ${alpha}`);
  const n = trialCount;
  const root = Math.log(alpha) + 1 + 2 * n;
  const resultantSquared = n * n - (root * root - 1 - 4 * n) / 4;
  return Math.sqrt(Math.max(0, Math.min(n * n, resultantSquared))) / n;
}

/**
 * Phase consistency across trials of complex coefficients (e.g. Morlet `coefficients`).
 *
 * @param re - real parts, one Float64Array per trial, all of one length (any layout)
 * @param im - imaginary parts, matching `re`
 * @param options - `alpha`, the level of the reported threshold, and `exclude`, a mask of cells to
 *   report as NaN (e.g. the Morlet plan's edgeMask)
 * @defaultValue alpha 0.05, exclude none
 * @returns values R = |Σ_r z_r/|z_r|| / n per cell (NaN where excluded), the trial count, the null expectations
 *   ({@link phaseConsistencyNull}), the level-alpha threshold and the number of zero coefficients
 * @throws RangeError for no trials, mismatched lengths, a bad alpha or a mask of the wrong length
 * @see C. Tallon-Baudry et al. (1996), J. Neurosci. 16:4240–4249 (phase locking across trials);
 *   J.-P. Lachaux et al. (1999), Hum. Brain Mapp. 8:194–208
 */
export function phaseConsistency(re: readonly Float64Array[], im: readonly Float64Array[], options: PhaseConsistencyOptions = {}): PhaseConsistencyResult {
  const alpha = options.alpha ?? 0.05;
  const { exclude } = options;
  if (!Array.isArray(re) || !Array.isArray(im) || re.length === 0 || re.length !== im.length) {
    throw new RangeError('re and im must hold the same number (≥ 1) of trials');
  }
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`alpha must be in (0, 1), got ${alpha}`);
  const n = re.length;
  const size = re[0]!.length;
  for (let r = 0; r < n; r++) {
    if (!(re[r] instanceof Float64Array) || !(im[r] instanceof Float64Array) || re[r]!.length !== size || im[r]!.length !== size) {
      throw new RangeError(`trial ${r} must be two Float64Arrays of ${size} values`);
    }
  }
  if (exclude !== undefined && (!(exclude instanceof Uint8Array) || exclude.length !== size)) {
    throw new RangeError(`exclude must be a Uint8Array of ${size} values`);
  }
  const sumRe = new Float64Array(size),
    sumIm = new Float64Array(size);
  let zeroCoefficients = 0;
  for (let r = 0; r < n; r++) {
    const a = re[r]!,
      b = im[r]!;
    for (let i = 0; i < size; i++) {
      const magnitude = Math.hypot(a[i]!, b[i]!);
      if (magnitude === 0) {
        zeroCoefficients++;
        continue;
      }
      sumRe[i] = sumRe[i]! + a[i]! / magnitude;
      sumIm[i] = sumIm[i]! + b[i]! / magnitude;
    }
  }
  const values = new Float64Array(size);
  for (let i = 0; i < size; i++) values[i] = exclude !== undefined && exclude[i] === 1 ? Number.NaN : Math.hypot(sumRe[i]!, sumIm[i]!) / n;
  return {
    values,
    trialCount: n,
    null: phaseConsistencyNull(n),
    alpha,
    threshold: n >= 2 ? phaseConsistencyThreshold(n, alpha) : 1,
    zeroCoefficients,
  };
}
