/**
 * The command `npm run sheet -- <workbook.xlsx> [--json] [--out <file>] [--set Sheet!A1=value …]`:
 * its JSON for a small workbook matches the committed golden file (values checked by hand:
 * FIT of 1 3 2 4 6 5 is 1 2.5 2.5 4 5.5 5.5, the smallest knot table drops (4, 4), STATS as in
 * formulas.test.ts), --set and --out work from the command line, the input is never modified,
 * and bad files and bad command lines give clear messages and non-zero exits.
 * The CLI is spawned three times; everything else runs in-process.
 */
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import { describe, expect, it } from 'vitest';
import '../../src/runner/ratchet.js';
import { parseSheetArgs, runSheet } from '../../src/runner/cli.js';
import { EvaluatedWorkbook } from '../../src/runner/workbook.js';

const ROOT = join(import.meta.dirname, '..', '..');
const SMALL = join(import.meta.dirname, 'fixtures', 'small.xlsx');
const GOLDEN = join(import.meta.dirname, 'fixtures', 'small.golden.json');
const TSX = join(ROOT, 'node_modules', '.bin', 'tsx');
const run = promisify(execFile);
const tmp = mkdtempSync(join(tmpdir(), 'ratchet-sheet-'));
const sha = (p: string) => createHash('sha256').update(readFileSync(p)).digest('hex');

async function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const r = await run(TSX, [join(ROOT, 'scripts', 'sheet.ts'), ...args], { cwd: ROOT });
    return { code: 0, stdout: r.stdout, stderr: r.stderr };
  } catch (e) {
    const x = e as { code: number; stdout: string; stderr: string };
    return { code: x.code, stdout: x.stdout, stderr: x.stderr };
  }
}

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  return { io: { out: (s: string) => out.push(s), err: (s: string) => err.push(s) }, out, err };
}

