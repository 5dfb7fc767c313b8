import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createCsvWriter, csvField, csvLine } from '../../src/tables/csv.js';
import type { Column } from '../../src/tables/columns.js';
import { encodeTable } from '../../src/tables/writer.js';
import { parseCsv } from './csv-parse.js';

const columns: Column[] = [
  { name: 'name', type: 'string', unit: null, meaning: '' },
  { name: 'value', type: 'double', unit: null, meaning: '' },
];

describe('when text is written as CSV fields (RFC 4180 §2, docs/references.md §9)', () => {
  it('should end every record, the header included, with CRLF (rule 1) and put the header first (rule 3)', () => {
    const text = [...encodeTable(createCsvWriter(columns), [['a', 1]])].join('');
    expect(text).toBe('name,value\r\na,1\r\n');
  });

  it('should enclose a field holding a comma, a double quote, CR or LF in double quotes (rule 6)', () => {
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('two\r\nlines')).toBe('"two\r\nlines"');
    expect(csvField('line\nfeed')).toBe('"line\nfeed"');
    expect(csvField('carriage\rreturn')).toBe('"carriage\rreturn"');
  });

  it('should escape a double quote inside a quoted field by doubling it (rule 7)', () => {
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
  });

  it('should leave other text as it is, spaces included, since spaces are part of a field (rule 4)', () => {
    expect(csvField(' eyes-closed/late ')).toBe(' eyes-closed/late ');
    expect(csvField('µV²/Hz')).toBe('µV²/Hz');
  });

  it('should give any text back unchanged through an RFC 4180 reader', () => {
    fc.assert(
      fc.property(fc.array(fc.string({ unit: fc.constantFrom('a', ',', '"', '\r', '\n', ' ', 'é') }), { minLength: 1, maxLength: 5 }), (cells) => {
        expect(parseCsv(csvLine(cells))).toEqual([cells]);
      }),
    );
  });
});

describe('when numbers are written as CSV fields', () => {
  it('should write every double so that it reads back to the same double, −0 and subnormals included (ECMA-262 Number::toString, docs/references.md §9)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        expect(Object.is(Number(csvField(x)), x)).toBe(true);
      }),
      { numRuns: 20000, examples: [[-0], [5e-324], [Number.MAX_VALUE], [0.1 + 0.2], [-1.7976931348623157e308]] },
    );
  });

  it('should use "." as the decimal point and never a thousands separator', () => {
    expect(csvField(1234567.25)).toBe('1234567.25');
    expect(csvField(1e21)).toBe('1e+21');
  });

  it('should write null as an empty field and booleans as true/false', () => {
    expect(csvLine([null, true, false, 0])).toBe(',true,false,0\r\n');
  });
});

describe('when many rows are written', () => {
  it('should hand out chunks while rows come, each at most one record past the chunk size', () => {
    const writer = createCsvWriter(columns, { chunkChars: 100 });
    const chunks: string[] = [];
    for (let i = 0; i < 1000; i++) {
      const chunk = writer.write([`row ${i}`, i / 7]);
      if (chunk !== null) chunks.push(chunk);
    }
    chunks.push(writer.end());
    expect(chunks.length).toBeGreaterThan(100);
    for (const c of chunks.slice(0, -1)) expect(c.length).toBeLessThan(100 + 40);
    const records = parseCsv(chunks.join(''));
    expect(records.length).toBe(1001);
    expect(Object.is(Number(records[700]![1]), 699 / 7)).toBe(true);
  });
});
