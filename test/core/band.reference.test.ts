/**
 * Bands, read-back intervals, t quantiles and Spearman's ρ against R (fixture
 * test/reference/fixtures/band_r.json, made by `Rscript test/reference/gen_band.R`, which records
 * the R and package versions; regenerate with `npm run refs`).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { bandAt, fitBandModel, fitMonotone, knotRegression, RatchetError } from '../../src/core/index.js';
import { checkDirection } from '../../src/core/direction-check.js';
import { inverseBand, monotoneActiveSetBasis } from '../../src/core/band.js';
import { spearman } from '../../src/core/direction.js';
import { spreadStatistics } from '../../src/core/statistics.js';
import { studentTCdf, studentTQuantile } from '../../src/core/student-t.js';
import { touchingBandSpecs } from './touching-band.js';
import { expectBandRows, type BandRow } from './band-fixture-checks.js';

interface BandCase {
  name: string;
  source: string;
  x: number[];
  y: number[];
  w?: number[] | null;
  knots?: number | number[];
  knot_x?: number[];
  theta?: number[];
  theta_quadprog?: number[];
  groups?: number[];
  parameters?: number;
  sigma: number;
  df_resid: number;
  new_x: number[];
  bands: BandRow[];
}
interface CalibrationCase {
  name: string;
  source: string;
  x: number[];
  y: number[];
  w?: number[] | null;
  sets: { level: number; replicates: number; intervals: { target: number; lower: number; x: number; upper: number }[] }[];
}
interface BandFixture {
  command: string;
  versions: Record<string, string>;
  qt: { p: number[]; rows: { df: number; q: number[] }[] };
  pt: { t: number[]; rows: { df: number; lower: number[]; upper: number[] }[] };
  line: BandCase[];
  hat: BandCase[];
  active: BandCase[];
  calibration: CalibrationCase[];
  spearman: { name: string; source: string; x: number[]; y: number[]; spearman: number }[];
}

const fixture = JSON.parse(readFileSync(new URL('../reference/fixtures/band_r.json', import.meta.url), 'utf8')) as BandFixture;

/** Checks every band row of a case against R's predict.lm at 1e-9 relative. */
function checkBands(c: BandCase, knots: number | number[]): void {
  const model = fitBandModel(c.x, c.y, { knots, weights: c.w ?? undefined });
  expect(model.sigma).toBeCloseRel(c.sigma, 1e-9);
  expect(model.dfResid).toBe(c.df_resid);
  expectBandRows(model, c.new_x, c.bands);
}

describe('Student t quantile against R stats::qt (gen_band.R)', () => {
  it(`equals qt to 1e-12 relative for ${fixture.qt.rows.length} df (1 … 1000 and non-integer) × ${fixture.qt.p.length} probabilities 0.55 … 0.9995`, () => {
    let worst = 0;
    for (const row of fixture.qt.rows) {
      fixture.qt.p.forEach((p, k) => {
        const q = studentTQuantile(p, row.df);
        worst = Math.max(worst, Math.abs(q - row.q[k]!) / Math.abs(row.q[k]!));
      });
    }
    expect(worst).toBeLessThan(1e-12);
  });
});

describe('Student t distribution function against R stats::pt (gen_band.R)', () => {
  it(`equals pt (lower and upper tail) to 1e-13 relative on ${fixture.pt.t.length} t values × ${fixture.pt.rows.length} df`, () => {
    for (const row of fixture.pt.rows) {
      fixture.pt.t.forEach((t, k) => {
        expect(studentTCdf(t, row.df)).toBeCloseRel(row.lower[k]!, 1e-13, 0);
        expect(studentTCdf(-t, row.df)).toBeCloseRel(row.upper[k]!, 1e-13, 0);
      });
    }
  });
});

