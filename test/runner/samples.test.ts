/**
 * The sample workbooks: each evaluates, through the runner, to the values in samples/expected.json
 * (computed by scripts/make-samples.ts from the core directly, not by the runner); the committed
 * expectations are those the generator produces now; the files hold the stored formula form and
 * say on their About sheet that scenario and data are invented.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { EvaluatedWorkbook } from '../../src/runner/workbook.js';
import { buildSamples, type SampleFormula } from '../../scripts/samples/samples.js';
import { writeSampleWorkbook } from '../../scripts/samples/sample-workbook.js';
import { closeBlock } from './helpers.js';

const DIR = join(import.meta.dirname, '..', '..', 'samples');
const expected = JSON.parse(readFileSync(join(DIR, 'expected.json'), 'utf8')) as {
  samples: Record<string, { title: string; formulas: SampleFormula[] }>;
};
const files = Object.keys(expected.samples);

describe('sample workbooks', () => {
  it('are five, one per scenario (the last a surface over two inputs)', () => {
    expect(files).toEqual(['kiln-strength.xlsx', 'adhesive-tack.xlsx', 'lab-calibration.xlsx', 'knot-count-study.xlsx', 'coating-cure.xlsx']);
  });

  // Relative tolerance between the committed expectations and the values computed now: wide
  // enough for a change of summation order in the core, far below any change of a result.
  const REL = 1e-9;

  it('expected.json is what the generator computes from the core now (run `npm run samples` after a core change)', () => {
    const now = buildSamples();
    expect(now.map((s) => s.file)).toEqual(files);
    for (const s of now) {
      const committed = expected.samples[s.file]!.formulas;
      expect(s.formulas.map((f) => [f.cell, f.formula, f.message])).toEqual(committed.map((f) => [f.cell, f.formula, f.message]));
      s.formulas.forEach((f, i) => {
        const problem = closeBlock(f.expected, committed[i]!.expected, REL);
        expect(problem === undefined ? 'ok' : `${s.file} ${f.cell}: ${problem}`).toBe('ok');
      });
    }
  });

  // The cells of a workbook's sheets: text and formulas (with their spill range) exactly, stored
  // results and numbers as numbers, so that they can be compared to a relative tolerance.
  async function cellsOf(path: string): Promise<Map<string, unknown>> {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(path);
    const out = new Map<string, unknown>();
    for (const ws of wb.worksheets) ws.eachRow((row) => row.eachCell((c) => out.set(`${ws.name}!${c.address}`, c.value)));
    return out;
  }

  it('each committed workbook holds the cells the generator writes now: same formulas and spill ranges, same cached results (run `npm run samples` after a change)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ratchet-samples-'));
    try {
      for (const s of buildSamples()) {
        const fresh = join(dir, s.file);
        await writeSampleWorkbook(s, fresh);
        const now = await cellsOf(fresh);
        const committed = await cellsOf(join(DIR, s.file));
        expect([...committed.keys()].sort(), s.file).toEqual([...now.keys()].sort());
        for (const [at, v] of now) {
          const old = committed.get(at);
          const num = (x: unknown): number | undefined =>
            typeof x === 'number' ? x : x !== null && typeof x === 'object' && typeof (x as { result?: unknown }).result === 'number' ? (x as { result: number }).result : undefined;
          const a = num(v);
          const b = num(old);
          if (a !== undefined && b !== undefined) {
            expect(Math.abs(a - b) <= REL * Math.max(1, Math.abs(a)), `${s.file} ${at}: ${b} committed, ${a} now`).toBe(true);
            if (typeof v === 'object') expect({ ...(old as object), result: 0 }, `${s.file} ${at}`).toEqual({ ...(v as object), result: 0 });
          } else {
            expect(old, `${s.file} ${at}`).toEqual(v);
          }
        }
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  describe.each(files)('%s', (file) => {
    it('evaluates to its expected values', async () => {
      const book = await EvaluatedWorkbook.fromFile(join(DIR, file));
      for (const f of expected.samples[file]!.formulas) {
        const at = `Data!${f.cell}`;
        const problem = closeBlock(book.result(at), f.expected, REL);
        expect(problem === undefined ? 'ok' : `${at} ${f.formula}: ${problem}`).toBe('ok');
        if (f.message !== undefined) expect(book.message(at)).toContain(f.message);
      }
      // Every formula of the file is in the expectations (none untested).
      const cells = book.results().map((r) => r.cell).sort();
      expect(cells).toEqual(expected.samples[file]!.formulas.map((f) => f.cell).sort());
    });

    it('stores its formulas in the form Excel writes and says the data are invented', async () => {
      const wb = new ExcelJS.Workbook();
      await wb.xlsx.readFile(join(DIR, file));
      expect(wb.worksheets.map((w) => w.name)).toEqual(['About', 'Data']);
      const formulas: string[] = [];
      wb.getWorksheet('Data')!.eachRow((row) =>
        row.eachCell((c) => {
          const v = c.value as { formula?: string } | null;
          if (v && typeof v === 'object' && typeof v.formula === 'string') formulas.push(v.formula);
        }),
      );
      expect(formulas.length).toBe(expected.samples[file]!.formulas.length);
      for (const f of formulas) {
        expect(f).toMatch(/^_xldudf_RATCHET_[A-Z]+\(/);
        expect(f).not.toMatch(/RATCHET\./);
      }
      const about: string[] = [];
      wb.getWorksheet('About')!.eachRow((row) => row.eachCell((c) => about.push(String(c.value))));
      const text = about.join('\n');
      expect(text).toMatch(/invented/);
      expect(text).toMatch(/extrapolate/);
      expect(text).toMatch(/standard, a specification or a method statement governs your work/);
      expect(text).toMatch(/#NAME\?/);
    });
  });

  it('the knot-count study warns that cross-validation on few points is noisy', () => {
    const s = buildSamples().find((x) => x.file === 'knot-count-study.xlsx')!;
    expect(s.about.join(' ')).toContain('Cross-validation on few points is noisy');
  });
});
