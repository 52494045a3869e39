/**
 * Coverage study of the knot model's 95 % confidence band, printed as a table (the README's
 * cautions quote it): `npx tsx scripts/band-coverage.ts [--sims=N]` (default 4,000 data sets per
 * case; seeded SplitMix64, so the numbers are reproducible).
 *
 * Two truths on 60 evenly spaced x in [0, 1], Gaussian noise, 8 even knots:
 *   rising  f(x) = 2x + sin(2πx)/(2π)                 (strictly increasing: no active constraint)
 *   flat    f(x) = x below 2/7, 2/7 up to 5/7, x − 3/7 above   (flat over the knots 2/7 … 5/7)
 * The band's target is the best monotone knot curve for f at these x (knotRegression of the
 * noiseless values). Coverage is reported at x in the flat stretch, at its edges and on the rises.
 */
import { bandAt, fitBandModel, knotRegression, interpolateAt, normalDeviates, SplitMix64 } from '../src/core/index.js';

const simsArg = process.argv.find((a) => a.startsWith('--sims='));
const sims = simsArg ? Number(simsArg.slice(7)) : 4000;

const n = 60;
const x = Array.from({ length: n }, (_, i) => i / (n - 1));
const truths: [string, (v: number) => number][] = [
  ['rising', (v) => 2 * v + Math.sin(2 * Math.PI * v) / (2 * Math.PI)],
  ['flat', (v) => (v < 2 / 7 ? v : v < 5 / 7 ? 2 / 7 : v - 3 / 7)],
];
const at = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9];
console.log(`coverage of the 95 % confidence band, ${sims} data sets per row, n = ${n}, 8 even knots`);
console.log(['truth', 'noise sd', ...at.map((v) => `x=${v}`)].join('\t'));
for (const [name, f] of truths) {
  const clean = x.map(f);
  const target = knotRegression(x, clean, { knots: 8 });
  const proj = at.map((v) => interpolateAt(target.knotX, target.knotY, v));
  for (const sd of [0.02, 0.05, 0.1, 0.2]) {
    const normal = normalDeviates(SplitMix64.fromSeed(1000 + Math.round(sd * 1000)));
    const covered = at.map(() => 0);
    for (let s = 0; s < sims; s++) {
      const y = clean.map((c) => c + sd * normal());
      const band = bandAt(fitBandModel(x, y, { knots: 8 }), at, 0.95, 'confidence');
      at.forEach((_, k) => {
        if (band.lower[k]! <= proj[k]! && proj[k]! <= band.upper[k]!) covered[k]!++;
      });
    }
    console.log([name, sd, ...covered.map((c) => ((100 * c) / sims).toFixed(1))].join('\t'));
  }
}
