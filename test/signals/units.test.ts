import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../../src/signals/errors.js';
import { AmplitudeSurvey, resolveUploadUnit, shiftDecimal, voltageScaleToMicrovolts } from '../../src/signals/units.js';

// Expected factors follow from the SI prefixes (BIPM SI Brochure, 9th ed., Table 7):
// (table number 7 from memory) nano 10^-9, micro 10^-6, milli 10^-3, so 1 nV = 0.001 µV, 1 mV = 1000 µV, 1 V = 10^6 µV.
describe('when the dimension is a voltage', () => {
  it.each([
    ['nV', 1e-3],
    ['NV', 1e-3],
    ['uV', 1],
    ['UV', 1],
    ['uv', 1],
    ['\u00b5V', 1],
    ['\u03bcV', 1],
    ['mV', 1e3],
    ['mv', 1e3],
    ['V', 1e6],
    ['v', 1e6],
  ])('should scale %s by %d to microvolts', (dimension, factor) => {
    expect(voltageScaleToMicrovolts(dimension)).toBe(factor);
  });

  it('should ignore the space padding of EDF fields', () => {
    expect(voltageScaleToMicrovolts('uV      ')).toBe(1);
    expect(voltageScaleToMicrovolts(' mV')).toBe(1e3);
  });
});

describe('when the dimension is not a voltage or is ambiguous', () => {
  it.each([[''], ['   '], ['%'], ['degC'], ['Ohm'], ['kOhm'], ['uA'], ['mmHg'], ['MV'], ['kV'], ['uVV'], ['microvolt'], ['µ']])('should return null for %j', (dimension) => {
    expect(voltageScaleToMicrovolts(dimension)).toBeNull();
  });
});

describe('when an upload declares its unit', () => {
  it('should store voltages in µV with the decimal exponent of the SI prefix (BIPM SI Brochure prefixes)', () => {
    expect(resolveUploadUnit(undefined, undefined, '/unit')).toEqual({ unit: 'uV', exponent: 0 });
    expect(resolveUploadUnit('V', undefined, '/unit')).toEqual({ unit: 'uV', exponent: 6 });
    expect(resolveUploadUnit('mV', true, '/unit')).toEqual({ unit: 'uV', exponent: 3 });
    expect(resolveUploadUnit('nV', undefined, '/unit')).toEqual({ unit: 'uV', exponent: -3 });
  });

  it('should refuse an unknown voltage unit with its pointer, and say how to declare a non-voltage', () => {
    expect(() => resolveUploadUnit('uv2', undefined, '/unit')).toThrow(SignalInputError);
    expect(() => resolveUploadUnit('uv2', undefined, '/unit')).toThrow(/unknown voltage unit "uv2".*"voltage": false/);
    expect(() => resolveUploadUnit('MV', undefined, '/query/unit')).toThrow(/megavolts/);
    try {
      resolveUploadUnit('mmHg', undefined, '/query/unit');
    } catch (error) {
      expect((error as SignalInputError).pointer).toBe('/query/unit');
    }
  });

  it('should keep a unit declared as not a voltage as given, and require one', () => {
    expect(resolveUploadUnit(' mmHg ', false, '/unit')).toEqual({ unit: 'mmHg', exponent: 0 });
    expect(() => resolveUploadUnit(undefined, false, '/unit')).toThrow(/must name its unit/);
  });
});

describe('when a number is moved to another decimal unit', () => {
  it('should give the double that the shifted decimal text parses to', () => {
    // 0.000123 V written as µV is "123": the same double as parsing "123" (decimal arithmetic)
    expect(shiftDecimal(0.000123, 6)).toBe(123);
    expect(shiftDecimal(0.00000456, 6)).toBe(4.56);
    expect(shiftDecimal(1.5e-7, 6)).toBe(0.15);
    expect(shiftDecimal(2500, -3)).toBe(2.5);
    expect(shiftDecimal(-0.1, 3)).toBe(-100);
    expect(Object.is(shiftDecimal(-0, 6), -0)).toBe(true);
    // plain multiplication rounds differently (IEEE 754 products; computed with Node's own arithmetic)
    expect(0.000123 * 1e6).not.toBe(123);
    expect(0.00000456 * 1e6).not.toBe(4.56);
  });
});

describe('when a channel amplitude is surveyed', () => {
  // Scalp EEG is a few to a few hundred µV (common practice); the survey warns two decades beyond.
  it('should warn for volts sent as µV and nanovolts sent as µV, and not for EEG-sized channels', () => {
    const survey = new AmplitudeSurvey(['Fz', 'Cz', 'Pz', 'Oz']);
    survey.add(
      0,
      Float64Array.from({ length: 512 }, (_, i) => 20e-6 * Math.sin(i / 5)),
    ); // volts
    survey.add(
      1,
      Float64Array.from({ length: 512 }, (_, i) => 20 * Math.sin(i / 5)),
    );
    survey.add(
      2,
      Float64Array.from({ length: 512 }, (_, i) => 20_000 * Math.sin(i / 5)),
    ); // nV
    survey.add(3, new Float64Array(512)); // zeros: a matter for the quality flags
    const warnings = survey.warnings('uV');
    expect(warnings).toHaveLength(2);
    expect(warnings[0]).toMatch(/"Fz" has an RMS of 0\.0000141 µV.*volts or millivolts/);
    expect(warnings[1]).toMatch(/"Pz" has an RMS of 1\.41e\+4 µV.*nanovolts/);
    expect(survey.warnings('mmHg')).toEqual([]);
  });
});
