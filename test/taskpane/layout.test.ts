/**
 * Formula blocks that never collide (taskpane/layout.ts): the "Copy formulas" text, pasted into a
 * sheet beside the data (tab = next cell, line break = next row, as a spreadsheet pastes plain
 * text) and evaluated by the headless runner, gives no #SPILL!, and every result fills exactly
 * the area the layout gave it. The control pastes the formulas one per row, as the pane did
 * before, and shows that the check sees the collisions. Data: R's datasets `cars` (speed → dist),
 * as exported into test/reference/fixtures/cv_datasets.json by `npm run refs`.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { candidateCount, computeFit, knotTableRows } from '../../taskpane/analysis.js';
import { allFormulas, bandFormulas, type BandFormulaSettings, type CvSettings, type FitSettings } from '../../taskpane/formulas.js';
import { layoutBlocks, paneBlocks, BLOCK_LABELS } from '../../taskpane/layout.js';
import { evaluate, type SetupCell } from '../runner/helpers.js';
import { cellName } from '../../src/runner/address.js';

const cases = (JSON.parse(readFileSync(new URL('../reference/fixtures/cv_datasets.json', import.meta.url), 'utf8')) as { cases: { name: string; x: number[]; y: number[] }[] }).cases;
const cars = cases.find((c) => c.name.startsWith('cars'))!;
const n = cars.x.length;
const refs = { y: `$B$2:$B$${n + 1}`, x: `$A$2:$A$${n + 1}` };
const cv: CvSettings = { folds: 5, repeats: 1, seed: 1, rule: 1 };

/** The data sheet with `text` pasted at row `top`, column `left` (0-based), as a spreadsheet pastes plain text. */
function pasted(text: string, top: number, left: number): Record<string, SetupCell> {
  const sheet: Record<string, SetupCell> = { A1: 'speed', B1: 'dist' };
  cars.x.forEach((v, i) => {
    sheet[`A${i + 2}`] = v;
    sheet[`B${i + 2}`] = cars.y[i]!;
  });
  text.split('\n').forEach((line, r) =>
    line.split('\t').forEach((cell, c) => {
      if (cell === '') return;
      sheet[cellName(top + r, left + c)] = cell.startsWith('=') ? { f: cell.slice(1) } : cell;
    }),
  );
  return sheet;
}

function spilled(book: ReturnType<typeof evaluate>): string[] {
  return book
    .results()
    .filter((r) => r.values.some((row) => row.includes('#SPILL!')))
    .map((r) => `${r.cell} ${r.formula}`);
}

describe('the "Copy formulas" block pasted beside the data', () => {
  it.each([
    ['the classic fit', { knots: 0, direction: 1 }, undefined],
    ['5 knots', { knots: 5, direction: 1 }, undefined],
    ['5 knots, convex', { knots: 5, direction: 1, curvature: 1 }, undefined],
    ['4 knots, concave and smooth (a 7 × 3 knot table)', { knots: 4, direction: 1, curvature: -1, degree: 2 }, undefined],
    ['5 knots with BAND and INVERTBAND (a target y of 40 ft)', { knots: 5, direction: 1 }, { level: 0.9, kind: 2, replicates: 2, targets: '40' }],
    ['5 knots, concave, with BAND and INVERTBAND', { knots: 5, direction: 1, curvature: -1 }, { level: 0.95, kind: 1, replicates: 1, targets: '40' }],
  ] as [string, FitSettings, BandFormulaSettings | undefined][])('%s: no #SPILL!, each result fills exactly the room it was given', (_name, fit, band) => {
    const data = { x: cars.x, y: cars.y };
    const view = computeFit(data, fit);
    const sizes = { knotRows: view.knots.length, knotCols: view.smooth ? 3 : 2, candidates: candidateCount(view, cv), newXs: { rows: n, cols: 1 } };
    const formulas = { ...allFormulas(refs, fit, cv), ...(band ? bandFormulas(refs, fit, band) : {}) };
    const layout = layoutBlocks(paneBlocks(formulas, sizes));
    expect(layout.blocks.length).toBe(band ? 7 : 5);
    const book = evaluate({ Data: pasted(layout.text, 0, 3) });
    expect(spilled(book)).toEqual([]);
    for (const b of layout.blocks) {
      const at = `Data!${cellName(b.dr, 3 + b.dc)}`;
      const got = book.result(at);
      expect([b.label, got.length, got[0]!.length]).toEqual([b.label, b.rows, b.cols]);
      expect(got.flat().filter((v) => typeof v === 'string' && v.startsWith('#'))).toEqual([]);
      expect(book.value(`Data!${cellName(b.dr, 3 + b.dc - 1)}`)).toBe(b.label);
    }
    const knots = layout.blocks.find((b) => b.label === BLOCK_LABELS.KNOTS)!;
    expect(book.result(`Data!${cellName(knots.dr, 3 + knots.dc)}`)).toEqual(knotTableRows(view));
  });

  it('control: the same formulas pasted one per row collide, and the check sees it', () => {
    const fit: FitSettings = { knots: 5, direction: 1 };
    const f = allFormulas(refs, fit, cv);
    const book = evaluate({ Data: pasted([f.KNOTS, f.PREDICT, f.STATS, f.CV, f.BESTK].join('\n'), 0, 3) });
    expect(spilled(book).length).toBeGreaterThan(0);
  });
});

