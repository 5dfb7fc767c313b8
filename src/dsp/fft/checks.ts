/** Argument checks of the FFT plans; they throw RangeError naming the parameter. */
/** Prime factors up to this size are done as direct butterflies; larger ones go through Bluestein. */
export const MAX_DIRECT_RADIX = 61;

export function checkSize(size: number): void {
  if (!Number.isInteger(size) || size < 1) {
    throw new RangeError(`size must be an integer ≥ 1, got ${size}`);
  }
}

export function checkOutputCount(count: number, size: number): void {
  if (!Number.isInteger(count) || count < 1 || count > size) {
    throw new RangeError(`outputCount must be an integer in 1..${size}, got ${count}`);
  }
}

export function checkBuffers(re: Float64Array, im: Float64Array, length: number, what: string): void {
  if (re.length < length || im.length < length) {
    throw new RangeError(`${what} re and im need at least ${length} elements, got ${re.length} and ${im.length}`);
  }
}

export function checkInput(input: Float64Array, n: number): void {
  if (input.length > n) throw new RangeError(`input length ${input.length} exceeds the plan size ${n}`);
}
