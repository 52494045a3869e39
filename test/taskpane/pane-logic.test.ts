/**
 * The pane's pure helpers: the CSV reader (checked against the rules and examples of RFC 4180,
 * "Common Format and MIME Type for CSV Files", §2), A1 and structured references (Excel's
 * reference syntax (common practice)), formula text, spill sizes, sources, host detection.
 */
import { describe, expect, it } from 'vitest';
import { CsvError, parseCsv, sniffSeparator } from '../../taskpane/csv.js';
import { absoluteRef, columnLetters, columnNumber, intersects, parseAddress, sheetPrefix, spillArea, tableColumnRef } from '../../taskpane/refs.js';
import { candidatesText, formulaFor, parseCandidates, spillSize } from '../../taskpane/formulas.js';
import { columnRef, csvCell, sourceFromCsv, xlsxCell } from '../../taskpane/sources.js';
import { computeFit, knotTableCsv } from '../../taskpane/analysis.js';
import { functionByName } from '../../src/functions/registry.js';

describe('CSV reader (RFC 4180 §2)', () => {
  it('splits records on CRLF and a final line break adds no record (rules 1–2)', () => {
    expect(parseCsv('aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n')).toEqual([
      ['aaa', 'bbb', 'ccc'],
      ['zzz', 'yyy', 'xxx'],
    ]);
    expect(parseCsv('aaa,bbb,ccc\r\nzzz,yyy,xxx')).toEqual([
      ['aaa', 'bbb', 'ccc'],
      ['zzz', 'yyy', 'xxx'],
    ]);
  });
  it('reads quoted fields with commas, line breaks and doubled quotes (rules 5–7)', () => {
    expect(parseCsv('"aaa","b\r\nbb","ccc"\r\nzzz,yyy,xxx')).toEqual([
      ['aaa', 'b\r\nbb', 'ccc'],
      ['zzz', 'yyy', 'xxx'],
    ]);
    expect(parseCsv('"aaa","b""bb","ccc"')).toEqual([['aaa', 'b"bb', 'ccc']]);
    expect(parseCsv('a,"x,y",')).toEqual([['a', 'x,y', '']]);
  });
  it('accepts LF and lone CR line ends, a BOM, and keeps an empty line as a record of one empty field', () => {
    expect(parseCsv('\uFEFFx,y\n1,2\r3,4\n\n5,6\n')).toEqual([['x', 'y'], ['1', '2'], ['3', '4'], [''], ['5', '6']]);
  });
  it('reports an unclosed quote and text after a closing quote with the line number', () => {
    expect(() => parseCsv('x,y\n1,"2\n3,4')).toThrow(new CsvError('a quoted field is not closed (opened on this line)', 2));
    expect(() => parseCsv('x,y\n"1"2,3')).toThrow('CSV line 2: unexpected text after a closing quote: "2,3"');
  });
  it('uses ";" or tab only when the first line has no comma outside quotes', () => {
    expect(sniffSeparator('a;b;c\n1,5;2,5;3')).toBe(';');
    expect(sniffSeparator('a\tb\n1\t2')).toBe('\t');
    expect(sniffSeparator('"a;b",c\n')).toBe(',');
    expect(parseCsv('x;y\n1;2')).toEqual([['x', 'y'], ['1', '2']]);
  });
});

