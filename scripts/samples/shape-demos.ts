/**
 * The shape pictures of `npm run demo`: one invented scenario per shape — concave, convex and
 * smooth — each evaluated with RATCHET formulas in a workbook held in memory (BESTK and CV with
 * the shape's `curvature` and `degree`, so the knot count is cross-validated for that shape; KNOTS
 * of that fit, and of the classic fit for comparison as in the sample pictures), drawn as an SVG in out/
 * (`shape-concave.svg`, `shape-convex.svg`, `shape-smooth.svg`). The smooth curve is drawn
 * through RATCHET.EVAL of its own knot table, sampled densely (src/view/curve-points.ts), as the
 * task pane draws it. The scenarios and their data are invented (seeded), and say so.
 */
import { writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import ExcelJS from 'exceljs';
import { EvaluatedWorkbook, type JsonCell } from '../../src/runner/workbook.js';
import { curveDrawing, type CurvePoint } from '../../src/view/curve-points.js';
import { formatNumber } from '../../src/view/number-format.js';
import { SplitMix64, normalDeviates } from '../../src/core/index.js';
import { fitSvg } from './demo.js';

/** Standard normal numbers from a fixed seed (the project's one sampler, src/core/prng.ts). */
const normals = (seed: number): (() => number) => normalDeviates(SplitMix64.fromSeed(seed));

/** Rounds to `d` decimals (data are written as a person would record them). */
function round(v: number, d: number): number {
  const f = 10 ** d;
  return Math.round(v * f) / f;
}

/** One invented scenario for a shape. */
export interface ShapeScenario {
  /** The shape's name, also the picture's name: out/shape-<name>.svg. */
  readonly name: 'concave' | 'convex' | 'smooth';
  readonly title: string;
  readonly xLabel: string;
  readonly yLabel: string;
  /** As typed in a formula: −1 concave, 0 any, 1 convex. */
  readonly curvature: -1 | 0 | 1;
  /** As typed in a formula: 1 piecewise linear, 2 smooth. */
  readonly degree: 1 | 2;
  /** Why this shape suits the scenario (what is known about the process, not seen in the data). */
  readonly why: string;
  readonly x: readonly number[];
  readonly y: readonly number[];
}

/** Rows per scenario. */
const N = 40;

/** x spread over [a, b] in N steps with a little seeded jitter, recorded to `d` decimals. */
function spread(a: number, b: number, d: number, noise: () => number): number[] {
  return Array.from({ length: N }, (_v, i) => round(a + ((b - a) * (i + 0.5 + 0.3 * Math.tanh(noise()))) / N, d));
}

/**
 * The three invented scenarios, from fixed seeds (the same data on every computer).
 * @example shapeScenarios().map((s) => s.name) // → ['concave', 'convex', 'smooth']
 */
export function shapeScenarios(): ShapeScenario[] {
  const a = normals(1701);
  const ax = spread(0.5, 12, 2, a);
  const b = normals(2917);
  const bx = spread(100, 3000, 0, b);
  const c = normals(3331);
  const cx = spread(0, 50, 1, c);
  return [
    {
      name: 'concave',
      title: 'Catalyst loading and reaction yield (diminishing returns)',
      xLabel: 'catalyst loading (g/L)',
      yLabel: 'yield (%)',
      curvature: -1,
      degree: 1,
      why: 'each further gram of catalyst is known to add less yield than the one before',
      x: ax,
      y: ax.map((x) => round(20 + 60 * (1 - Math.exp(-x / 3.5)) + 2.5 * a(), 1)),
    },
    {
      name: 'convex',
      title: 'Operating hours and pump seal wear (wear accelerates)',
      xLabel: 'operating hours',
      yLabel: 'seal wear (µm)',
      curvature: 1,
      degree: 1,
      why: 'a worn seal is known to wear faster, so the wear rate only grows',
      x: bx,
      y: bx.map((x) => round(5 + 0.004 * x + 4e-6 * x * x + 1.8 * b(), 1)),
    },
    {
      name: 'smooth',
      title: 'Reagent concentration and sensor signal (a smooth calibration curve)',
      xLabel: 'reagent concentration (mg/L)',
      yLabel: 'sensor signal (V)',
      curvature: 0,
      degree: 2,
      why: 'the sensor is known to respond smoothly, without corners, and only to rise',
      x: cx,
      y: cx.map((x) => round(0.05 + 1.2 / (1 + Math.exp(-(x - 22) / 7)) + 0.03 * c(), 3)),
    },
  ];
}

/** What the demo computed for one shape scenario. */
export interface ShapeDemoResult {
  readonly scenario: ShapeScenario;
  /** Knot count RATCHET.BESTK suggests for this shape (default candidates, 5 folds, seed 1, one-SE rule). */
  readonly suggested: number;
  readonly cvRmse: number;
  readonly cvSe: number;
  /** RATCHET.KNOTS of the shaped fit (three columns for the smooth one). */
  readonly table: JsonCell[][];
  /** RATCHET.KNOTS of the classic fit (no knots, no shape), drawn for comparison. */
  readonly classic: [number, number][];
  /** The line drawn and the knot markers (curve-points.ts). */
  readonly curve: CurvePoint[];
  readonly knots: CurvePoint[];
  readonly svgPath: string;
}

const num = (v: JsonCell | undefined): number => (typeof v === 'number' ? v : NaN);

/** The scenario as a workbook in memory: headers in row 1, x in A and y in B from row 2. */
function workbookOf(s: ShapeScenario): EvaluatedWorkbook {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Data');
  ws.getCell('A1').value = s.xLabel;
  ws.getCell('B1').value = s.yLabel;
  s.x.forEach((x, i) => {
    ws.getCell(`A${i + 2}`).value = x;
    ws.getCell(`B${i + 2}`).value = s.y[i]!;
  });
  return EvaluatedWorkbook.fromExcel(wb);
}

/**
 * Runs the shape part of the demo: per scenario, BESTK and CV for that shape, KNOTS of the shaped
 * fit and of the classic fit, a text report and an SVG (out/shape-<name>.svg).
 * @param outDir where the SVGs go (created by the caller).
 * @param log where the text report goes.
 */
export function runShapeDemo(outDir: string, log: (line: string) => void = console.log): ShapeDemoResult[] {
  const out: ShapeDemoResult[] = [];
  for (const s of shapeScenarios()) {
    const book = workbookOf(s);
    const ys = `B2:B${N + 1}`;
    const xs = `A2:A${N + 1}`;
    const shape = `${s.curvature},${s.degree}`;
    // Default candidates (2 … min(20, distinct x)), 5 folds, 1 repeat, seed 1, one-SE rule.
    book.set({
      'Data!AA1': `=RATCHET.BESTK(${ys},${xs},,,,,1,,,${shape})`,
      'Data!AB1': `=RATCHET.CV(${ys},${xs},,,,,1,,${shape})`,
      'Data!AJ1': `=RATCHET.KNOTS(${ys},${xs},AA1,1,,${shape})`,
      'Data!AN1': `=RATCHET.KNOTS(${ys},${xs},0,1)`,
    });
    const best = book.value('Data!AA1');
    if (typeof best !== 'number') throw new Error(`shape-${s.name}: BESTK gave ${String(best)}: ${book.message('Data!AA1') ?? ''}`);
    const row = book.result('Data!AB1').find((r) => r[0] === best) ?? [];
    const table = book.result('Data!AJ1');
    const classic = book.result('Data!AN1').map((r) => [num(r[0]), num(r[1])] as [number, number]);
    const drawing = curveDrawing(table as (number | string)[][]);
    const points = s.x.map((x, i) => [x, s.y[i]!] as [number, number]);
    const shapeName = s.name === 'smooth' ? 'smooth monotone' : s.name;
    const svgPath = join(outDir, `shape-${s.name}.svg`);
    writeFileSync(
      svgPath,
      fitSvg({
        title: s.title,
        xLabel: s.xLabel,
        yLabel: s.yLabel,
        points,
        knots: drawing.knots.map((k) => [k.x, k.y]),
        curve: drawing.curve.map((p) => [p.x, p.y]),
        classic,
        suggested: best,
        subtitle: `invented data · ${shapeName} fit with ${best} knots (cross-validated for this shape) and the classic fit`,
        fitLabel: `${shapeName} fit, ${best} knots, and its knots`,
        comparisonLabel: 'classic fit (no knots, no shape)',
      }),
    );
    const result: ShapeDemoResult = { scenario: s, suggested: best, cvRmse: num(row[1]), cvSe: num(row[2]), table, classic, curve: drawing.curve, knots: drawing.knots, svgPath };
    out.push(result);
    log(`shape-${s.name} — ${s.title} (invented scenario and data)`);
    log(`  why ${s.name}: ${s.why} — an assumption from the process, not read off the data`);
    log(`  formula: =RATCHET.KNOTS(${ys},${xs},${best},1,,${formulaShape(s)})`);
    log(`  suggested knot count for this shape: ${best}  (cv_rmse ${fmt(result.cvRmse)}, cv_se ${fmt(result.cvSe)}; 5-fold, seed 1, one-standard-error rule)`);
    log(`  picture: ${relative(process.cwd(), svgPath) || svgPath}`);
    log('');
  }
  return out;
}

/** curvature and degree as a user would type them: degree left out at its default (1). */
function formulaShape(s: ShapeScenario): string {
  return s.degree === 1 ? String(s.curvature) : `${s.curvature === 0 ? '' : s.curvature},${s.degree}`;
}

function fmt(v: number): string {
  return formatNumber(v);
}
