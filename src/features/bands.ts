/**
 * Band power from a one-sided PSD, as fixed in DESIGN.md:
 * - absolute = Σ PSD[k]·Δf over bins with low ≤ f_k < high (half-open, so contiguous bands add up exactly);
 * - relative = absolute / (Σ PSD[k]·Δf over the total range, both ends included);
 * - decibels = 10·log10(absolute), in dB re 1 unit² (dB re 1 µV² for µV input); null when absolute is 0.
 */
export interface BandDefinition {
  name: string;
  low: number;
  high: number;
}

export interface BandPower {
  name: string;
  low: number;
  high: number;
  /** unit² */
  absolute: number;
  relative: number | null;
  decibels: number | null;
  /** number of bins summed */
  bins: number;
}

export function totalPower(frequencies: Float64Array, psd: Float64Array, range: readonly [number, number], resolution: number): number {
  let sum = 0;
  for (let k = 0; k < frequencies.length; k++) {
    const f = frequencies[k]!;
    if (f >= range[0] && f <= range[1]) sum += psd[k]!;
  }
  return sum * resolution;
}

export function bandPowers(frequencies: Float64Array, psd: Float64Array, bands: readonly BandDefinition[], range: readonly [number, number], resolution: number): BandPower[] {
  const total = totalPower(frequencies, psd, range, resolution);
  return bands.map((band) => {
    let sum = 0;
    let bins = 0;
    for (let k = 0; k < frequencies.length; k++) {
      const f = frequencies[k]!;
      if (f >= band.low && f < band.high) {
        sum += psd[k]!;
        bins++;
      }
    }
    const absolute = sum * resolution;
    return {
      name: band.name,
      low: band.low,
      high: band.high,
      absolute,
      relative: total > 0 ? absolute / total : null,
      decibels: absolute > 0 ? 10 * Math.log10(absolute) : null,
      bins,
    };
  });
}

export interface BandRatioDefinition {
  name: string;
  numerator: string;
  denominator: string;
}

export interface BandRatio {
  name: string;
  numerator: string;
  denominator: string;
  /** absolute(numerator) / absolute(denominator); null when the denominator is 0 */
  value: number | null;
}

export function bandRatios(powers: readonly BandPower[], ratios: readonly BandRatioDefinition[]): BandRatio[] {
  const byName = new Map(powers.map((p) => [p.name, p.absolute]));
  return ratios.map((r) => {
    const num = byName.get(r.numerator);
    const den = byName.get(r.denominator);
    if (num === undefined || den === undefined) throw new RangeError(`ratio "${r.name}" names a band that was not computed`);
    return { name: r.name, numerator: r.numerator, denominator: r.denominator, value: den > 0 ? num / den : null };
  });
}
