import { describe, expect, it } from 'vitest';
import { DomainError } from '../../src/common/errors.js';
import { parseCsv, readCsvManifest, readJsonEntries } from '../../src/studies/entries.js';

function refusal(read: () => unknown): DomainError {
  try {
    read();
  } catch (error) {
    if (error instanceof DomainError) return error;
    throw error;
  }
  throw new Error('expected a refusal');
}

describe('when a CSV manifest is parsed', () => {
  it('should follow RFC 4180 §2: quoted commas, line breaks and doubled quotes, CRLF or LF', () => {
    // RFC 4180 §2 rules 5–7: fields may be quoted; a quoted field may hold commas and line breaks; a
    // quote inside one is doubled.
    const text = 'signal,subject,note\r\nsig_a,p01,"eyes, closed"\r\nsig_b,p02,"said ""ok""\nthen slept"\nsig_c,p03,\r\n';
    expect(parseCsv(text).rows).toEqual([
      ['signal', 'subject', 'note'],
      ['sig_a', 'p01', 'eyes, closed'],
      ['sig_b', 'p02', 'said "ok"\nthen slept'],
      ['sig_c', 'p03', ''],
    ]);
  });

  it('should read a last record without a line break and skip a byte order mark and blank lines', () => {
    // RFC 4180 §2 rule 2: the last record may or may not end with a line break.
    expect(parseCsv('\ufeffa,b\n\n1,2').rows).toEqual([
      ['a', 'b'],
      ['1', '2'],
    ]);
  });

  it('should refuse an unclosed quote and text after a closing quote', () => {
    expect(refusal(() => parseCsv('a,b\n"open,2\n')).extensions).toMatchObject({ reason: 'malformed' });
    expect(refusal(() => parseCsv('a,b\n"x"y,2\n')).detail).toMatch(/after a closing quote/);
  });

  it('should type start, end and :number columns as numbers and keep other cells as text', () => {
    const [entry] = readCsvManifest('signal,subject,start,end,channels,age:number,site\nsig_x,0042,1.5,9,O1; O2,31.25,2\n');
    expect(entry).toMatchObject({ signal: 'sig_x', view: { start: 1.5, end: 9, channels: ['O1', 'O2'] }, metadata: { subject: '0042', age: 31.25, site: '2' } });
  });

  it('should name the row and column of every refusal', () => {
    const wrong = refusal(() => readCsvManifest('signal,subject,age:number\nsig_a,p1,30\nsig_b,p2,old\n'));
    expect(wrong).toMatchObject({ code: 'invalid-manifest', pointer: '/rows/2/age', extensions: { reason: 'wrong-type', row: 2, column: 'age' } });
    expect(wrong.detail).toBe('row 2, column "age": "old" is not a number; nothing was added');
    expect(refusal(() => readCsvManifest('signal,subject,subject\n')).extensions).toMatchObject({ reason: 'bad-key', column: 'subject' });
    expect(refusal(() => readCsvManifest('signal,subject,dose:integer\n')).extensions).toMatchObject({ reason: 'bad-key', column: 'dose:integer' });
    expect(refusal(() => readCsvManifest('signal,subject\nsig_a,\n')).extensions).toMatchObject({ reason: 'missing-column', row: 1, column: 'subject' });
    expect(refusal(() => readCsvManifest('signal,upload,subject\nsig_a,upl_b,p1\n')).extensions).toMatchObject({ reason: 'malformed', row: 1, column: 'upload' });
    expect(refusal(() => readCsvManifest('signal,subject\n')).extensions).toMatchObject({ reason: 'malformed' });
  });
});

describe('when JSON entries are read', () => {
  it('should refuse reserved, malformed and oversized keys and values, naming the entry and key', () => {
    const one = (metadata: unknown) => () =>
      readJsonEntries({
        entries: [
          { signal: 'sig_a', metadata: { subject: 'p1' } },
          { signal: 'sig_b', metadata },
        ],
      });
    expect(refusal(one({ subject: 'p2', resultHash: 'x' }))).toMatchObject({ pointer: '/entries/1/metadata/resultHash', extensions: { reason: 'bad-key', row: 2 } });
    expect(refusal(one({ subject: 'p2', '2nd': 'x' })).extensions).toMatchObject({ reason: 'bad-key', column: '2nd' });
    expect(refusal(one({ subject: 'p2', note: 'x'.repeat(257) })).extensions).toMatchObject({ reason: 'too-large', column: 'note' });
    expect(refusal(one({ subject: 'p2', weight: Number.NaN })).extensions).toMatchObject({ reason: 'wrong-type', column: 'weight' });
    expect(refusal(one({ subject: 'p2', tags: ['a'] })).extensions).toMatchObject({ reason: 'wrong-type', column: 'tags' });
    expect(refusal(one({ session: 'early' })).extensions).toMatchObject({ reason: 'missing-column', column: 'subject' });
    const many = Object.fromEntries(Array.from({ length: 65 }, (_, i) => [`k${i}`, i]));
    expect(refusal(one({ subject: 'p2', ...many })).extensions).toMatchObject({ reason: 'too-large' });
  });

  it('should refuse fields outside the entry shape instead of taking them for metadata', () => {
    const error = refusal(() => readJsonEntries({ entries: [{ signal: 'sig_a', subject: 'p1', metadata: { subject: 'p1' } }] }));
    expect(error).toMatchObject({ pointer: '/entries/0/subject', extensions: { reason: 'bad-key', row: 1 } });
    expect(refusal(() => readJsonEntries({ entries: [] })).extensions).toMatchObject({ reason: 'malformed' });
    expect(refusal(() => readJsonEntries([{ signal: 'sig_a' }])).pointer).toBe('/entries');
  });
});