describe('layoutBlocks', () => {
  it('matches its documented example', () => {
    const l = layoutBlocks([
      { label: 'Knot table', formula: '=RATCHET.KNOTS($B$2:$B$7,$A$2:$A$7,3)', rows: 3, cols: 2 },
      { label: 'Suggested knot count', formula: '=RATCHET.BESTK($B$2:$B$7,$A$2:$A$7)', rows: 1, cols: 1 },
    ]);
    expect(l.text).toBe('Knot table\t=RATCHET.KNOTS($B$2:$B$7,$A$2:$A$7,3)\n\n\n\nSuggested knot count\t=RATCHET.BESTK($B$2:$B$7,$A$2:$A$7)');
    expect(l.writes).toEqual([
      { dr: 0, dc: 0, value: 'Knot table', kind: 'label' },
      { dr: 0, dc: 1, value: '=RATCHET.KNOTS($B$2:$B$7,$A$2:$A$7,3)', kind: 'formula' },
      { dr: 4, dc: 0, value: 'Suggested knot count', kind: 'label' },
      { dr: 4, dc: 1, value: '=RATCHET.BESTK($B$2:$B$7,$A$2:$A$7)', kind: 'formula' },
    ]);
    expect([l.rows, l.cols]).toEqual([5, 3]);
  });

  it('the writes and the text describe the same cells', () => {
    const l = layoutBlocks(paneBlocks(allFormulas(refs, { knots: 4, direction: -1 }, cv), { knotRows: 4, candidates: 9, newXs: { rows: 3, cols: 2 } }), 2);
    const fromText = l.text.split('\n').flatMap((line, dr) => line.split('\t').flatMap((value, dc) => (value === '' ? [] : [{ dr, dc, value }])));
    expect(fromText).toEqual(l.writes.map(({ dr, dc, value }) => ({ dr, dc, value })));
    expect(l.cols).toBe(7); // label + the 6 columns of CV
  });

  it.each([
    [[], 1, 'blocks: needs at least one formula to lay out.'],
    [[{ label: 'A', formula: '=1', rows: 0, cols: 1 }], 1, 'block "A": needs a size of whole numbers ≥ 1; got 0 × 1.'],
    [[{ label: 'A\tB', formula: '=1', rows: 1, cols: 1 }], 1, 'block "A\\tB": the label may not hold a tab or a line break.'],
    [[{ label: 'A', formula: 'RATCHET.FIT(B1:B3,A1:A3)', rows: 1, cols: 1 }], 1, 'block "A": needs a formula starting with "=" without tabs or line breaks; got "RATCHET.FIT(B1:B3,A1:A3)".'],
    [[{ label: 'A', formula: '=1', rows: 1, cols: 1 }], -1, 'gap: needs a whole number of rows ≥ 0; got -1.'],
  ])('rejects %j (gap %d): %s', (blocks, gap, message) => {
    expect(() => layoutBlocks(blocks, gap)).toThrow(message);
  });
});
