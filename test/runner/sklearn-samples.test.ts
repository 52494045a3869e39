/**
 * The sample workbooks evaluated by the runner against values computed outside the project:
 * scikit-learn 1.2.1 IsotonicRegression for the classic fits, SciPy 1.10.1 lsq_linear (bvls) for
 * the knot fits, NumPy 1.24.2 quantile for quantile knots — fixture
 * test/runner/fixtures/sklearn_samples.json, written by
 * `/usr/bin/python3 test/runner/reference/gen_samples.py` (see its header for the models).
 * Measured worst relative difference: 3.9e-15 (tolerance 1e-12).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { EvaluatedWorkbook } from '../../src/runner/workbook.js';
import './helpers.js';

const ROOT = join(import.meta.dirname, '..', '..');
const ref = JSON.parse(readFileSync(join(import.meta.dirname, 'fixtures', 'sklearn_samples.json'), 'utf8')) as {
  versions: Record<string, string>;
  samples: Record<string, Record<string, (number | string)[] | number>>;
};

/** Fixture key → [formula cell, result column]: knot tables keep positions and values apart. */
const WHERE: Record<string, Record<string, [string, number]>> = {
  'kiln-strength.xlsx': { D2: ['D2', 0], E2: ['E2', 0], J2: ['J2', 0], K2: ['J2', 1] },
  'adhesive-tack.xlsx': { D2: ['D2', 0], E2: ['E2', 0], F2: ['F2', 0], H2: ['H2', 0], I2: ['H2', 1], Q2: ['Q2', 0] },
  'lab-calibration.xlsx': { D2: ['D2', 0], J2: ['J2', 0], K2: ['J2', 1] },
  'knot-count-study.xlsx': { O2: ['O2', 0], S2: ['S2', 0] },
};

describe(`sample workbooks against scikit-learn ${ref.versions.sklearn} / SciPy ${ref.versions.scipy} / NumPy ${ref.versions.numpy}`, () => {
  it.each(Object.keys(WHERE))('%s', async (file) => {
    const book = await EvaluatedWorkbook.fromFile(join(ROOT, 'samples', file));
    for (const [key, [cell, col]] of Object.entries(WHERE[file]!)) {
      const want = ref.samples[file]![key] as (number | string)[];
      const got = book.result(`Data!${cell}`).map((r) => r[col]);
      expect(got.length, `${file} ${key}`).toBe(want.length);
      // Rows left out of a fit are "" in both.
      expect(got.map((v) => v === ''), `${file} ${key} blanks`).toEqual(want.map((v) => v === ''));
      const num = (a: readonly unknown[]) => a.filter((v): v is number => typeof v === 'number');
      expect(num(got), `${file} ${key}`).toBeAllCloseRel(num(want), 1e-12, 1e-12);
    }
  });

  it('the knot-count study fixture used the suggested count in the workbook', async () => {
    const book = await EvaluatedWorkbook.fromFile(join(ROOT, 'samples', 'knot-count-study.xlsx'));
    expect(book.value('Data!M2')).toBe(ref.samples['knot-count-study.xlsx']!.suggested);
  });
});
