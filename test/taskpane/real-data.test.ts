/**
 * Real files in the browser preview, DOM-free (taskpane/csv.ts, taskpane/sources.ts,
 * taskpane/dates.ts): CSV with ",", ";" or tab separators and decimal commas (detected, and
 * overridable), quoted fields (RFC 4180 §2), a byte-order mark, title and blank lines,
 * headerless files; .xlsx date cells as x (serial day numbers checked against HyperFormula's DATE
 * with Excel's 1900 date system, `leapYear1900`); damaged .xlsx files explained in plain
 * words. .xlsx files are written and read with the exceljs package, as the preview reads them.
 */
import ExcelJS from 'exceljs';
import { HyperFormula } from 'hyperformula';
import { describe, expect, it } from 'vitest';
import { readCsv, sniffDecimal, sniffSeparator } from '../../taskpane/csv.js';
import { axisLabel, dateOfSerial, formatSerial, serialOfDate } from '../../taskpane/dates.js';
import { columnLabel, columnRef, describeUnreadableXlsx, PreviewFileError, sourceFromCsv, sourceFromXlsxWith, type ExcelJsLike } from '../../taskpane/sources.js';

const excelJs = ExcelJS as unknown as ExcelJsLike;

/**
 * Serial numbers of DATE(y, m, d) plus the time of day (minutes / 1440) as HyperFormula computes them with Excel's
 * 1900 date system in full (day 0 = 31 December 1899 and the leap day 29 February 1900 counted:
 * HyperFormula's `nullDate` and `leapYear1900` options).
 */
function hfSerials(dates: readonly [number, number, number, number?, number?][]): number[] {
  const hf = HyperFormula.buildFromArray(
    dates.map(([y, m, d, h = 0, mi = 0]) => [`=DATE(${y},${m},${d})+(${h}*60+${mi})/1440`]),
    { licenseKey: 'gpl-v3', leapYear1900: true, nullDate: { year: 1899, month: 12, day: 31 }, smartRounding: false },
  );
  const out = dates.map((_d, i) => hf.getCellValue({ sheet: 0, row: i, col: 0 }) as number);
  hf.destroy();
  return out;
}

describe('CSV format detection', () => {
  it('a semicolon file with decimal commas (the lab example) reads as numbers', () => {
    const src = sourceFromCsv('Verschleiß.csv', 'Stunden;Verschleiß (µm)\r\n0;25,3\r\n10;27,9\r\n20;31,0\r\n');
    expect(src.format).toEqual({ separator: ';', decimal: ',' });
    const sheet = src.sheets[0]!;
    expect(sheet.columns.map((c) => [c.name, c.cells])).toEqual([
      ['Stunden', [0, 10, 20]],
      ['Verschleiß (µm)', [25.3, 27.9, 31]],
    ]);
    expect(columnRef(sheet, sheet.columns[1]!)).toBe("'Verschleiß'!$B$2:$B$4");
  });

  it('a title line and blank lines above the header do not hide the semicolons', () => {
    const text = 'Verschleißprüfung, Prüfstand 3\n\nStunden;Verschleiß\n0;25,3\n10;27,9\n\n30;33,5\n';
    expect(sniffSeparator(text)).toBe(';');
    const sheet = sourceFromCsv('wear.csv', text).sheets[0]!;
    expect(sheet.headerRow).toBe(3);
    expect(sheet.hasHeader).toBe(true);
    expect(sheet.columns[1]!.cells).toEqual([25.3, 27.9, null, 33.5]);
    expect(columnRef(sheet, sheet.columns[1]!)).toBe('wear!$B$4:$B$7');
  });

  it('tab-separated with a byte-order mark and decimal commas', () => {
    const src = sourceFromCsv('signal.txt', '\uFEFFZeit\tSignal\n1\t0,5\n2\t-1,25e1\n');
    expect(src.format).toEqual({ separator: '\t', decimal: ',' });
    expect(src.sheets[0]!.columns.map((c) => c.cells)).toEqual([
      [1, 2],
      [0.5, -12.5],
    ]);
  });

  it('quoted fields keep separators, quotes and line breaks (RFC 4180 §2.5–2.7), and a quoted decimal comma in a comma file reads as a number', () => {
    const a = sourceFromCsv('a.csv', 'Probe;"Wert; ""mg/l"""\n"A\n1";"12,5"\nB;13\n');
    expect(a.sheets[0]!.columns.map((c) => [c.name, c.cells])).toEqual([['Wert; "mg/l"', [12.5, 13]]]);
    const b = sourceFromCsv('b.csv', 'h,w\n0,"25,3"\n10,"27,9"\n');
    expect(b.format).toEqual({ separator: ',', decimal: ',' });
    expect(b.sheets[0]!.columns[1]!.cells).toEqual([25.3, 27.9]);
  });

  it('a comma file with decimal points, and a semicolon file with decimal points, keep "." as the mark', () => {
    expect(readCsv('x,y\n1.5,2\n2.5,3\n').format).toEqual({ separator: ',', decimal: '.' });
    expect(readCsv('x;y\n1.5;2\n2.5;3\n').format).toEqual({ separator: ';', decimal: '.' });
    expect(sniffDecimal([['1,5', '2.5', '3.5']])).toBe('.');
    expect(sniffDecimal([['1,5', '2,5', '3.5']])).toBe(',');
  });

  it('the caller can override the detected separator and decimal mark', () => {
    const text = 'x;y\n1,5;2\n2,5;3\n';
    expect(sourceFromCsv('t.csv', text).sheets[0]!.columns[0]!.cells).toEqual([1.5, 2.5]);
    const dot = sourceFromCsv('t.csv', text, { decimal: '.' });
    expect(dot.format).toEqual({ separator: ';', decimal: '.' });
    expect(dot.sheets[0]!.columns.map((c) => c.name)).toEqual(['y']);
    expect(dot.sheets[0]!.columns[0]!.cells).toEqual([2, 3]);
    const comma = sourceFromCsv('t.csv', text, { separator: ',' });
    expect(comma.format?.separator).toBe(',');
    expect(readCsv(text, { separator: ',' }).records).toEqual([['x;y'], ['1', '5;2'], ['2', '5;3']]);
  });
});