describe('BAND with knots = 2 equals R predict.lm on lm(y ~ x) (gen_band.R, R datasets package)', () => {
  for (const c of fixture.line) {
    it(`${c.name} (${c.source}${c.w ? ', seeded weights' : ''}): confidence and prediction bands at levels 0.5, 0.9, 0.95, 0.99 to 1e-9 relative`, () => {
      checkBands(c, 2);
    });
  }
  it('the worked check: women at height 65 (R predict.lm on lm(weight ~ height, women))', () => {
    const women = fixture.line.find((c) => c.name === 'women')!;
    const model = fitBandModel(women.x, women.y, { knots: 2 });
    const conf = bandAt(model, [65], 0.95, 'confidence');
    const pred = bandAt(model, [65], 0.9, 'prediction');
    expect(conf.fit[0]).toBeCloseRel(136.733333333333, 1e-14);
    expect(conf.lower[0]).toBeCloseRel(135.882678099931, 1e-14);
    expect(conf.upper[0]).toBeCloseRel(137.583988566735, 1e-14);
    expect(pred.lower[0]).toBeCloseRel(133.94408019953, 1e-13);
    expect(pred.upper[0]).toBeCloseRel(139.522586467137, 1e-14);
    expect(model.sigma).toBeCloseRel(1.52500525429947, 1e-13);
  });
});

describe('BAND with more knots and no active constraint equals predict.lm on the degree-1 B-spline basis (splines::bs)', () => {
  for (const c of fixture.hat) {
    it(`${c.name} (${c.source}): knots ${JSON.stringify(c.knots)}, bands at levels 0.9 and 0.95 to 1e-9 relative`, () => {
      const fit = knotRegression(c.x, c.y, { knots: c.knots!, weights: c.w ?? undefined });
      expect(fit.knotY).toBeAllCloseRel(c.theta!, 1e-9);
      expect(fit.levels).toBe(fit.knotY.length);
      checkBands(c, c.knots!);
    });
  }
});

describe('BAND with an active constraint equals predict.lm on the reduced design of the groups (quadprog::solve.QP + lm)', () => {
  for (const c of fixture.active) {
    it(`${c.name} (${c.source.slice(0, 40)}…): same groups as quadprog's solution, bands to 1e-9 relative`, () => {
      const fit = knotRegression(c.x, c.y, { knots: c.knot_x!, weights: c.w ?? undefined });
      expect(fit.knotY).toBeAllCloseRel(c.theta_quadprog!, 1e-7);
      const basis = monotoneActiveSetBasis(fit.knotX, fit.knotY, fit.identified);
      expect(basis.size).toBe(c.parameters);
      const groupOf = Array.from({ length: basis.knots }, (_, j) => basis.col[basis.rowStart[j]!]! + 1);
      expect(groupOf).toEqual(c.groups);
      checkBands(c, c.knot_x!);
    });
  }
});

describe('INVERTBAND with knots = 2 equals the classical straight-line calibration interval (Eisenhart 1939; computed in R, gen_band.R)', () => {
  for (const c of fixture.calibration) {
    for (const set of c.sets) {
      it(`${c.name} (${c.source}): level ${set.level}, ${set.replicates} replicate(s), ${set.intervals.length} targets to 1e-8 relative`, () => {
        const model = fitBandModel(c.x, c.y, { knots: 2, weights: c.w ?? undefined });
        const got = inverseBand(model, set.intervals.map((r) => r.target), set.level, set.replicates);
        set.intervals.forEach((r, k) => {
          const g = got[k]!;
          expect(g.lower).not.toBeInstanceOf(RatchetError);
          expect(g.upper).not.toBeInstanceOf(RatchetError);
          expect(g.lower as number).toBeCloseRel(r.lower, 1e-8);
          expect(g.x as number).toBeCloseRel(r.x, 1e-8);
          expect(g.upper as number).toBeCloseRel(r.upper, 1e-8);
        });
      });
    }
  }
});

describe("Spearman's rank correlation against R cor(method = 'spearman')", () => {
  for (const c of fixture.spearman) {
    it(`${c.name} (${c.source}) to 1e-12`, () => {
      expect(spearman(c.x, c.y)).toBeCloseRel(c.spearman, 1e-12);
    });
    it(`${c.name}: rows of weight 0 are left out (R's value on the other rows, with three zero-weight rows appended that would reverse it)`, () => {
      const n = c.x.length;
      const x = [...c.x, -1e9, -2e9, -3e9];
      const y = [...c.y, 1e9, 2e9, 3e9];
      const w = [...Array<number>(n).fill(1), 0, 0, 0];
      expect(spearman(x, y, w)).toBeCloseRel(c.spearman, 1e-12);
    });
  }
});

