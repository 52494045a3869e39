/**
 * The demo: for every sample it reports the knot count BESTK suggests and the knot table of that
 * fit — checked here against the core called directly (crossValidate + suggestKnots with the
 * same defaults: candidates 2 … min(20, distinct x), 5 folds, seed 1, one-SE rule; fitMonotone
 * with that many knots) — and writes an SVG with one circle per data point and one marker per knot.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { crossValidate, fitMonotone, suggestKnots } from '../../src/core/index.js';
import { buildSamples } from '../../src/runner/samples.js';
import { niceTicks, runDemo } from '../../src/runner/demo.js';
import './helpers.js';

const ROOT = join(import.meta.dirname, '..', '..');

describe('npm run demo', async () => {
  const lines: string[] = [];
  const out = mkdtempSync(join(tmpdir(), 'ratchet-demo-'));
  const results = await runDemo(ROOT, (l) => lines.push(l), out);
  const samples = buildSamples();

  it('covers every sample', () => {
    expect(results.map((r) => r.file)).toEqual(samples.map((s) => s.file));
  });

  it.each(samples.map((s, i) => [s.file, s, i] as const))('%s: suggestion, cv_rmse and knot table agree with the core', (_f, s, i) => {
    const r = results[i]!;
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

  it('prints the suggestion, its cv_rmse and the knot table per sample', () => {
    const text = lines.join('\n');
    for (const r of results) {
      expect(text).toContain(`${r.file} — `);
      expect(text).toContain(`suggested knot count: ${r.suggested}`);
    }
    expect(text.match(/cv_rmse at \d+ knots: /g)!.length).toBe(results.length);
  });

  it('picks round tick steps', () => {
    expect(niceTicks(0, 10)).toEqual([0, 2, 4, 6, 8, 10]);
    expect(niceTicks(863.2, 1256.8)).toEqual([900, 1000, 1100, 1200]);
  });
});
