import canonicalize from 'canonicalize';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { canonicalJson, CanonicalJsonError } from '../../src/common/canonical-json.js';

function fromBits(hex: string): number {
  const view = new DataView(new ArrayBuffer(8));
  view.setBigUint64(0, BigInt(`0x${hex}`));
  return view.getFloat64(0);
}

// Code units 0x0000–0xFFFF one by one, so that lone surrogates and control characters turn up.
const anyUtf16 = fc.string({ unit: fc.integer({ min: 0, max: 0xffff }).map((u) => String.fromCharCode(u)), maxLength: 12 });

describe('canonicalJson', () => {
  describe('when checked against the examples of RFC 8785', () => {
    // RFC 8785 Appendix B, "Number Serialization Samples" (IEEE 754 bits → JCS text). From memory of
    // the RFC's table; Node's own Number.prototype.toString agrees with every row.
    const table: [string, string][] = [
      ['0000000000000000', '0'],
      ['8000000000000000', '0'],
      ['0000000000000001', '5e-324'],
      ['8000000000000001', '-5e-324'],
      ['7fefffffffffffff', '1.7976931348623157e+308'],
      ['ffefffffffffffff', '-1.7976931348623157e+308'],
      ['4340000000000000', '9007199254740992'],
      ['c340000000000000', '-9007199254740992'],
      ['4430000000000000', '295147905179352830000'],
      ['44b52d02c7e14af5', '9.999999999999997e+22'],
      ['44b52d02c7e14af6', '1e+23'],
      ['44b52d02c7e14af7', '1.0000000000000001e+23'],
      ['444b1ae4d6e2ef4e', '999999999999999700000'],
      ['444b1ae4d6e2ef4f', '999999999999999900000'],
      ['444b1ae4d6e2ef50', '1e+21'],
      ['3eb0c6f7a0b5ed8c', '9.999999999999997e-7'],
      ['3eb0c6f7a0b5ed8d', '0.000001'],
      ['41b3de4355555553', '333333333.3333332'],
      ['41b3de4355555554', '333333333.33333325'],
      ['41b3de4355555555', '333333333.3333333'],
      ['41b3de4355555556', '333333333.3333334'],
      ['41b3de4355555557', '333333333.33333343'],
      ['becbf647612f3696', '-0.0000033333333333333333'],
      ['43143ff3c1cb0959', '1424953923781206.2'],
    ];
    it.each(table)('should write the float64 with bits %s as %s (RFC 8785 Appendix B)', (bits, text) => {
      expect(canonicalJson(fromBits(bits))).toBe(text);
      expect(canonicalJson([fromBits(bits)])).toBe(`[${text}]`);
    });

    it('should refuse the NaN and Infinity rows of Appendix B (7fffffffffffffff, 7ff0000000000000)', () => {
      expect(() => canonicalJson(fromBits('7fffffffffffffff'))).toThrow(CanonicalJsonError);
      expect(() => canonicalJson(fromBits('7ff0000000000000'))).toThrow(CanonicalJsonError);
    });

    it('should write the example of §3.2.2 (primitive data types) as the RFC prints it', () => {
      // RFC 8785 §3.2.2: the input text and its canonical form, from memory of the RFC.
      const input = JSON.parse(String.raw`{
        "numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001],
        "string": "\u20ac$\u000F\u000aA'\u0042\u0022\u005c\\\"\/",
        "literals": [null, true, false]
      }`) as unknown;
      expect(canonicalJson(input)).toBe(String.raw`{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\u000f\nA'B\"\\\\\"/"}`);
    });

    it('should order the members of the §3.2.3 sorting example by UTF-16 code units', () => {
      // RFC 8785 §3.2.3, from memory of the RFC: the emoji (a surrogate pair, 0xD83D…) sorts before
      // U+FB33 although its code point is larger, because the comparison is by UTF-16 code unit.
      const input = JSON.parse(String.raw`{
        "\u20ac": "Euro Sign",
        "\r": "Carriage Return",
        "\ufb33": "Hebrew Letter Dalet With Dagesh",
        "1": "One",
        "\ud83d\ude00": "Emoji: Grinning Face",
        "\u0080": "Control",
        "\u00f6": "Latin Small Letter O With Diaeresis"
      }`) as Record<string, string>;
      // Read the order from the text: JSON.parse would put the integer-like name "1" first again.
      const text = canonicalJson(input);
      const order = Object.values(input).sort((a, b) => text.indexOf(`"${a}"`) - text.indexOf(`"${b}"`));
      expect(order).toEqual(['Carriage Return', 'One', 'Control', 'Latin Small Letter O With Diaeresis', 'Euro Sign', 'Emoji: Grinning Face', 'Hebrew Letter Dalet With Dagesh']);
      expect(text.startsWith(String.raw`{"\r":"Carriage Return","1":"One",`)).toBe(true);
    });
  });

  describe('when compared with an independent implementation (the canonicalize package)', () => {
    it('should write every JSON value exactly as it does', () => {
      fc.assert(
        fc.property(fc.jsonValue({ stringUnit: 'binary', maxDepth: 4 }), (value) => canonicalJson(value) === canonicalize(value)),
        { numRuns: 1000 },
      );
    });

    it('should write every finite float64 exactly as it does', () => {
      fc.assert(
        fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => canonicalJson([x, { x }]) === canonicalize([x, { x }])),
        { numRuns: 5000 },
      );
    });

    it('should accept and refuse the same strings (lone surrogates are not I-JSON)', () => {
      fc.assert(
        fc.property(fc.dictionary(anyUtf16, anyUtf16, { maxKeys: 4 }), (value) => {
          let theirs: string | null;
          let ours: string | null;
          try {
            theirs = canonicalize(Object.values(value)) ?? null;
            if (Object.keys(value).some((k) => /[\ud800-\udfff]/.test(k.replace(/[\ud800-\udbff][\udc00-\udfff]/g, '')))) theirs = null;
          } catch {
            theirs = null;
          }
          try {
            ours = canonicalJson(Object.values(value));
            canonicalJson(value);
          } catch (error) {
            if (!(error instanceof CanonicalJsonError)) throw error;
            ours = null;
          }
          return ours === theirs;
        }),
        { numRuns: 2000 },
      );
    });
  });

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

  it('should refuse non-finite numbers instead of writing null, naming where they are', () => {
    expect(() => canonicalJson({ a: [1, Number.NaN] })).toThrow(/\$\.a\[1\]/);
    try {
      canonicalJson({ a: [1, { 'b/c': Number.POSITIVE_INFINITY }] });
    } catch (error) {
      expect((error as CanonicalJsonError).pointer).toBe('/a/1/b~1c');
    }
    expect.assertions(2);
  });

  it('should refuse a lone surrogate in a member name or a string, naming where it is', () => {
    expect(() => canonicalJson({ '\ud800': 1 })).toThrow(CanonicalJsonError);
    expect(() => canonicalJson({ a: ['x\udc00'] })).toThrow(/\$\.a\[0\]/);
    expect(canonicalJson('\ud83d\ude00')).toBe('"\ud83d\ude00"');
  });

  it('should not depend on insertion order', () => {
    fc.assert(
      fc.property(fc.dictionary(fc.string({ unit: 'binary' }), fc.integer()), (d) => {
        const reversed = Object.fromEntries(Object.entries(d).reverse());
        return canonicalJson(d) === canonicalJson(reversed);
      }),
    );
  });
});