describe('STATS sigma, df_resid and spearman against R (summary(lm)$sigma, df.residual, cor(method = "spearman"); gen_band.R)', () => {
  for (const c of fixture.line) {
    it(`${c.name}: knots = 2 fit gives R's sigma to 1e-9 and df_resid exactly`, () => {
      const m = fitMonotone(c.x, c.y, { knots: 2, weights: c.w ?? undefined });
      const s = spreadStatistics(c.x, c.y, m.fitted, m.levels, c.w ?? undefined);
      expect(s.sigma!).toBeCloseRel(c.sigma, 1e-9);
      expect(s.dfResid).toBe(c.df_resid);
      expect(s.spearman!).toBeCloseRel(spearman(c.x, c.y), 1e-15);
    });
  }
  for (const c of fixture.spearman) {
    it(`${c.name}: spreadStatistics' spearman equals R's ${c.spearman.toFixed(6)} to 1e-12`, () => {
      const m = fitMonotone(c.x, c.y, { direction: 'auto' });
      expect(spreadStatistics(c.x, c.y, m.fitted, m.levels).spearman!).toBeCloseRel(c.spearman, 1e-12);
    });
  }
});

describe('direction check on R datasets (gen_band.R spearman cases)', () => {
  const get = (name: string) => fixture.spearman.find((c) => c.name === name)!;
  it("mtcars mpg ~ wt (R's rho -0.886) fitted 'up': warns and suggests 'down'", () => {
    const c = get('mtcars');
    const warning = checkDirection(c.x, c.y, 'up');
    expect(warning).not.toBeNull();
    expect(warning!.suggested).toBe('down');
    expect(warning!.spearman).toBeCloseRel(c.spearman, 1e-12);
    expect(warning!.pValue).toBeLessThan(1e-6);
    expect(warning!.message).toBe("y falls as x rises (Spearman's rank correlation -0.89, 32 rows) but the fit is 'up'; try direction 'down'.");
  });
  it("mtcars fitted 'down' and cars dist ~ speed fitted 'up': no warning", () => {
    expect(checkDirection(get('mtcars').x, get('mtcars').y, 'down')).toBeNull();
    expect(checkDirection(get('cars').x, get('cars').y, 'up')).toBeNull();
  });
  it("cars fitted 'down' warns and suggests 'up'", () => {
    expect(checkDirection(get('cars').x, get('cars').y, 'down')?.suggested).toBe('up');
  });
});

