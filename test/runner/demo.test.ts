/**
 * The demo: for every sample it reports the knot count BESTK suggests and the knot table of that
 * fit — checked here against the core called directly (crossValidate + suggestKnots with the
 * same defaults: candidates 2 … min(20, distinct x), 5 folds, seed 1, one-SE rule; fitMonotone
 * with that many knots) — and writes an SVG with one circle per data point and one marker per knot.
 * For the surface sample it reports the (knots1, knots2) pair of CVGRID's one-SE choice and that
 * lattice's GRID table — checked against crossValidateSurface + suggestSurfaceKnots + fitSurface —
 * and writes an SVG heat-map with one labelled cell per lattice value.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { crossValidate, crossValidateSurface, fitMonotone, fitSurface, suggestKnots, suggestSurfaceKnots } from '../../src/core/index.js';
import { buildSamples } from '../../scripts/samples/samples.js';
import { niceTicks, runDemo } from '../../scripts/samples/demo.js';
import './helpers.js';

const ROOT = join(import.meta.dirname, '..', '..');

describe('npm run demo', async () => {
  const lines: string[] = [];
  const out = mkdtempSync(join(tmpdir(), 'ratchet-demo-'));
  const results = await runDemo(ROOT, (l) => lines.push(l), out);
  const samples = buildSamples();
  const curves = samples.map((s, i) => [s.file, s, i] as const).filter(([, s]) => s.data.x2s === undefined);

  it('covers every sample', () => {
    expect(results.map((r) => r.file)).toEqual(samples.map((s) => s.file));
  });

  it('has one surface sample and shows it as a lattice', () => {
    expect(samples.filter((s) => s.data.x2s !== undefined).map((s) => s.file)).toEqual(['coating-cure.xlsx']);
    expect(results.map((r) => r.kind)).toEqual(samples.map((s) => (s.data.x2s === undefined ? 'curve' : 'surface')));
  });

  it.each(curves)('%s: suggestion, cv_rmse and knot table agree with the core', (_f, s, i) => {
    const r = results[i]!;
    if (r.kind !== 'curve') throw new Error(`${r.file} is not a curve result`);
    const rows = s.columns.A!.map((x, k) => [x, s.columns.B![k], s.data.weights ? s.columns.C![k] : 1] as const).filter((t) => t[0] !== null && t[1] !== null);
    const x = rows.map((t) => t[0]!);
    const y = rows.map((t) => t[1]!);
    const w = s.data.weights ? rows.map((t) => t[2]!) : undefined;
    const direction = ({ 1: 'up', [-1]: 'down', 0: 'auto' } as const)[s.data.direction as 1 | -1 | 0];
    const cv = crossValidate(x, y, { weights: w, direction });
    const k = suggestKnots(cv.scores, 'one-se').knots;
    expect(r.suggested).toBe(k);
    expect(r.cvRmse).toBeCloseRel(cv.scores.find((c) => c.knots === k)!.cvRmse, 1e-12);
    const m = fitMonotone(x, y, { knots: k, weights: w, direction });
    expect(r.knots.map((q) => q[0])).toBeAllCloseRel(m.knotX, 1e-12);
    expect(r.knots.map((q) => q[1])).toBeAllCloseRel(m.knotY, 1e-12);
    expect(r.points.length).toBe(x.length);
    const svg = readFileSync(r.svgPath, 'utf8');
    expect(svg.match(/<circle /g)!.length).toBe(x.length + 1); // points + legend marker
    expect(svg.match(/<rect x=.*stroke="#1f5fa8"/g)!.length).toBe(m.knotX.length + 1); // knots + legend marker
    expect(svg).toContain(s.data.xLabel.replace(/&/g, '&amp;'));
    expect(svg).toContain('invented data');
  });

  it('coating-cure.xlsx: suggested pair, cv_rmse and GRID table agree with the core; the SVG has one labelled cell per value', () => {
    const i = samples.findIndex((s) => s.file === 'coating-cure.xlsx');
    const s = samples[i]!;
    const r = results[i]!;
    if (r.kind !== 'surface') throw new Error('coating-cure.xlsx is not a surface result');
    const x1 = s.columns.A as number[];
    const x2 = s.columns.B as number[];
    const y = s.columns.C as number[];
    // CVGRID defaults: candidates 2 … min(6, distinct levels) per input, 5 folds, 1 repeat, seed 1.
    const cv = crossValidateSurface(x1, x2, y);
    const pick = suggestSurfaceKnots(cv.scores, 'one-se');
    expect(r.suggested).toEqual([pick.knots1, pick.knots2]);
    expect(r.cvRmse).toBeCloseRel(cv.scores[pick.index]!.cvRmse, 1e-12);
    const m = fitSurface(x1, x2, y, { knots1: pick.knots1, knots2: pick.knots2 });
    expect(r.grid.knots1).toBeAllCloseRel(Array.from(m.knots1), 1e-12);
    expect(r.grid.knots2).toBeAllCloseRel(Array.from(m.knots2), 1e-12);
    expect(r.grid.values.flat()).toBeAllCloseRel(Array.from(m.values), 1e-12);
    expect(r.rows).toBe(y.length);
    const svg = readFileSync(r.svgPath, 'utf8');
    expect(svg.match(/<rect class="cell"/g)!.length).toBe(m.knots1.length * m.knots2.length);
    expect(svg).toContain('invented data');
    expect(svg).toContain(s.data.x2Label!);
    const text = lines.join('\n');
    expect(text).toContain(`suggested lattice: ${pick.knots1} × ${pick.knots2} knots`);
    expect(text).toContain('RATCHET.GRID (rows: dwell time (min)');
  });

  it('prints the suggestion, its cv_rmse and the knot table per sample', () => {
    const text = lines.join('\n');
    for (const r of results) {
      expect(text).toContain(`${r.file} — `);
      if (r.kind === 'curve') expect(text).toContain(`suggested knot count: ${r.suggested}`);
    }
    expect(text.match(/cv_rmse at \d+ knots: /g)!.length).toBe(curves.length);
  });

  it('picks round tick steps, at least 4 of them', () => {
    expect(niceTicks(0, 10)).toEqual([0, 2, 4, 6, 8, 10]);
    expect(niceTicks(863.2, 1256.8)).toEqual([900, 1000, 1100, 1200]);
    // a span that a step of 5 covers with two ticks gets the next finer step (2)
    expect(niceTicks(9.6, 20.4)).toEqual([10, 12, 14, 16, 18, 20]);
    expect(niceTicks(11.2, 14.3, 6, 4)).toEqual([11.5, 12, 12.5, 13, 13.5, 14]);
  });

  it('every fit picture has at least 4 y ticks, the adhesive-tack one included', () => {
    for (const r of results) {
      if (r.kind !== 'curve') continue;
      const svg = readFileSync(r.svgPath, 'utf8');
      // y tick labels are right-aligned left of the axis
      const yTicks = svg.match(/<text x="[0-9.]+" y="[0-9.]+" text-anchor="end">/g) ?? [];
      expect(yTicks.length, r.file).toBeGreaterThanOrEqual(4);
    }
  });

  it('the pictures follow the digits rule (at most 4 significant digits) and label the heat-map axes once', () => {
    for (const r of results) {
      const svg = readFileSync(r.svgPath, 'utf8');
      for (const m of svg.matchAll(/>(-?[0-9.]+(?:e[-+]?[0-9]+)?)<\/text>/g)) {
        const digits = m[1]!.replace(/e.*$/, '').replace(/[-.]/g, '').replace(/^0+/, '').replace(/0+$/, '');
        expect(digits.length, `${r.file}: ${m[1]}`).toBeLessThanOrEqual(4);
      }
      expect(svg).not.toContain('(knots)');
    }
    const surface = results.find((r) => r.kind === 'surface')!;
    expect(readFileSync(surface.svgPath, 'utf8')).toContain('knots of dwell time (min)');
  });
});
