/**
 * The examples of the README section "Uncertainty: bands and read-back intervals", computed with
 * the core on the README's example data (A2:A7 hours, B2:B7 hardness). The README rounds to 6
 * significant digits; these checks use the same rounding. The worksheet functions that wrap these
 * core calls check the same numbers through the cells.
 */
import { describe, expect, it } from 'vitest';
import { bandAt, fitBandModel, fitMonotone, RatchetError } from '../../src/core/index.js';
import { checkDirection } from '../../src/core/direction-check.js';
import { inverseBand } from '../../src/core/band.js';
import { spreadStatistics } from '../../src/core/statistics.js';

const hours = [1, 2, 3, 4, 5, 6];
const hardness = [10, 14, 12, 17, 16, 21];
const g6 = (v: number | RatchetError) => (typeof v === 'number' ? Number(v.toPrecision(6)) : v.message);

describe('README "Uncertainty: bands and read-back intervals" examples', () => {
  const line = fitBandModel(hours, hardness, { knots: 2 });
  it('BAND(3.5, …, 2) → 12.8968, 15, 17.1032 with σ̂ 1.85549 on 4 df', () => {
    const b = bandAt(line, [3.5]);
    expect([b.lower[0]!, b.fit[0]!, b.upper[0]!].map(g6)).toEqual([12.8968, 15, 17.1032]);
    expect(g6(line.sigma)).toBe(1.85549);
    expect(line.dfResid).toBe(4);
  });
  it('BAND({1;6}, …, 2) → 6.5572, 10.2857, 14.0142 and 15.9858, 19.7143, 23.4428', () => {
    const b = bandAt(line, [1, 6]);
    expect([0, 1].map((i) => [b.lower[i]!, b.fit[i]!, b.upper[i]!].map(g6))).toEqual([
      [6.5572, 10.2857, 14.0142],
      [15.9858, 19.7143, 23.4428],
    ]);
  });
  it('BAND(3.5, …, 2, , , 0.9, 2) → 10.7274, 15, 19.2726 (prediction)', () => {
    const b = bandAt(line, [3.5], 0.9, 'prediction');
    expect([b.lower[0]!, b.fit[0]!, b.upper[0]!].map(g6)).toEqual([10.7274, 15, 19.2726]);
  });
  it('BAND(3.5, …, 3) → 8.64296, 14.25, 19.857 on 3 df', () => {
    const m = fitBandModel(hours, hardness, { knots: 3 });
    const b = bandAt(m, [3.5]);
    expect(m.dfResid).toBe(3);
    expect([b.lower[0]!, b.fit[0]!, b.upper[0]!].map(g6)).toEqual([8.64296, 14.25, 19.857]);
  });
  it('BAND without knots → the BAD_KNOTS message quoted in the README', () => {
    expect(() => fitBandModel(hours, hardness, { knots: undefined })).toThrow(
      'knots: BAND needs the knot model (a knot count ≥ 2 or knot positions); the classic fit (knots 0) has no valid pointwise band, see README "Uncertainty: bands and read-back intervals".',
    );
  });
  it('INVERTBAND(15, …, 2, , , 0.8, 4) → 2.45592, 3.5, 4.54408; target 12 → #N/A below, 1.90909, 2.90618', () => {
    const [a, b] = inverseBand(line, [15, 12], 0.8, 4);
    expect([a!.lower, a!.x, a!.upper].map(g6)).toEqual([2.45592, 3.5, 4.54408]);
    expect([b!.lower, b!.x, b!.upper].map(g6)).toEqual([
      "target_ys: needs a band whose upper edge falls to 12 inside the data's x range; the lower x limit lies below 1.",
      1.90909,
      2.90618,
    ]);
  });
  it('a falling curve (y → −y, direction down) gives the mirrored interval, and its unreached lower limit names the lower edge rising to the target', () => {
    const falling = fitBandModel(hours, hardness.map((v) => -v), { knots: 2, direction: 'down' });
    const [b] = inverseBand(falling, [-12], 0.8, 4);
    expect([b!.lower, b!.x, b!.upper].map(g6)).toEqual([
      "target_ys: needs a band whose lower edge rises to -12 inside the data's x range; the lower x limit lies below 1.",
      1.90909,
      2.90618,
    ]);
    // Far above the curve's top right of the read-back: the upper limit is the one not reached.
    const [c] = inverseBand(fitBandModel(hours, hardness.map((v) => -v), { knots: 2, direction: 'down' }), [-19.5], 0.8, 4);
    expect(g6(c!.upper)).toMatch(/^target_ys: needs a band whose upper edge falls to -19\.5 inside the data's x range; the upper x limit lies above 6\.$/);
  });
  it("INVERTBAND(30, …, 2) → NOT_REACHABLE in all three; INVERTBAND(15, …, 2) → #N/A, 3.5, #N/A", () => {
    const [r] = inverseBand(line, [30]);
    for (const v of [r!.lower, r!.x, r!.upper]) expect(g6(v)).toMatch(/^target_ys: 30 is outside the curve's range \[10\.2857\d*, 19\.71428\d*\]\.$/);
    const [s] = inverseBand(line, [15]);
    expect([typeof s!.lower, g6(s!.x), typeof s!.upper]).toEqual(['object', 3.5, 'object']);
  });
  it('STATS rows: classic fit sigma 1.11803, df_resid 2, spearman 0.885714; knots 2: sigma 1.85549, df_resid 4', () => {
    const classic = fitMonotone(hours, hardness);
    const s0 = spreadStatistics(hours, hardness, classic.fitted, classic.levels);
    expect([g6(s0.sigma!), s0.dfResid, g6(s0.spearman!)]).toEqual([1.11803, 2, 0.885714]);
    const two = fitMonotone(hours, hardness, { knots: 2 });
    const s2 = spreadStatistics(hours, hardness, two.fitted, two.levels);
    expect([g6(s2.sigma!), s2.dfResid]).toEqual([1.85549, 4]);
  });
  it('sigma is null when n ≤ p and spearman null for constant y', () => {
    const s = spreadStatistics([1, 2, 3], [1, 2, 3], [1, 2, 3], 3);
    expect(s.sigma).toBeNull();
    expect(s.dfResid).toBe(0);
    expect(spreadStatistics([1, 2, 3], [5, 5, 5], [5, 5, 5], 1).spearman).toBeNull();
  });
  it('the direction check stays silent on the example data fitted rising and warns fitted falling', () => {
    expect(checkDirection(hours, hardness, 'up')).toBeNull();
    expect(checkDirection(hours, hardness, 'down')?.message).toBe(
      "y rises as x rises (Spearman's rank correlation 0.89, 6 rows) but the fit is 'down'; try direction 'up'.",
    );
  });
});
