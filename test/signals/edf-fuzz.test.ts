import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { EdfFormatError, parseEdf, parseTals, readEdfHeader, writeEdf } from '../../src/signals/edf/index.js';
import { motorNerveFile } from '../fixtures/edf/build.js';

// Property tests: whatever the bytes, the reader either succeeds or throws EdfFormatError, never
// another exception, never a hang. Runs are bounded (numRuns) and inputs are small.

function onlyEdfErrors(run: () => unknown): boolean {
  try {
    run();
    return true;
  } catch (e) {
    if (e instanceof EdfFormatError) return true;
    throw e;
  }
}

const valid = motorNerveFile();
const written = writeEdf({
  signals: [{ label: 'Pz', samples: Float64Array.from({ length: 40 }, (_, k) => Math.cos(k)), samplingRate: 20 }],
  recordDuration: 0.5,
  startDate: { year: 1999, month: 12, day: 31, hour: 23, minute: 59, second: 59 },
  annotations: [{ onset: 0.7, duration: 0.2, label: 'Arousal' }],
});

describe('when the bytes are random', () => {
  it('should only ever throw EdfFormatError', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 2000 }), (bytes) => onlyEdfErrors(() => parseEdf(bytes))),
      { numRuns: 300 },
    );
  });

  it('should only ever throw EdfFormatError from TAL parsing', () => {
    const talByte = fc.constantFrom(0x00, 0x14, 0x15, 0x2b, 0x2d, 0x2e, 0x30, 0x35, 0x41, 0xc3, 0xa9, 0xff);
    fc.assert(
      fc.property(fc.array(talByte, { maxLength: 64 }), fc.boolean(), (bytes, timekeeping) => onlyEdfErrors(() => parseTals(Uint8Array.from(bytes), 0, timekeeping))),
      { numRuns: 500 },
    );
  });
});

describe('when a valid file is truncated', () => {
  it.each([
    ['the motor-nerve file', valid],
    ['a written EDF+C file', written],
  ])('should refuse every truncation of %s with EdfFormatError', (_, file) => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: file.length - 1 }), (length) => {
        expect(() => parseEdf(file.subarray(0, length))).toThrow(EdfFormatError);
      }),
      { numRuns: 200 },
    );
  });
});

describe('when bytes of a valid file are changed', () => {
  it.each([
    ['the motor-nerve file', valid],
    ['a written EDF+C file', written],
  ])('should parse %s or throw EdfFormatError, never anything else', (_, file) => {
    const edit = fc.record({ at: fc.integer({ min: 0, max: file.length - 1 }), value: fc.integer({ min: 0, max: 255 }) });
    fc.assert(
      fc.property(fc.array(edit, { minLength: 1, maxLength: 6 }), (edits) => {
        const bytes = file.slice();
        for (const { at, value } of edits) bytes[at] = value;
        return onlyEdfErrors(() => parseEdf(bytes));
      }),
      { numRuns: 400 },
    );
  });

  it('should survive header fields replaced by number-like text', () => {
    const text = fc.stringMatching(/^[ +\-.0-9e]{0,8}$/);
    const offsets = [184, 236, 244, 252, 256 + 2 * 16 + 2 * 80 + 2 * 8, 256 + 2 * (16 + 80 + 8 * 5 + 80)];
    fc.assert(
      fc.property(fc.constantFrom(...offsets), text, (offset, value) => {
        const bytes = valid.slice();
        const width = offset === 252 ? 4 : 8;
        for (let i = 0; i < width; i++) bytes[offset + i] = (value.padEnd(width, ' ').charCodeAt(i) ?? 32) & 0xff;
        return onlyEdfErrors(() => parseEdf(bytes)) && onlyEdfErrors(() => readEdfHeader(bytes));
      }),
      { numRuns: 400 },
    );
  });
});