// A band edge that touches the target without crossing it (degree 1). Data: x = 0, 0.5, …, 10,
// y = 10·(1 − e^(−x/2)) + 0.1·sin(7i) rounded to 3 places (invented), knots 0, 3, 6, 10, no active
// constraint, level 0.95, replicates 4. On [6, 10] the lower edge of the band rises to a maximum and
// falls again; with the target y0 equal to that maximum it touches y0 at one point (a double root),
// which is the upper limit. Reference: R 4.2.2 (packages splines 4.2.2, stats 4.2.2), lm on
// splineDesign(ord = 2) as in test/reference/gen_band.R; the touching point is the root of the
// derivative of the lower edge, 4f′²V − t²V′² = 0 (polyroot on the polynomial pieces of f and V on
// [6, 10]), the read-back and the crossings by uniroot (tol 1e-14). The values below are what this
// command prints, in order (working directory anywhere):
// Rscript -e '
//   library(splines)
//   x <- seq(0, 10, by = 0.5)
//   y <- c(0, 2.278, 4.034, 5.36, 6.348, 7.092, 7.677, 8.167, 8.594, 8.963, 9.257, 9.461, 9.575, 9.623, 9.641, 9.668, 9.728, 9.82, 9.922, 10, 10.031)
//   ord <- 2; m <- 4; a <- 6; b <- 10
//   ext <- c(rep(0, ord), 3, 6, rep(10, ord))
//   fit <- lm(y ~ splineDesign(ext, x, ord = ord) - 1); stopifnot(all(diff(coef(fit)) > 0))
//   tq <- qt(0.975, fit$df.residual); s2 <- summary(fit)$sigma^2
//   f <- function(u) as.numeric(splineDesign(ext, u, ord = ord) %*% coef(fit))
//   V <- function(u) { B0 <- splineDesign(ext, u, ord = ord); rowSums((B0 %*% vcov(fit)) * B0) + s2 / m }
//   lowerEdge <- function(u) f(u) - tq * sqrt(V(u)); upperEdge <- function(u) f(u) + tq * sqrt(V(u))
//   s <- seq(0, 1, length.out = 2 * ord - 1)
//   sf <- seq(0, 1, length.out = ord); pf <- solve(outer(sf, 0:(ord - 1), "^"), f(a + (b - a) * sf))
//   pv <- solve(outer(s, 0:(2 * ord - 2), "^"), V(a + (b - a) * s))
//   d <- function(p) p[-1] * seq_len(length(p) - 1)
//   mul <- function(p, q) { r <- rep(0, length(p) + length(q) - 1); for (i in seq_along(p)) r[i - 1 + seq_along(q)] <- r[i - 1 + seq_along(q)] + p[i] * q; r }
//   eq <- 4 * mul(mul(d(pf), d(pf)), pv); e2 <- tq^2 * mul(d(pv), d(pv)); eq[seq_along(e2)] <- eq[seq_along(e2)] - e2
//   r <- polyroot(eq); r <- Re(r[abs(Im(r)) < 1e-9 & Re(r) > 0 & Re(r) < 1])
//   r <- r[sapply(r, function(u) sum(d(pv) * u^(seq_along(d(pv)) - 1)) > 0)]
//   xt <- a + (b - a) * r; y0 <- lowerEdge(xt)
//   back <- function(y) uniroot(function(u) f(u) - y, c(0, 10), tol = 1e-14)$root
//   low <- function(y) uniroot(function(u) upperEdge(u) - y, c(0, back(y)), tol = 1e-14)$root
//   up <- function(y) uniroot(function(u) lowerEdge(u) - y, c(back(y), xt), tol = 1e-14)$root
//   cat(sprintf("%.17g", c(xt, y0, back(y0), low(y0), back(y0 - 1e-6), low(y0 - 1e-6), up(y0 - 1e-6), back(y0 + 1e-6), low(y0 + 1e-6), optimize(lowerEdge, c(back(y0 + 1e-6), 10), maximum = TRUE, tol = 1e-12)$objective)), "\n")
// '
const touch1 = {
  x: Array.from({ length: 21 }, (_, i) => i / 2),
  y: [0, 2.278, 4.034, 5.36, 6.348, 7.092, 7.677, 8.167, 8.594, 8.963, 9.257, 9.461, 9.575, 9.623, 9.641, 9.668, 9.728, 9.82, 9.922, 10, 10.031],
  knots: [0, 3, 6, 10],
  /** xt: the touching point; y0: the lower edge there (its maximum on [6, 10]). */
  xt: 9.6381693125239138,
  y0: 9.3623110085167038,
  atTouch: { x: 5.5196910257369876, lower: 4.3440279944197204 },
  /** Target y0 − 1e-6: the lower edge crosses it just before the touching point. */
  below: { x: 5.5196886651658712, lower: 4.3440254893225267, upper: 9.6309765914189605 },
  /** Target y0 + 1e-6: the lower edge stays below it (its maximum right of the read-back is 9.3623110085167038). */
  above: { x: 5.5196933863081021, lower: 4.3440304995152781, edgeMax: 9.3623110085167038 },
};

describe('INVERTBAND (degree 1) at a touching band edge equals R (lm on splineDesign(ord = 2), polyroot): the touching point is the limit, as for degree 2', () => {
  const model = fitBandModel(touch1.x, touch1.y, { knots: touch1.knots });
  touchingBandSpecs(model, touch1);
});