describe('npm run sheet', () => {
  it('prints JSON that matches the golden file, and leaves the input untouched', async () => {
    const before = sha(SMALL);
    const r = await cli([SMALL, '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)).toEqual(JSON.parse(readFileSync(GOLDEN, 'utf8')));
    expect(sha(SMALL)).toBe(before);
  });

  it('--set changes an input before evaluation and --out writes a copy with values cached', async () => {
    const before = sha(SMALL);
    const golden = JSON.parse(readFileSync(GOLDEN, 'utf8')) as Record<string, unknown>;
    const copy = join(tmp, 'copy.xlsx');
    // y6 (B7) = 7: y = 1 3 2 4 6 7 → rising fit 1 2.5 2.5 4 6 7 (hand); no two neighbouring
    // slopes are equal after x = 3, so the smallest knot table grows from 5 rows to 6.
    const r = await cli([SMALL, '--json', '--set', 'Lab data!B7=7', '--out', copy]);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout) as Record<string, unknown>;
    expect([json['Lab data!D6'], json['Lab data!D7']]).toEqual([6, 7]);
    expect(golden['Lab data!E7']).toBeUndefined();
    expect([json['Lab data!E6'], json['Lab data!F6'], json['Lab data!E7'], json['Lab data!F7']]).toEqual([5, 6, 6, 7]);
    // The cross-validation rows change with the data (classic row: fold 2 now misses 4, 6, 7
    // against 2.5 → SSE 2.25 + 12.25 + 20.25 = 34.75, plus 14 from fold 1).
    expect(json['Lab data!L3']).toBeCloseTo(Math.sqrt((14 + 34.75) / 6), 14);
    expect(json['Lab data!L3']).not.toBe(golden['Lab data!L3']);
    expect(sha(SMALL)).toBe(before);

    // The copy: formulas kept in the stored form, results cached, the new input written.
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(copy);
    const ws = wb.getWorksheet('Lab data')!;
    expect(ws.getCell('B7').value).toBe(7);
    const d2 = ws.getCell('D2').value as { formula: string; shareType?: string; ref?: string; result?: number };
    expect(d2).toMatchObject({ formula: '_xldudf_RATCHET_FIT(B2:B8,A2:A8)', shareType: 'array', ref: 'D2:D8', result: 1 });
    expect(ws.getCell('D7').value).toBe(7);
    const e2 = ws.getCell('E2').value as { formula: string; ref?: string };
    expect(e2).toMatchObject({ formula: '_xldudf_RATCHET_KNOTS(B2:B8,A2:A8)', ref: 'E2:F7' });
    expect((ws.getCell('I2').value as { result?: unknown }).result).toEqual({ error: '#N/A' });
    // Spilled results are marked as dynamic arrays (see dynamic-arrays.test.ts).
    const zip = await JSZip.loadAsync(readFileSync(copy));
    const sheetXml = await zip.file('xl/worksheets/sheet1.xml')!.async('string');
    expect([...sheetXml.matchAll(/<c r="([A-Z]+[0-9]+)"[^>]*cm="1"/g)].map((m) => m[1])).toEqual(['D2', 'E2', 'K2', 'I6']);
    // Evaluating the copy gives the same values as the run that wrote it.
    const again = await EvaluatedWorkbook.fromFile(copy);
    expect(again.toJson()).toEqual(json);
  });

  it('a file that is not an .xlsx workbook gives a clear message and exit code 1', async () => {
    const fake = join(tmp, 'notes.xlsx');
    writeFileSync(fake, 'this is plain text, not a workbook\n');
    const r = await cli([fake]);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe(`sheet: Cannot read "${fake}": it is not an .xlsx workbook (Excel 2007+ Open XML) or it is damaged.\n`);
  });

  it('a missing file, a folder, and bad command lines fail with messages (in-process)', async () => {
    const c1 = capture();
    expect(await runSheet([join(tmp, 'missing.xlsx')], c1.io)).toBe(1);
    expect(c1.err.join('')).toContain('no such file');
    const c2 = capture();
    expect(await runSheet([tmp], c2.io)).toBe(1);
    expect(c2.err.join('')).toContain('it is a folder');
    const c3 = capture();
    expect(await runSheet([], c3.io)).toBe(2);
    expect(c3.err.join('')).toContain('name the workbook to evaluate');
    const c4 = capture();
    expect(await runSheet([SMALL, '--set', 'B2'], c4.io)).toBe(2);
    expect(c4.err.join('')).toContain('--set needs Sheet!A1=value; got "B2"');
    const c5 = capture();
    expect(await runSheet([SMALL, '--out', SMALL], c5.io)).toBe(2);
    expect(c5.err.join('')).toContain('the input workbook is never modified');
    const c6 = capture();
    expect(await runSheet([SMALL, '--set', 'Nope!A1=3'], c6.io)).toBe(1);
    expect(c6.err.join('')).toContain('there is no sheet named "Nope"');
    expect(existsSync(join(tmp, 'missing.xlsx'))).toBe(false);
  });

  it('prints a readable table per sheet with formulas in the typed form (in-process)', async () => {
    const c = capture();
    expect(await runSheet([SMALL], c.io)).toBe(0);
    const text = c.out.join('');
    expect(text).toContain('== Lab data ==');
    expect(text).toContain('== Summary ==');
    expect(text).toContain('D2     =RATCHET.FIT(B2:B8,A2:A8)  →  7 × 1');
    expect(text).toContain("Lab data!I2: target_ys: 99 is outside the curve's range [1, 5.5].");
    expect(text).not.toContain('_xldudf_');
  });

  it('parses --set values: numbers, logicals, blanks, formulas and text', () => {
    const a = parseSheetArgs(['w.xlsx', '--set', 'S!A1=2.5', '--set=S!A2=TRUE', '--set', 'S!A3=', '--set', 'S!A4==SUM(B1:B3)', '--set', 'S!A5=12 kg']);
    expect(a.set).toEqual({ 'S!A1': 2.5, 'S!A2': true, 'S!A3': null, 'S!A4': '=SUM(B1:B3)', 'S!A5': '12 kg' });
    const b = parseSheetArgs(['--set', 'S!A1=1', "'My data'!B2=2", 'w.xlsx', '--json']);
    expect([b.file, b.json, b.set]).toEqual(['w.xlsx', true, { 'S!A1': 1, "'My data'!B2": 2 }]);
  });
});
