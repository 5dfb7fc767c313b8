/** The plan interfaces of the FFT (see ../fft.ts for the convention). */
export interface RealFftPlan {
  readonly size: number;
  /** X_k = Σ_j x_j·e^{−2πi·jk/n} for k = 0..floor(n/2). `input.length` may be ≤ n (implicit zero padding). */
  forward(input: Float64Array, re: Float64Array, im: Float64Array): void;
}

export interface ComplexFftPlan {
  readonly size: number;
  /**
   * In place. `inverse` uses e^{+2πi·jk/n} and is unscaled (the caller divides by n).
   *
   * `outputCount` (1..n, default n): only outputs k < outputCount are wanted. They are the same
   * numbers, bit for bit, as a full transform gives; the elements from outputCount to n − 1 are left
   * unspecified (partly computed, partly stale: the arrays are used as work space). The mixed-radix
   * plans save the last stage's work for the rows past outputCount; Bluestein plans do it all.
   */
  transform(re: Float64Array, im: Float64Array, inverse?: boolean, outputCount?: number): void;
}
