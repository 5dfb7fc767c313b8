import { describe, expect, it } from 'vitest';
import { EdfFormatError, encodeTal, parseTals } from '../../src/signals/edf/index.js';
import { thrownBy } from '../fixtures/edf/build.js';

const bytes = (text: string): Uint8Array => new TextEncoder().encode(text);

function talError(text: string, timekeeping = false): EdfFormatError {
  return thrownBy(EdfFormatError, () => parseTals(bytes(text), 1000, timekeeping));
}

describe('when parsing the TAL examples of EDF+ §2.2.2 (Kemp & Olivan 2003)', () => {
  it('should read "+180 Lights off / Close door" as a 28-byte TAL with two annotations at 180 s', () => {
    const tal = bytes('+180\x14Lights off\x14Close door\x14\x00');
    expect(tal.length).toBe(28);
    expect(parseTals(tal, 0, false).annotations).toEqual([
      { onset: 180, duration: null, label: 'Lights off' },
      { onset: 180, duration: null, label: 'Close door' },
    ]);
  });

  it('should read the apnea at 1800.2 s lasting 25.5 s', () => {
    expect(parseTals(bytes('+1800.2\x1525.5\x14Apnea\x14\x00'), 0, false).annotations).toEqual([{ onset: 1800.2, duration: 25.5, label: 'Apnea' }]);
  });

  it('should read both TALs in sequence and ignore the 0x00 padding after them (EDF+ §2.2.2)', () => {
    const text = '+180\x14Lights off\x14Close door\x14\x00+1800.2\x1525.5\x14Apnea\x14\x00\x00\x00\x00\x00';
    expect(parseTals(bytes(text), 0, false).annotations.map((a) => a.label)).toEqual(['Lights off', 'Close door', 'Apnea']);
  });

  it('should encode those two TALs back to the same bytes', () => {
    expect(encodeTal(180, null, ['Lights off', 'Close door'])).toEqual(bytes('+180\x14Lights off\x14Close door\x14\x00'));
    expect(encodeTal(1800.2, 25.5, ['Apnea'])).toEqual(bytes('+1800.2\x1525.5\x14Apnea\x14\x00'));
  });
});

describe('when parsing time-keeping TALs (EDF+ §2.2.4)', () => {
  it('should return "+567 0x14 0x14" as a record start of 567 s with no annotation', () => {
    expect(parseTals(bytes('+567\x14\x14\x00'), 0, true)).toEqual({ recordStart: 567, annotations: [] });
  });

  it('should keep further texts of the time-keeping TAL and later TALs as annotations', () => {
    const parsed = parseTals(bytes('+0.5\x14\x14Recording starts\x14\x00+1\x14Eyes closed\x14\x00'), 0, true);
    expect(parsed.recordStart).toBe(0.5);
    expect(parsed.annotations).toEqual([
      { onset: 0.5, duration: null, label: 'Recording starts' },
      { onset: 1, duration: null, label: 'Eyes closed' },
    ]);
  });

  it('should refuse a record whose first TAL is not time-keeping', () => {
    expect(talError('+180\x14Lights off\x14\x00', true).message).toContain('not a time-keeping TAL');
  });

  it('should refuse a record without any TAL when one is required', () => {
    expect(talError('\x00\x00\x00\x00', true).message).toContain('has no time-keeping TAL');
  });
});

describe('when onsets or durations are negative (EDF+ §2.2.2: onset carries a mandatory sign)', () => {
  it('should accept a negative onset: an event before the file start', () => {
    expect(parseTals(bytes('-0.065\x1510\x14Before start\x14\x00'), 0, false).annotations).toEqual([{ onset: -0.065, duration: 10, label: 'Before start' }]);
    expect(encodeTal(-0.065, 10, ['Before start'])).toEqual(bytes('-0.065\x1510\x14Before start\x14\x00'));
  });

  it('should refuse a negative duration', () => {
    const e = talError('+10\x15-5\x14Apnea\x14\x00');
    expect(e.message).toContain('duration "-5", which is negative');
    expect(e.offset).toBe(1000);
    expect(() => encodeTal(10, -5, ['Apnea'])).toThrow(RangeError);
  });

  it('should refuse a signed duration (from memory of the EDF+ text: duration is unsigned)', () => {
    expect(talError('+10\x15+5\x14Apnea\x14\x00').message).toContain('carries a sign');
  });
});

describe('when a TAL is malformed', () => {
  it('should refuse an onset without its sign', () => {
    const e = talError('180\x14Lights off\x14\x00');
    expect(e.field).toBe('annotation TAL');
    expect(e.message).toContain('onset "180", which has no leading + or − sign');
  });

  it('should refuse an onset with characters other than + − . 0–9', () => {
    expect(talError('+1,5\x14x\x14\x00').message).toContain('is not a number');
    expect(talError('+1e3\x14x\x14\x00').message).toContain('is not a number');
  });

  it('should refuse a TAL without the trailing 0x14 0x00', () => {
    expect(talError('+180\x14Lights off').message).toContain('does not end with 0x14 0x00');
    expect(talError('+180\x14Lights off\x00').message).toContain('not closed by 0x14');
    expect(talError('+180\x00').message).toContain('no 0x14 after its onset');
    expect(talError('+180\x1525').message).toContain('no 0x14 after its duration');
  });

  it('should give the file offset of the TAL that is wrong', () => {
    expect(talError('+1\x14a\x14\x00+2\x14b').offset).toBe(1000 + 6);
  });

  it('should decode UTF-8 text (EDF+ §2.2.3) and refuse bytes that are not UTF-8', () => {
    expect(parseTals(bytes('+1\x14Schlafstadium Ü – µV\x14\x00'), 0, false).annotations[0]!.label).toBe('Schlafstadium Ü – µV');
    const bad = Uint8Array.from([...bytes('+1\x14'), 0xc3, 0x28, 0x14, 0x00]);
    expect(() => parseTals(bad, 0, false)).toThrow(EdfFormatError);
  });

  it('should refuse labels holding the structural bytes when encoding', () => {
    expect(() => encodeTal(1, null, ['a\x14b'])).toThrow(RangeError);
  });
});
