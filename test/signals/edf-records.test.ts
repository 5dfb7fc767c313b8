import { describe, expect, it } from 'vitest';
import { EdfFormatError, decodeEdfRecords, edfRecordByteRange, parseEdf, readEdfHeader } from '../../src/signals/edf/index.js';
import { ascii, concat, headerText, identityFile, int16le, motorNerveFile, motorNerveHeader, talBytes, thrownBy } from '../fixtures/edf/build.js';

function parseError(bytes: Uint8Array): EdfFormatError {
  return thrownBy(EdfFormatError, () => parseEdf(bytes));
}

describe('when decoding 16-bit little-endian samples (Kemp et al. 1992; EDF+ §2.1.3 item 7)', () => {
  it('should read bytes FE FF as −2 and 00 80 as −32768 (two’s complement, computed in docs/references.md §6)', () => {
    const file = identityFile([0, 0, 0]);
    const data = file.length - 6;
    file.set([0xfe, 0xff, 0x00, 0x80, 0xff, 0x7f], data);
    // identityFile calibrates physical = digital, so the samples are the integers themselves.
    expect(Array.from(parseEdf(file).signals[0]!.samples)).toEqual([-2, -32768, 32767]);
  });
});

describe('when parsing the EDF+D motor-nerve file (Kemp & Olivan 2003, §3.7 header, invented records)', () => {
  const file = parseEdf(motorNerveFile());
  const apb = file.signals[0]!;

  it('should hold 768 + 2·2120 bytes', () => {
    expect(motorNerveFile().length).toBe(768 + 2 * 2120);
  });

  it('should return only the ordinary signal, at 20 000 Hz, with 2000 samples', () => {
    expect(file.signals.map((s) => s.label)).toEqual(['R APB']);
    expect(apb.samplingRate).toBeCloseTo(20000, 9);
    expect(apb.samples.length).toBe(2000);
  });

  it('should calibrate digital 0 to 0.024420024 mV and −2048/2047 to ∓100 mV (docs/references.md §6, computed)', () => {
    expect(apb.samples[0]).toBeCloseTo(0.024420024, 9);
    expect(apb.samples[1]).toBeCloseTo(-100, 12);
    expect(apb.samples[2]).toBeCloseTo(100, 12);
    // (−2 + 2048)·200/4095 − 100, by hand.
    expect(apb.samples[3]).toBeCloseTo(2046 * (200 / 4095) - 100, 12);
  });

  it('should take record 2 from the bytes after record 1’s annotation signal', () => {
    // Record 2 holds k mod 7 − 3: k = 0 → −3, k = 4 → 1.
    expect(apb.samples[1000]).toBeCloseTo(2045 * (200 / 4095) - 100, 12);
    expect(apb.samples[1004]).toBeCloseTo(2049 * (200 / 4095) - 100, 12);
  });

  it('should take record starts from the time-keeping TALs and report the gap (EDF+ §2.2.4)', () => {
    expect(Array.from(file.recordStarts)).toEqual([0, 10]);
    expect(file.contiguous).toBe(false);
    expect(file.gaps).toHaveLength(1);
    expect(file.gaps[0]!.afterRecord).toBe(0);
    expect(file.gaps[0]!.start).toBeCloseTo(0.05, 12);
    expect(file.gaps[0]!.end).toBe(10);
  });

  it('should return the annotations with durations, without the time-keeping TALs', () => {
    expect(file.annotations).toEqual([
      { onset: 0, duration: 20, label: 'Stimulus right wrist' },
      { onset: 10, duration: 20, label: 'Stimulus right elbow' },
    ]);
  });
});

