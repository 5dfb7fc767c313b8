import { describe, expect, it } from 'vitest';
import { EdfFormatError, readEdfHeader } from '../../src/signals/edf/index.js';
import { ascii, headerText, motorNerveHeader, thrownBy, type FixtureHeader } from '../fixtures/edf/build.js';

function headerBytes(h: FixtureHeader): Uint8Array {
  return ascii(headerText(h));
}

function withSignal(patch: Partial<FixtureHeader['signals'][number]>, index = 0): FixtureHeader {
  const signals = motorNerveHeader.signals.map((s, i) => (i === index ? { ...s, ...patch } : s));
  return { ...motorNerveHeader, signals };
}

function errorOf(bytes: Uint8Array): EdfFormatError {
  return thrownBy(EdfFormatError, () => readEdfHeader(bytes));
}

describe('when reading the header of the EDF+ motor-nerve example (Kemp & Olivan 2003, §3.7)', () => {
  const header = readEdfHeader(headerBytes(motorNerveHeader));

  it('should take 768 bytes for 2 signals, as the spec example says (256 + 256·ns, docs/references.md §6)', () => {
    expect(headerText(motorNerveHeader).length).toBe(768);
    expect(header.headerBytes).toBe(768);
    expect(header.signalCount).toBe(2);
  });

  it('should read the fixed fields as printed in §3.7', () => {
    expect(header.version).toBe('0');
    expect(header.startDateField).toBe('17.04.01');
    expect(header.startTimeField).toBe('11.25.00');
    expect(header.start).toEqual({ year: 2001, month: 4, day: 17, hour: 11, minute: 25, second: 0 });
    expect(header.variant).toBe('EDF+D');
    expect(header.recordCount).toBe(2);
    expect(header.recordDuration).toBe(0.05);
    expect(header.recordingId).toBe('Startdate 17-APR-2001 MNC-0001/2001 NN Invented');
  });

  it('should read signal 1 "R APB" with its §3.7 fields and a 20 000 Hz rate (1000 samples / 0.050 s)', () => {
    const s = header.signals[0]!;
    expect(s.label).toBe('R APB');
    expect(s.transducer).toBe('AgAgCl electrodes');
    expect(s.physicalDimension).toBe('mV');
    expect([s.physicalMinimum, s.physicalMaximum, s.digitalMinimum, s.digitalMaximum]).toEqual([-100, 100, -2048, 2047]);
    expect(s.prefiltering).toBe('HP:3Hz LP:20kHz');
    expect(s.samplesPerRecord).toBe(1000);
    expect(s.samplingRate).toBeCloseTo(20000, 9);
    expect(s.isAnnotation).toBe(false);
  });

  it('should give the gain 200/4095 mV per step (docs/references.md §6, computed from the §3.7 ranges)', () => {
    expect(header.signals[0]!.gain).toBeCloseTo(200 / 4095, 15);
  });

  it('should mark signal 2 as the annotation signal with 60 samples = 120 bytes, and a 2120-byte record', () => {
    const s = header.signals[1]!;
    expect(s.label).toBe('EDF Annotations');
    expect(s.isAnnotation).toBe(true);
    expect(s.samplingRate).toBeNull();
    expect(s.samplesPerRecord).toBe(60);
    expect(s.recordByteOffset).toBe(2000);
    expect(header.annotationSignals).toEqual([1]);
    // docs/references.md §6: record size 2120 bytes = 2·(1000 + 60).
    expect(header.recordBytes).toBe(2120);
  });

  it('should need only the header bytes, not the data records', () => {
    const bytes = new Uint8Array(768 + 10);
    bytes.set(headerBytes(motorNerveHeader));
    expect(readEdfHeader(bytes).recordBytes).toBe(2120);
  });
});

describe('when applying the two-digit year rule (EDF+ §2.1.3: 85–99 → 1985–1999, 00–84 → 2000–2084)', () => {
  it.each([
    ['01.01.85', 1985],
    ['31.12.99', 1999],
    ['01.01.00', 2000],
    ['29.02.84', 2084],
  ])('should read %s as year %i', (date, year) => {
    expect(readEdfHeader(headerBytes({ ...motorNerveHeader, startDate: date })).start.year).toBe(year);
  });
});

