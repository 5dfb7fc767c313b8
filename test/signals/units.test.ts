import { describe, expect, it } from 'vitest';
import { voltageScaleToMicrovolts } from '../../src/signals/units.js';

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
  it.each([[''], ['   '], ['%'], ['degC'], ['Ohm'], ['kOhm'], ['uA'], ['mmHg'], ['MV'], ['kV'], ['uVV'], ['microvolt'], ['µ']])(
    'should return null for %j',
    (dimension) => {
      expect(voltageScaleToMicrovolts(dimension)).toBeNull();
    },
  );
});
