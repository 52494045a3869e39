/**
 * The preview's CSV reader (taskpane/csv.ts) against Python's csv module: the records of every
 * case in test/reference/fixtures/csv_files.json as csv.reader splits them (Python 3.11, dialect
 * "excel" with the case's delimiter; generator test/reference/gen_csv_files.py, `npm run refs`),
 * and the detected separator against the delimiter the text was written with and, where the
 * fixture asked for it, against csv.Sniffer's guess. csv.reader gives a blank line as an empty
 * record, the preview as one empty field (a blank worksheet row); that is the one difference.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readCsv } from '../../taskpane/csv.js';

interface Case {
  name: string;
  text: string;
  delimiter: ',' | ';' | '\t';
  records: string[][];
  sniffed: string | null;
}
const fixture = JSON.parse(readFileSync(new URL('../reference/fixtures/csv_files.json', import.meta.url), 'utf8')) as { cases: Case[] };

describe('CSV reader against Python csv (csv_files.json)', () => {
  it('has the cases of the fixture', () => {
    expect(fixture.cases.length).toBeGreaterThanOrEqual(10);
  });

  it.each(fixture.cases.map((c) => [c.name, c] as const))('%s: same records as csv.reader, separator detected', (_name, c) => {
    const read = readCsv(c.text);
    expect(read.format.separator).toBe(c.delimiter);
    if (c.sniffed !== null) expect(read.format.separator).toBe(c.sniffed);
    expect(read.records).toEqual(c.records.map((r) => (r.length === 0 ? [''] : r)));
    expect(readCsv(`\uFEFF${c.text}`).records).toEqual(read.records);
  });
});
