// Micro sign U+00B5 and Greek small mu U+03BC: both occur in recorded unit strings.
const MICRO = new Set(['u', 'U', '\u00b5', '\u03bc']);

/**
 * Factor that converts a voltage in `dimension` to microvolts, or null when `dimension` is not a
 * voltage (the caller keeps such signals in their own unit).
 *
 * Accepted: nV (0.001), uV / µV / μV (1), mV (1000), V (1 000 000). Surrounding spaces (EDF pads
 * its fields) are ignored. Case rules: the unit letter may be V or v; the prefix keeps its SI case
 * (n, m), except that micro may be written u, U, µ (U+00B5) or μ (U+03BC) and nano as N, since
 * neither U nor N is an SI prefix. "MV" is refused (null): it would be megavolt in SI but is
 * usually an upper-cased mV, and guessing either way could scale data by 10^9.
 *
 * @param dimension - A physical dimension such as an EDF header's (e.g. "uV", "mV ").
 * @returns Microvolts per unit of `dimension`, or null for a non-voltage or ambiguous dimension.
 *
 * Reference: SI prefixes, BIPM SI Brochure, 9th ed. (2019), SI prefixes table (common practice; table number from memory: 7).
 */
export function voltageScaleToMicrovolts(dimension: string): number | null {
  const text = dimension.trim();
  if (text.length === 0 || text.length > 2) return null;
  const unit = text[text.length - 1]!;
  if (unit !== 'V' && unit !== 'v') return null;
  if (text.length === 1) return 1e6;
  const prefix = text[0]!;
  if (MICRO.has(prefix)) return 1;
  if (prefix === 'm') return 1e3;
  if (prefix === 'n' || prefix === 'N') return 1e-3;
  return null;
}