describe('references', () => {
  it('converts column numbers and letters both ways (A = 1, Z = 26, AA = 27, XFD = 16384)', () => {
    expect([1, 26, 27, 702, 703, 16384].map(columnLetters)).toEqual(['A', 'Z', 'AA', 'ZZ', 'AAA', 'XFD']);
    expect(['a', 'Z', 'AA', 'XFD'].map(columnNumber)).toEqual([1, 26, 27, 16384]);
  });
  it('parses cells, ranges, sheets (quoted with doubled apostrophes) and whole columns', () => {
    expect(parseAddress("'Kiln ''24'!$B$2:b40")).toEqual({ sheet: "Kiln '24", r1: 2, c1: 2, r2: 40, c2: 2 });
    expect(parseAddress('Data!A:A')).toEqual({ sheet: 'Data', r1: 1, c1: 1, r2: 1048576, c2: 1 });
    expect(parseAddress('C9:A2')).toEqual({ sheet: undefined, r1: 2, c1: 1, r2: 9, c2: 3 });
    expect(() => parseAddress('B2:')).toThrow('"B2:" is not a cell or range address');
    expect(() => parseAddress('A0')).toThrow('"A0" is outside the worksheet');
  });
  it('writes absolute references, quoting sheet names that need it', () => {
    expect(absoluteRef(parseAddress('Data!A2:A29'))).toBe('Data!$A$2:$A$29');
    expect(absoluteRef(parseAddress("'My data'!B3"))).toBe("'My data'!$B$3");
    expect(sheetPrefix('A1')).toBe("'A1'!"); // a name that looks like a cell must be quoted
    expect(sheetPrefix('Sheet_1')).toBe('Sheet_1!');
  });
  it('writes structured references, escaping [ ] # and apostrophes inside a column name', () => {
    expect(tableColumnRef('Trials', 'temp')).toBe('Trials[temp]');
    expect(tableColumnRef('Trials', "temp °C #1 [it's]")).toBe("Trials[[temp °C '#1 '[it''s']]]");
  });
  it('computes the spill area of a result and whether areas overlap', () => {
    expect(absoluteRef(spillArea(parseAddress('E2'), 9, 2), false)).toBe('$E$2:$F$10');
    expect(intersects(parseAddress('Data!A1:B5'), parseAddress('data!B5:C9'))).toBe(true);
    expect(intersects(parseAddress('Data!A1:B5'), parseAddress('Other!A1'))).toBe(false);
  });
});

