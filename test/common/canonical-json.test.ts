import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { canonicalJson } from '../../src/common/canonical-json.js';

describe('canonicalJson', () => {
  it('should sort keys at every depth and drop undefined members', () => {
    expect(canonicalJson({ b: 1, a: { d: [3, { z: 1, y: 2 }], c: undefined } })).toBe('{"a":{"d":[3,{"y":2,"z":1}]},"b":1}');
  });

  it('should round-trip every finite float64 bit for bit (ECMAScript shortest round-trip form)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const back = JSON.parse(canonicalJson([x]))[0] as number;
        return Object.is(x, -0) ? back === 0 : Object.is(back, x);
      }),
      { numRuns: 2000 },
    );
  });

  it('should refuse non-finite numbers instead of writing null', () => {
    expect(() => canonicalJson({ a: [1, Number.NaN] })).toThrow(/\$\.a\[1\]/);
  });

  it('should not depend on insertion order', () => {
    fc.assert(
      fc.property(fc.dictionary(fc.string(), fc.integer()), (d) => {
        const reversed = Object.fromEntries(Object.entries(d).reverse());
        return canonicalJson(d) === canonicalJson(reversed);
      }),
    );
  });
});