describe('when the time-keeping TALs contradict the header', () => {
  it('should refuse an EDF+C file whose second record does not start one duration after the first', () => {
    const bytes = motorNerveFile();
    bytes.set(ascii('EDF+C'), 192);
    const e = parseError(bytes);
    // Record 2 starts at 768 + 2120 = 2888; its TAL follows R APB's 1000 two-byte samples: 2888 + 2000
    // (header size and record layout of the EDF+ §3.7 example, docs/references.md §6).
    expect(e.message).toContain('time-keeping TAL of data record 2 at offset 4888');
    expect(e.message).toContain('EDF+C record must start at 0.05 s');
  });

  it('should accept an EDF+C file whose records follow each other', () => {
    const bytes = motorNerveFile(['+0\x14\x14\x00', '+0.05\x14\x14\x00']);
    bytes.set(ascii('EDF+C'), 192);
    const parsed = parseEdf(bytes);
    expect(parsed.contiguous).toBe(true);
    expect(parsed.gaps).toEqual([]);
  });

  it('should refuse EDF+D records that overlap', () => {
    expect(parseError(motorNerveFile(['+0\x14\x14\x00', '+0.01\x14\x14\x00'])).message).toContain('before the previous record ends');
  });

  it('should refuse a first record that does not start within the first second (+0.X, EDF+ §2.2.4)', () => {
    expect(parseError(motorNerveFile(['+3\x14\x14\x00', '+10\x14\x14\x00'])).message).toContain('+0.X');
  });

  it('should refuse an annotation record whose TAL lacks the trailing 0x14 0x00', () => {
    const e = parseError(motorNerveFile(['+0\x14\x14\x00+0\x1520\x14Stimulus', '+10\x14\x14\x00']));
    expect(e.field).toBe('annotation TAL');
    expect(e.message).toContain('data record 1, signal 2');
  });
});

describe('when the file length does not match the header', () => {
  it('should refuse a truncated file, naming the record count field', () => {
    const e = parseError(motorNerveFile().subarray(0, 768 + 2120 + 100));
    expect(e.field).toBe('data record count');
    expect(e.message).toContain('should be 5008 bytes, but it is 2988 (truncated)');
  });

  it('should refuse trailing bytes', () => {
    expect(parseError(concat(motorNerveFile(), new Uint8Array(3))).message).toContain('(trailing bytes)');
  });

  it('should refuse a record count that claims more records than the file holds', () => {
    const bytes = motorNerveFile();
    bytes.set(ascii('3       '), 236);
    expect(parseError(bytes).offset).toBe(236);
  });
});

describe('when decoding records piecewise', () => {
  const whole = motorNerveFile();
  const header = readEdfHeader(whole.subarray(0, 768));

  it('should give the byte range of a record span', () => {
    expect(edfRecordByteRange(header, 1, 2)).toEqual({ start: 768 + 2120, end: 768 + 2 * 2120 });
  });

  it('should decode record 2 from just its own bytes, equal to the whole-file decode', () => {
    const { start, end } = edfRecordByteRange(header, 1, 2);
    const piece = decodeEdfRecords(header, whole.slice(start, end), { startRecord: 1, endRecord: 2, bytesOrigin: start });
    const full = parseEdf(whole);
    expect(piece.signals[0]!.samples).toEqual(full.signals[0]!.samples.subarray(1000));
    expect(Array.from(piece.recordStarts)).toEqual([10]);
    expect(piece.annotations).toEqual([{ onset: 10, duration: 20, label: 'Stimulus right elbow' }]);
  });

  it('should refuse bytes that do not cover the requested records', () => {
    const { start } = edfRecordByteRange(header, 1, 2);
    expect(() => decodeEdfRecords(header, whole.slice(start, start + 100), { startRecord: 1, bytesOrigin: start })).toThrow(EdfFormatError);
  });

  it('should select channels by label or index and refuse unknown ones', () => {
    expect(decodeEdfRecords(header, whole, { channels: ['R APB'] }).signals).toHaveLength(1);
    expect(decodeEdfRecords(header, whole, { channels: [0, 0] }).signals).toHaveLength(2);
    expect(() => decodeEdfRecords(header, whole, { channels: ['Fz'] })).toThrow(RangeError);
    expect(() => decodeEdfRecords(header, whole, { channels: [1] })).toThrow(/not an ordinary signal/);
    expect(() => decodeEdfRecords(header, whole, { startRecord: 3 })).toThrow(RangeError);
  });
});