describe('formulas and spill sizes', () => {
  const refs = { x: 'Data!$A$2:$A$29', y: 'Data!$B$2:$B$29', w: 'Data!$C$2:$C$29' };
  const cv = { folds: 5, repeats: 2, seed: 7, rule: 0 as const, candidates: [2, 3, 4, 5] };
  it('follow the functions’ argument order: known_ys, known_xs, knots, direction, weights', () => {
    expect(formulaFor('KNOTS', refs, { knots: 0, direction: -1 }, cv)).toBe('=RATCHET.KNOTS(Data!$B$2:$B$29,Data!$A$2:$A$29,0,-1,Data!$C$2:$C$29)');
    expect(formulaFor('PREDICT', refs, { knots: 4, direction: 0 }, cv, 'Data!$E$2:$E$9')).toBe(
      '=RATCHET.PREDICT(Data!$E$2:$E$9,Data!$B$2:$B$29,Data!$A$2:$A$29,4,0,Data!$C$2:$C$29)',
    );
    expect(formulaFor('CV', refs, { knots: 4, direction: 1 }, cv)).toBe('=RATCHET.CV(Data!$B$2:$B$29,Data!$A$2:$A$29,SEQUENCE(4,1,2),5,2,7,1,Data!$C$2:$C$29)');
    expect(formulaFor('BESTK', { x: 'A2:A9', y: 'B2:B9' }, { knots: 4, direction: 1 }, cv)).toBe('=RATCHET.BESTK(B2:B9,A2:A9,SEQUENCE(4,1,2),5,2,7,1,,0)');
  });
  it('write candidates as SEQUENCE for a run and as an array constant otherwise', () => {
    expect(candidatesText([2, 3, 4])).toBe('SEQUENCE(3,1,2)');
    expect(candidatesText([0, 2, 5])).toBe('{0;2;5}');
    expect(candidatesText([6])).toBe('6');
    expect(parseCandidates(' 2-12 ')).toHaveLength(11);
    expect(parseCandidates('0, 2; 8')).toEqual([0, 2, 8]);
    expect(parseCandidates('')).toBeUndefined();
    expect(() => parseCandidates('1-4')).toThrow('Candidates: each must be 0 (classic) or a whole number ≥ 2; got "1-4".');
  });
  it('size results as KNOTS rows × 2, STATS 13 × 2, CV (candidates + 1) × 6, PREDICT the shape of new_xs', () => {
    const s = { knotRows: 7, candidates: 19, newXs: { rows: 1, cols: 12 } };
    expect(spillSize('KNOTS', s)).toEqual({ rows: 7, cols: 2 });
    expect(spillSize('STATS', s)).toEqual({ rows: 13, cols: 2 });
    expect(spillSize('CV', s)).toEqual({ rows: 20, cols: 6 });
    expect(spillSize('PREDICT', s)).toEqual({ rows: 1, cols: 12 });
    expect(spillSize('BESTK', s)).toEqual({ rows: 1, cols: 1 });
  });
  it('match the sizes the functions return: STATS is 13 × 2 and KNOTS has one row per knot of the chart', () => {
    const x = [1, 2, 3, 4, 5, 6];
    const y = [1, 3, 2, 4, 6, 5];
    const view = computeFit({ x, y }, { knots: 0, direction: 1 });
    const args = [y.map((v) => [v]), x.map((v) => [v]), 0, 1];
    expect((functionByName('STATS')!.invoke(args) as unknown[][]).length).toBe(13);
    expect((functionByName('KNOTS')!.invoke(args) as unknown[][]).length).toBe(view.knots.length);
    // classic fit of (1,1) (2,3) (3,2) (4,4) (5,6) (6,5): PAVA pools 3,2 → 2.5 and 6,5 → 5.5 (hand
    // computation); the smallest table drops (4, 4), which lies on the line from (3, 2.5) to (5, 5.5)
    expect(view.knots).toEqual([[1, 1], [2, 2.5], [3, 2.5], [5, 5.5], [6, 5.5]]);
    expect(knotTableCsv(view.knots)).toBe('knot_x,fitted_value\r\n1,1\r\n2,2.5\r\n3,2.5\r\n5,5.5\r\n6,5.5\r\n');
  });
  it('leave a row with a blank out of the chart, as the functions do', () => {
    const view = computeFit({ x: [1, 2, null, 4], y: [1, null, 3, 4] }, { knots: 0, direction: 1 });
    expect(view.points).toEqual([
      { x: 1, y: 1 },
      { x: 4, y: 4 },
    ]);
  });
});

describe('sources of the preview', () => {
  it('read CSV cells: blanks, numbers with exponent, text kept as text', () => {
    expect(['', '  ', '1.5', '-2e3', '.5', '1,5', 'n/a'].map((t) => csvCell(t))).toEqual([null, null, 1.5, -2000, 0.5, '1,5', 'n/a']);
  });
  it('find the header row and reference the cells where a spreadsheet puts the CSV', () => {
    const src = sourceFromCsv('brick trials.csv', 'Invented data\n\ntemp,strength,note\n900,20,a\n950,,b\n1000,31,\n');
    const sheet = src.sheets[0]!;
    expect(sheet.headerRow).toBe(3);
    expect(sheet.columns.map((c) => c.name)).toEqual(['temp', 'strength']);
    expect(sheet.columns[1]!.cells).toEqual([20, null, 31]);
    expect(columnRef(sheet, sheet.columns[1]!)).toBe("'brick trials'!$B$4:$B$6");
  });
  it('read exceljs values: cached formula results, rich text, errors', () => {
    expect(xlsxCell({ formula: 'A1*2', result: 4 })).toBe(4);
    expect(xlsxCell({ sharedFormula: 'A1', result: undefined })).toBeNull();
    expect(xlsxCell({ richText: [{ text: 'te' }, { text: 'mp' }] })).toBe('temp');
    expect(xlsxCell({ error: '#DIV/0!' })).toEqual({ kind: 'error', code: '#DIV/0!' });
  });
});