describe('when a header field is wrong', () => {
  it('should name the header byte count and the size 2 signals need (docs/references.md §6: 256 + 256·ns)', () => {
    const e = errorOf(headerBytes({ ...motorNerveHeader, headerBytes: '512' }));
    expect(e.message).toBe('header byte count at offset 184 is 512 but 2 signals need 768');
    expect(e.field).toBe('header byte count');
    expect(e.offset).toBe(184);
  });

  it('should refuse digital maximum ≤ digital minimum (EDF+ §2.1.3 item 5) at its per-signal offset', () => {
    const e = errorOf(headerBytes(withSignal({ digitalMaximum: '-2048' })));
    expect(e.field).toBe('digital maximum of signal 1');
    // 256 + ns·(16 + 80 + 8 + 8 + 8 + 8) = 256 + 2·128 = 512 (offsets computed from the field widths).
    expect(e.offset).toBe(512);
    expect(e.message).toContain('not above the digital minimum -2048');
  });

  it('should refuse physical maximum = physical minimum (the gain would be undefined)', () => {
    const e = errorOf(headerBytes(withSignal({ physicalMaximum: '-100' })));
    expect(e.field).toBe('physical maximum of signal 1');
    expect(e.offset).toBe(256 + 2 * (16 + 80 + 8 + 8));
  });

  it('should accept physical maximum below physical minimum (negative gain, EDF+ §2.1.3 item 5)', () => {
    const h = readEdfHeader(headerBytes(withSignal({ physicalMinimum: '100', physicalMaximum: '-100' })));
    expect(h.signals[0]!.gain).toBeCloseTo(-200 / 4095, 15);
  });

  it('should refuse samples per record ≤ 0', () => {
    for (const value of ['0', '-5']) {
      const e = errorOf(headerBytes(withSignal({ samplesPerRecord: value })));
      expect(e.field).toBe('samples per data record of signal 1');
      expect(e.offset).toBe(256 + 2 * (16 + 80 + 8 * 5 + 80));
    }
  });

  it('should refuse a record count of −1 (a file still being recorded, Kemp et al. 1992)', () => {
    const e = errorOf(headerBytes({ ...motorNerveHeader, recordCount: '-1' }));
    expect(e.field).toBe('data record count');
    expect(e.offset).toBe(236);
  });

  it.each([
    ['recordDuration', 'abc', 'data record duration', 244],
    ['recordCount', '2.5', 'data record count', 236],
    ['signalCount', 'two', 'signal count', 252],
    ['headerBytes', '', 'header byte count', 184],
    ['recordDuration', '1e-3', 'data record duration', 244],
  ] as const)('should refuse a non-numeric %s "%s"', (key, value, field, offset) => {
    const e = errorOf(headerBytes({ ...motorNerveHeader, [key]: value }));
    expect(e.field).toBe(field);
    expect(e.offset).toBe(offset);
  });

  it('should refuse a non-numeric digital minimum at its per-signal offset', () => {
    const e = errorOf(headerBytes(withSignal({ digitalMinimum: '-20x8' }, 1)));
    expect(e.field).toBe('digital minimum of signal 2');
    expect(e.offset).toBe(256 + 2 * (16 + 80 + 8 + 8 + 8) + 8);
  });

  it('should refuse digital limits outside the 16-bit range', () => {
    expect(errorOf(headerBytes(withSignal({ digitalMaximum: '40000' }))).field).toBe('digital maximum of signal 1');
  });

  it('should refuse a version other than "0"', () => {
    expect(errorOf(headerBytes({ ...motorNerveHeader, version: '1' })).field).toBe('version');
  });

  it.each([['32.01.01'], ['29.02.01'], ['01.13.01'], ['1.1.01'], ['01-01-01']])('should refuse the start date %s', (date) => {
    expect(errorOf(headerBytes({ ...motorNerveHeader, startDate: date })).field).toBe('start date');
  });

  it('should refuse the start time 24.00.00', () => {
    expect(errorOf(headerBytes({ ...motorNerveHeader, startTime: '24.00.00' })).offset).toBe(176);
  });

  it('should refuse an EDF+ file without an "EDF Annotations" signal', () => {
    const e = errorOf(headerBytes(withSignal({ label: 'Annotations' }, 1)));
    expect(e.field).toBe('reserved');
    expect(e.message).toContain('EDF+D');
  });

  it('should refuse a reserved field that starts EDF+ but is neither EDF+C nor EDF+D', () => {
    expect(errorOf(headerBytes({ ...motorNerveHeader, reserved: 'EDF+X' })).field).toBe('reserved');
  });

  it('should refuse a zero record duration when ordinary signals are present', () => {
    expect(errorOf(headerBytes({ ...motorNerveHeader, recordDuration: '0' })).field).toBe('data record duration');
  });

  it('should refuse zero signals', () => {
    const bytes = ascii(headerText({ ...motorNerveHeader, signals: [], signalCount: '0' }));
    expect(errorOf(bytes).field).toBe('signal count');
  });

  it('should refuse non-ASCII text unless allowNonAsciiText is set', () => {
    const bytes = headerBytes(motorNerveHeader);
    bytes[8] = 0xe9; // Latin-1 é in the patient id
    const e = errorOf(bytes);
    expect(e.field).toBe('local patient identification');
    expect(e.message).toContain('0xe9 at offset 8');
    expect(readEdfHeader(bytes, { allowNonAsciiText: true }).patientId.startsWith('é')).toBe(true);
  });
});

describe('when the header is truncated', () => {
  it('should say how many bytes the fixed header needs', () => {
    const e = errorOf(headerBytes(motorNerveHeader).subarray(0, 100));
    expect(e.message).toContain('256 bytes are needed but only 100 are present');
  });

  it('should say how many bytes the signal headers need', () => {
    const e = errorOf(headerBytes(motorNerveHeader).subarray(0, 700));
    expect(e.message).toContain('768 bytes are needed but only 700 are present');
  });

  it('should refuse an empty byte string', () => {
    expect(errorOf(new Uint8Array(0)).offset).toBe(0);
  });
});