describe('headerless CSV files', () => {
  it('columns are named by their letters and the data start on row 1', () => {
    const sheet = sourceFromCsv('plain.csv', '1,2.5\n2,3.1\n3,4.0\n').sheets[0]!;
    expect(sheet.hasHeader).toBe(false);
    expect(sheet.headerRow).toBe(0);
    expect(sheet.columns.map((c) => [c.name, c.cells])).toEqual([
      ['A', [1, 2, 3]],
      ['B', [2.5, 3.1, 4]],
    ]);
    expect(columnRef(sheet, sheet.columns[1]!)).toBe('plain!$B$1:$B$3');
    expect(columnLabel(sheet.columns[0]!)).toBe('A — column A, 3 numbers');
  });

  it('with semicolons and decimal commas, after blank lines', () => {
    const sheet = sourceFromCsv('p.csv', '\n\n1;2,5\n2;3,5\n').sheets[0]!;
    expect(sheet.headerRow).toBe(2);
    expect(sheet.columns.map((c) => c.cells)).toEqual([
      [1, 2],
      [2.5, 3.5],
    ]);
    expect(columnRef(sheet, sheet.columns[0]!)).toBe('p!$A$3:$A$4');
  });

  it('a file without a single number is refused in plain words', () => {
    expect(() => sourceFromCsv('notes.csv', 'a;b\nc;d\n')).toThrow(
      new PreviewFileError('notes.csv: no column holds a number (read with ";" between fields and "." as the decimal mark; choose another separator or decimal mark if these are wrong).'),
    );
  });
});

/** An .xlsx file made with exceljs: a date column (UTC wall-clock dates) and a number column. */
async function workbookWithDates(dates: Date[], date1904 = false): Promise<ArrayBuffer> {
  const wb = new ExcelJS.Workbook();
  if (date1904) wb.properties.date1904 = true;
  const ws = wb.addWorksheet('Log');
  ws.addRow(['Wear log, bench 3']);
  ws.addRow(['Date', 'Wear (µm)']);
  dates.forEach((d, i) => ws.addRow([d, 20 + i]));
  ws.getColumn(1).numFmt = 'yyyy-mm-dd hh:mm';
  return (await wb.xlsx.writeBuffer()) as ArrayBuffer;
}

describe('.xlsx date cells as x', () => {
  const when: [number, number, number, number, number][] = [
    [2024, 3, 5, 0, 0],
    [2024, 3, 6, 14, 30],
    [1999, 12, 31, 0, 0],
  ];
  const dates = when.map(([y, m, d, h, mi]) => new Date(Date.UTC(y, m - 1, d, h, mi)));

  it('a date column is offered as x, its cells the serial day numbers Excel uses', async () => {
    const src = await sourceFromXlsxWith(excelJs, 'log.xlsx', await workbookWithDates(dates));
    const sheet = src.sheets[0]!;
    expect(sheet.headerRow).toBe(2);
    const col = sheet.columns.find((c) => c.name === 'Date')!;
    expect(col.kind).toBe('date');
    expect(columnLabel(col)).toBe('Date — column A, 3 dates');
    const want = hfSerials(when);
    (col.cells as number[]).forEach((v, i) => expect(Math.abs(v - want[i]!)).toBeLessThan(1e-9));
    expect(sheet.columns.find((c) => c.name === 'Wear (µm)')!.kind).toBe('number');
  });

  it('in a workbook of the 1904 date system the serials are that system’s (1,462 days fewer)', async () => {
    const src = await sourceFromXlsxWith(excelJs, 'mac.xlsx', await workbookWithDates(dates, true));
    const col = src.sheets[0]!.columns.find((c) => c.name === 'Date')!;
    const want = hfSerials(when).map((s) => s - 1462);
    (col.cells as number[]).forEach((v, i) => expect(Math.abs(v - want[i]!)).toBeLessThan(1e-9));
  });
});

