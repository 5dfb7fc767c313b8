/**
 * A reader for RFC 4180 CSV, written for the tests apart from the writer: a field is quoted or
 * not (§2 rules 5–6), "" inside quotes is one quote (§2 rule 7), records end with CRLF (§2 rule 1).
 */
export function parseCsv(text: string): string[][] {
  const records: string[][] = [];
  let record: string[] = [];
  let field = '';
  let i = 0;
  let quoted = false;
  while (i < text.length) {
    const ch = text[i]!;
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        field += '"';
        i += 2;
      } else if (ch === '"') {
        quoted = false;
        i++;
      } else {
        field += ch;
        i++;
      }
    } else if (ch === '"' && field === '') {
      quoted = true;
      i++;
    } else if (ch === ',') {
      record.push(field);
      field = '';
      i++;
    } else if (ch === '\r' && text[i + 1] === '\n') {
      record.push(field);
      records.push(record);
      record = [];
      field = '';
      i += 2;
    } else if (ch === '"' || ch === '\r' || ch === '\n') {
      throw new Error(`bare ${JSON.stringify(ch)} outside quotes at offset ${i}`);
    } else {
      field += ch;
      i++;
    }
  }
  if (field !== '' || record.length > 0) throw new Error('the last record has no CRLF');
  return records;
}

/** Rows as objects keyed by the header's names. */
export function csvObjects(text: string): Record<string, string>[] {
  const [header, ...rows] = parseCsv(text);
  return rows.map((r) => {
    if (r.length !== header!.length) throw new Error(`a row has ${r.length} fields, the header ${header!.length}`);
    return Object.fromEntries(header!.map((h, i) => [h, r[i]!]));
  });
}