describe('when the file is plain EDF', () => {
  it('should be contiguous with record starts r·duration and no annotations', () => {
    const text = headerText({
      startDate: '05.11.23',
      startTime: '08.00.00',
      recordCount: '3',
      recordDuration: '0.5',
      signals: [
        { label: 'Fz', physicalDimension: 'uV', physicalMinimum: '-3276.8', physicalMaximum: '3276.7', digitalMinimum: '-32768', digitalMaximum: '32767', samplesPerRecord: '2' },
        { label: 'Oz', physicalDimension: 'uV', physicalMinimum: '-3276.8', physicalMaximum: '3276.7', digitalMinimum: '-32768', digitalMaximum: '32767', samplesPerRecord: '1' },
      ],
    });
    const file = parseEdf(concat(ascii(text), int16le([10, 20, 5, 30, 40, 6, 50, 60, 7])));
    expect(file.header.variant).toBe('EDF');
    expect(Array.from(file.recordStarts)).toEqual([0, 0.5, 1]);
    expect(file.contiguous).toBe(true);
    expect(file.annotations).toEqual([]);
    // Gain 0.1 µV per step (6553.5/65535), so digital 10 → 1.0 µV; per-signal rates 4 and 2 Hz.
    expect(Array.from(file.signals[0]!.samples).map((x) => +x.toFixed(9))).toEqual([1, 2, 3, 4, 5, 6]);
    expect(Array.from(file.signals[1]!.samples).map((x) => +x.toFixed(9))).toEqual([0.5, 0.6, 0.7]);
    expect(file.signals.map((s) => s.samplingRate)).toEqual([4, 2]);
  });

  it('should treat a plain-EDF signal labelled "EDF Annotations" as ordinary', () => {
    const text = headerText({
      startDate: '05.11.23',
      startTime: '08.00.00',
      recordCount: '1',
      recordDuration: '1',
      signals: [{ label: 'EDF Annotations', physicalMinimum: '-1', physicalMaximum: '1', digitalMinimum: '-32768', digitalMaximum: '32767', samplesPerRecord: '2' }],
    });
    expect(parseEdf(concat(ascii(text), talBytes('+0', 4))).signals).toHaveLength(1);
  });
});

describe('when the bytes come from a Node Buffer that does not start at offset 0 of its memory', () => {
  it('should decode the same samples', () => {
    const file = motorNerveFile();
    const shifted = Buffer.concat([Buffer.alloc(3), Buffer.from(file)]).subarray(3);
    expect(shifted.byteOffset % 2).toBe(1);
    expect(parseEdf(shifted).signals[0]!.samples).toEqual(parseEdf(file).signals[0]!.samples);
  });
});

describe('when an EDF+ file holds annotations only, with a record duration of 0 (EDF+ §2.1.3)', () => {
  it('should read the annotations and the record starts without sampling rates', () => {
    const text = headerText({
      startDate: '02.03.02',
      startTime: '21.30.00',
      reserved: 'EDF+C',
      recordCount: '2',
      recordDuration: '0',
      signals: [{ label: 'EDF Annotations', physicalMinimum: '-1', physicalMaximum: '1', digitalMinimum: '-32768', digitalMaximum: '32767', samplesPerRecord: '20' }],
    });
    const file = parseEdf(concat(ascii(text), talBytes('+0\x14\x14\x00+30\x14W\x14\x00', 40), talBytes('+60\x14\x14\x00+60\x1530\x14N1\x14\x00', 40)));
    expect(file.signals).toEqual([]);
    expect(Array.from(file.recordStarts)).toEqual([0, 60]);
    expect(file.annotations).toEqual([
      { onset: 30, duration: null, label: 'W' },
      { onset: 60, duration: 30, label: 'N1' },
    ]);
  });
});

describe('when one data record holds more TALs than a JS call takes arguments', () => {
  it('should return all 300 000 annotations', () => {
    const tal = '+1\x14a\x14\x00'; // 6 bytes
    const count = 300_000;
    const bytes = 16 + tal.length * count;
    const text = headerText({
      startDate: '02.03.02',
      startTime: '21.30.00',
      reserved: 'EDF+C',
      recordCount: '1',
      recordDuration: '0',
      signals: [{ label: 'EDF Annotations', physicalMinimum: '-1', physicalMaximum: '1', digitalMinimum: '-32768', digitalMaximum: '32767', samplesPerRecord: String(bytes / 2) }],
    });
    const file = parseEdf(concat(ascii(text), talBytes('+0\x14\x14\x00' + tal.repeat(count), bytes)));
    expect(file.annotations).toHaveLength(count);
  });
});