describe('serial day numbers and dates', () => {
  const cases: [number, number, number, number?, number?][] = [
    [1900, 1, 1],
    [1900, 2, 28],
    [1900, 3, 1],
    [1970, 1, 1],
    [2024, 2, 29, 6, 15],
    [2026, 12, 1, 23, 59],
  ];
  it('serialOfDate agrees with HyperFormula’s DATE (plus the time of day) in Excel’s 1900 system, including before 1 March 1900', () => {
    const want = hfSerials(cases);
    const got = cases.map(([y, m, d, h = 0, mi = 0]) => serialOfDate(new Date(Date.UTC(y, m - 1, d, h, mi))));
    got.forEach((g, i) => expect(Math.abs(g - want[i]!)).toBeLessThan(1e-9));
    expect(want.slice(0, 3)).toEqual([1, 59, 61]);
  });

  it('dateOfSerial inverts serialOfDate, and formatSerial shows dates, times and the 29 February 1900 of serial 60', () => {
    for (const [y, m, d, h = 0, mi = 0] of cases) {
      const date = new Date(Date.UTC(y, m - 1, d, h, mi));
      expect(dateOfSerial(serialOfDate(date)).getTime()).toBe(date.getTime());
    }
    expect([1, 59, 60, 61, 45356, 45356.6041666667, 45356 + 1 / 86400].map(formatSerial)).toEqual([
      '1900-01-01',
      '1900-02-28',
      '1900-02-29',
      '1900-03-01',
      '2024-03-05',
      '2024-03-05 14:30',
      '2024-03-05 00:00:01',
    ]);
    expect(formatSerial(45356.99999999)).toBe('2024-03-06');
    expect(axisLabel('date')(45356)).toBe('2024-03-05');
    expect(axisLabel('number')(45356)).toBe('45356');
  });

  it('refuses dates before 1900 and serials below 1', () => {
    expect(() => serialOfDate(new Date(Date.UTC(1899, 11, 31)))).toThrow('date: needs a date from 1 January 1900 on; got 1899-12-31.');
    expect(() => serialOfDate(new Date(Number.NaN))).toThrow('date: needs a valid date; got an invalid Date.');
    expect(() => dateOfSerial(0.5)).toThrow('serial: needs a day number ≥ 1; got 0.5.');
  });
});

describe('an .xlsx file the preview cannot read', () => {
  async function failure(name: string, bytes: Uint8Array): Promise<PreviewFileError> {
    try {
      await sourceFromXlsxWith(excelJs, name, bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
    } catch (e) {
      return e as PreviewFileError;
    }
    throw new Error('expected a failure');
  }

  it('a workbook cut short is called damaged, in plain words and without the zip library’s message', async () => {
    const whole = new Uint8Array(await workbookWithDates([new Date(Date.UTC(2024, 0, 1))]));
    const e = await failure('cut.xlsx', whole.subarray(0, Math.floor(whole.length / 2)));
    expect(e).toBeInstanceOf(PreviewFileError);
    expect(e.message).toBe(describeUnreadableXlsx('cut.xlsx', whole));
    expect(e.message).toMatch(/^cut\.xlsx is damaged: it looks like an \.xlsx workbook/);
    const inner = (e.cause as Error).message;
    expect(inner.length).toBeGreaterThan(0);
    expect(e.message).not.toContain(inner);
  });

  it('an empty file, an old .xls (or password-protected) file and a text file each get their own explanation', async () => {
    expect((await failure('e.xlsx', new Uint8Array(0))).message).toBe('e.xlsx is empty (0 bytes). Choose the workbook again, or save it again from Excel.');
    const ole = new Uint8Array([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0, 0, 0, 0]);
    expect((await failure('old.xlsx', ole)).message).toMatch(/^old\.xlsx is an older Excel file \(\.xls\) or a password-protected workbook/);
    expect((await failure('t.xlsx', new TextEncoder().encode('x;y\n1;2\n'))).message).toBe(
      't.xlsx is not an .xlsx workbook. If it holds text separated by commas, semicolons or tabs, open it as a .csv file.',
    );
  });
});
