/**
 * Bands and read-back intervals of the smooth fit (degree 2) against R (fixture
 * test/reference/fixtures/band_smooth_r.json, made by `Rscript test/reference/gen_band_smooth.R`,
 * which records the R and package versions; regenerate with `npm run refs`).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitShapedBandModel } from '../../src/core/index.js';
import { shapeRegression } from '../../src/core/shape-fit.js';
import { touchingBandSpecs } from './touching-band.js';
import { expectBandRows, expectInvertSets, type ReducedDesignCase } from './band-fixture-checks.js';

interface SmoothCase extends ReducedDesignCase {
  groups?: number[];
}
interface SmoothFixture {
  command: string;
  versions: Record<string, string>;
  free: SmoothCase[];
  active: SmoothCase[];
}

const fixture = JSON.parse(readFileSync(new URL('../reference/fixtures/band_smooth_r.json', import.meta.url), 'utf8')) as SmoothFixture;

/** The smooth fit's coefficients, parameters, σ̂ and every band row of a case against R at 1e-9 relative. */
function checkCase(c: SmoothCase): void {
  const options = { knots: c.knot_x, weights: c.w ?? undefined, degree: 2 as const };
  const fit = shapeRegression(c.x, c.y, options);
  expect(fit.coefficients).toBeAllCloseRel(c.coefficients, 1e-7);
  const model = fitShapedBandModel(c.x, c.y, options);
  expect(model.parameters).toBe(c.parameters);
  expect(model.dfResid).toBe(c.df_resid);
  expect(model.sigma).toBeCloseRel(c.sigma, 1e-9);
  expectBandRows(model, c.new_x, c.bands);
}

/** INVERTBAND's three values against R's scan of |f − y0| ≤ t·se_pred (null there: not reached). */
function checkInvert(c: SmoothCase): void {
  const model = fitShapedBandModel(c.x, c.y, { knots: c.knot_x, weights: c.w ?? undefined, degree: 2 });
  expectInvertSets(model, c.invert);
}

describe('smooth BAND with no active constraint equals R predict.lm on lm(y ~ splineDesign(knots_ext, x, ord = 3) - 1) (gen_band_smooth.R, R datasets package)', () => {
  it('the fixture records its command', () => {
    expect(fixture.command).toBe('Rscript test/reference/gen_band_smooth.R');
  });
  for (const c of fixture.free) {
    it(`${c.name} (${c.source}${c.w ? ', seeded weights' : ''}): knots ${JSON.stringify(c.knot_x)}, bands at levels 0.9 and 0.95 to 1e-9 relative, also beyond the end knots`, () => {
      checkCase(c);
    });
  }
});

describe('smooth BAND with an active constraint equals predict.lm on the reduced design of the groups of equal coefficients (quadprog::solve.QP + lm)', () => {
  for (const c of fixture.active) {
    it(`${c.name} (${c.source.slice(0, 40)}…): ${c.parameters} of ${c.knot_x.length + 1} parameters, bands to 1e-9 relative`, () => {
      expect(c.parameters).toBeLessThan(c.knot_x.length + 1);
      checkCase(c);
    });
  }
});

describe('smooth INVERTBAND equals the set {x : |f(x) − y0| ≤ t·se_pred(x)} scanned in R (uniroot on a grid of 4000 steps)', () => {
  for (const c of [...fixture.free, ...fixture.active]) {
    it(`${c.name}: read-back x to 1e-9, limits to 1e-8 relative; limits R does not find inside the data's x range are NOT_REACHABLE`, () => {
      checkInvert(c);
    });
  }
});

// A band edge that touches the target without crossing it (degree 2). Data: x = 0, 0.5, …, 10,
// y = 10·(1 − e^(−x/2)) + 0.1·sin(7i) rounded to 3 places (invented), knots 0, 3, 6, 10, no active
// constraint, level 0.95, replicates 4. On [6, 10] the lower edge of the band rises to a maximum and
// falls again; with the target y0 equal to that maximum it touches y0 at one point (a double root),
// which is the upper limit. Reference: R 4.2.2 (packages splines 4.2.2, stats 4.2.2), lm on
// splineDesign(ord = 3) as in test/reference/gen_band_smooth.R; the touching point is the root of the
// derivative of the lower edge, 4f′²V − t²V′² = 0 (polyroot on the polynomial pieces of f and V on
// [6, 10]), the read-back and the crossings by uniroot (tol 1e-14). The values below are what this
// command prints, in order (working directory anywhere):
// Rscript -e '
//   library(splines)
//   x <- seq(0, 10, by = 0.5)
//   y <- c(0, 2.278, 4.034, 5.36, 6.348, 7.092, 7.677, 8.167, 8.594, 8.963, 9.257, 9.461, 9.575, 9.623, 9.641, 9.668, 9.728, 9.82, 9.922, 10, 10.031)
//   ord <- 3; m <- 4; a <- 6; b <- 10
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
const touch2 = {
  x: Array.from({ length: 21 }, (_, i) => i / 2),
  y: [0, 2.278, 4.034, 5.36, 6.348, 7.092, 7.677, 8.167, 8.594, 8.963, 9.257, 9.461, 9.575, 9.623, 9.641, 9.668, 9.728, 9.82, 9.922, 10, 10.031],
  knots: [0, 3, 6, 10],
  /** xt: the touching point; y0: the lower edge there (its maximum on [6, 10]). */
  xt: 9.7077376276170568,
  y0: 9.7952498564353316,
  atTouch: { x: 7.9542776101525092, lower: 6.8682118740537126 },
  /** Target y0 − 1e-6: the lower edge crosses it just before the touching point. */
  below: { x: 7.9542700802506472, lower: 6.8682061332072948, upper: 9.7039354849807467 },
  /** Target y0 + 1e-6: the lower edge stays below it (its maximum right of the read-back is 9.7952498564353334). */
  above: { x: 7.9542851400656849, lower: 6.8682176149076035, edgeMax: 9.7952498564353334 },
};

describe('smooth INVERTBAND (degree 2) at a touching band edge equals R (lm on splineDesign(ord = 3), polyroot): the touching point is the limit', () => {
  const model = fitShapedBandModel(touch2.x, touch2.y, { knots: touch2.knots, degree: 2 });
  touchingBandSpecs(model, touch2);
});
