/**
 * Invariants of the preview's CSV reader and of the formula layout (fast-check, fixed seeds):
 * records written the RFC 4180 way (fields with a separator, a quote or a line break quoted,
 * quotes doubled) read back unchanged with any of the three separators; a table of numbers
 * written with a separator and a decimal mark is detected as written and reads back as the same
 * numbers; laid-out blocks never overlap, whatever their sizes.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseCsv, readCsv, type CsvSeparator, type DecimalMark } from '../../taskpane/csv.js';
import { sourceFromCsv } from '../../taskpane/sources.js';
import { layoutBlocks } from '../../taskpane/layout.js';

const separators: CsvSeparator[] = [',', ';', '\t'];

/** One field as RFC 4180 §2.6–2.7 writes it. */
function quote(field: string, sep: string): string {
  return /["\r\n]/.test(field) || field.includes(sep) ? `"${field.replace(/"/g, '""')}"` : field;
}

describe('CSV properties', () => {
  it('records written RFC 4180 style read back unchanged, for each separator', () => {
    const field = fc.string({ unit: fc.constantFrom('a', 'b', '1', ' ', ',', ';', '\t', '"', '\n', '\r\n', 'ß'), maxLength: 6 });
    fc.assert(
      fc.property(fc.constantFrom(...separators), fc.array(fc.array(field, { minLength: 2, maxLength: 4 }), { minLength: 1, maxLength: 6 }), (sep, records) => {
        const text = `${records.map((r) => r.map((f) => quote(f, sep)).join(sep)).join('\r\n')}\r\n`;
        expect(parseCsv(text, sep)).toEqual(records);
      }),
      { seed: 4180, numRuns: 300 },
    );
  });

  it('a table of numbers is detected with the separator and decimal mark it was written with, and reads back as the same numbers', () => {
    const value = fc.integer({ min: -99999, max: 99999 }).map((i) => i / 100);
    fc.assert(
      fc.property(
        fc.constantFrom(...separators),
        fc.constantFrom<DecimalMark>('.', ','),
        fc.integer({ min: 2, max: 4 }),
        fc.array(fc.array(value, { minLength: 4, maxLength: 4 }), { minLength: 3, maxLength: 12 }),
        (sep, decimal, cols, rows) => {
          // A decimal comma goes with ";" or tab only, as such files are written.
          const mark: DecimalMark = sep === ',' ? '.' : decimal;
          const table = rows.map((r) => r.slice(0, cols));
          // Make sure at least one value has a fraction, so the mark can be seen.
          table[0]![0] = 0.5;
          const header = Array.from({ length: cols }, (_v, c) => `col ${c + 1}`);
          const text = [header.join(sep), ...table.map((r) => r.map((v) => String(v).replace('.', mark)).join(sep))].join('\n');
          expect(readCsv(text).format).toEqual({ separator: sep, decimal: mark });
          const sheet = sourceFromCsv('t.csv', text).sheets[0]!;
          expect(sheet.columns.map((c) => c.cells)).toEqual(header.map((_h, c) => table.map((r) => r[c])));
        },
      ),
      { seed: 20261201, numRuns: 300 },
    );
  });
});

describe('layout properties', () => {
  it('blocks of any sizes never overlap, and each label sits left of its formula', () => {
    const block = fc.record({ rows: fc.integer({ min: 1, max: 40 }), cols: fc.integer({ min: 1, max: 8 }) });
    fc.assert(
      fc.property(fc.array(block, { minLength: 1, maxLength: 8 }), fc.integer({ min: 0, max: 3 }), (sizes, gap) => {
        const l = layoutBlocks(
          sizes.map((s, i) => ({ label: `block ${i}`, formula: `=RATCHET.KNOTS(B1:B9,A1:A9,${i + 2})`, ...s })),
          gap,
        );
        const taken = new Set<string>();
        for (const b of l.blocks) {
          const cells = [`${b.dr}:${b.dc - 1}`];
          for (let r = 0; r < b.rows; r++) for (let c = 0; c < b.cols; c++) cells.push(`${b.dr + r}:${b.dc + c}`);
          for (const k of cells) {
            expect(taken.has(k)).toBe(false);
            taken.add(k);
          }
          expect(b.dr + b.rows).toBeLessThanOrEqual(l.rows);
          expect(b.dc + b.cols).toBeLessThanOrEqual(l.cols);
        }
      }),
      { seed: 7, numRuns: 300 },
    );
  });
});
