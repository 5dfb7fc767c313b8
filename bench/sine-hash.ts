/**
 * Deterministic noise-like benchmark data: a sine-hash, uniform on [−½, ½). The Python references
 * (bench/scipy-*.py) compute the same numbers, so both sides see identical input without a file.
 */
export function sineHashSignals(count: number, samples: number): Float64Array[] {
  return Array.from({ length: count }, (_, signal) => {
    const x = new Float64Array(samples);
    for (let i = 0; i < samples; i++) {
      const h = Math.sin((signal * samples + i + 1) * 12.9898) * 43758.5453;
      x[i] = h - Math.floor(h) - 0.5;
    }
    return x;
  });
}
