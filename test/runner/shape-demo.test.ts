/**
 * The shape pictures of `npm run demo` (scripts/samples/shape-demos.ts): one invented scenario
 * each for a concave, a convex and a smooth fit. What the workbook formulas gave is checked
 * against the core called directly with the same shape — crossValidate + suggestKnots (defaults:
 * candidates 2 … min(20, distinct x), 5 folds, seed 1, one-SE rule) and fitMonotone with that many
 * knots —, the smooth curve drawn against evaluateTable of its own table, and each SVG against the
 * rules of the sample pictures (test/runner/demo.test.ts): at least 4 y ticks, numbers to at most
 * 4 significant digits, one marker per knot, "invented data".
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { crossValidate, evaluateTable, fitMonotone, suggestKnots } from '../../src/core/index.js';
import { runShapeDemo, shapeScenarios } from '../../scripts/samples/shape-demos.js';
import { SAMPLES_PER_INTERVAL } from '../../src/view/curve-points.js';
import './helpers.js';

describe('npm run demo: one picture per shape', () => {
  const lines: string[] = [];
  const out = mkdtempSync(join(tmpdir(), 'ratchet-shape-demo-'));
  const results = runShapeDemo(out, (l) => lines.push(l));

  it('draws concave, convex and smooth, named shape-<name>.svg, from invented scenarios that say so', () => {
    expect(results.map((r) => r.svgPath.slice(out.length + 1))).toEqual(['shape-concave.svg', 'shape-convex.svg', 'shape-smooth.svg']);
    expect(results.map((r) => [r.scenario.curvature, r.scenario.degree])).toEqual([
      [-1, 1],
      [1, 1],
      [0, 2],
    ]);
    for (const r of results) {
      const svg = readFileSync(r.svgPath, 'utf8');
      expect(svg).toContain('invented data');
      expect(svg).toContain(r.scenario.title);
    }
    expect(lines.filter((l) => l.includes('(invented scenario and data)'))).toHaveLength(3);
    expect(lines.filter((l) => l.includes('an assumption from the process, not read off the data'))).toHaveLength(3);
  });

  it.each(shapeScenarios().map((s, i) => [s.name, i] as const))('%s: suggestion, cv_rmse and knot table agree with the core for that shape', (_name, i) => {
    const r = results[i]!;
    const s = r.scenario;
    const x = [...s.x];
    const y = [...s.y];
    const cv = crossValidate(x, y, { direction: 'up', curvature: s.curvature, degree: s.degree });
    const k = suggestKnots(cv.scores, 'one-se').knots;
    expect(r.suggested).toBe(k);
    expect(r.cvRmse).toBeCloseRel(cv.scores.find((c) => c.knots === k)!.cvRmse, 1e-12);
    const m = fitMonotone(x, y, { knots: k, direction: 'up', curvature: s.curvature, degree: s.degree });
    expect(r.table.map((q) => q[0] as number)).toBeAllCloseRel(Array.from(m.knotX), 1e-12);
    expect(r.table.map((q) => q[1] as number)).toBeAllCloseRel(Array.from(m.knotY), 1e-12);
    expect(r.table.length).toBe(s.degree === 2 ? 2 * k - 1 : k);
    const classic = fitMonotone(x, y, { knots: 0, direction: 'up' });
    expect(r.classic.map((q) => q[1])).toBeAllCloseRel(Array.from(classic.knotY), 1e-12);
    const svg = readFileSync(r.svgPath, 'utf8');
    expect(svg.match(/<circle /g)!.length).toBe(x.length + 1); // points + legend marker
    expect(svg.match(/<rect x=.*stroke="#1f5fa8"/g)!.length).toBe(k + 1); // knots (not midpoints) + legend marker
  });

  it('the smooth picture draws RATCHET.EVAL of its own table at 24 samples per knot interval, not straight lines through the rows', () => {
    const r = results.find((q) => q.scenario.name === 'smooth')!;
    const k = r.suggested;
    expect(r.curve).toHaveLength((k - 1) * SAMPLES_PER_INTERVAL + 1);
    const tx = r.table.map((q) => q[0] as number);
    const ty = r.table.map((q) => q[1] as number);
    expect(r.table.every((q) => q[2] === 2)).toBe(true);
    expect(r.curve.map((p) => p.y)).toEqual(Array.from(evaluateTable(tx, ty, 'quadratic', r.curve.map((p) => p.x))));
    expect(r.knots.map((p) => p.x)).toEqual(tx.filter((_v, i) => i % 2 === 0));
    const svg = readFileSync(r.svgPath, 'utf8');
    const fitLine = [...svg.matchAll(/<polyline points="([^"]*)" fill="none" stroke="#1f5fa8"/g)].map((m) => m[1]!.split(' ').length);
    expect(fitLine).toEqual([(k - 1) * SAMPLES_PER_INTERVAL + 1]);
  });

  it('every shape picture has at least 4 y ticks and follows the digits rule (at most 4 significant digits)', () => {
    for (const r of results) {
      const svg = readFileSync(r.svgPath, 'utf8');
      const yTicks = svg.match(/<text x="[0-9.]+" y="[0-9.]+" text-anchor="end">/g) ?? [];
      expect(yTicks.length, r.svgPath).toBeGreaterThanOrEqual(4);
      for (const m of svg.matchAll(/>(-?[0-9.]+(?:e[-+]?[0-9]+)?)<\/text>/g)) {
        const digits = m[1]!.replace(/e.*$/, '').replace(/[-.]/g, '').replace(/^0+/, '').replace(/0+$/, '');
        expect(digits.length, `${r.svgPath}: ${m[1]}`).toBeLessThanOrEqual(4);
      }
    }
  });
});
