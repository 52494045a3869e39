# Reference fixtures for the shaped knot fits (concave, convex, smooth), computed with R.
#
# Run by test/reference/generate.sh (npm run refs) BEFORE the Python generators: gen_shapes.py
# reads the cases written here and solves the same problems with cvxopt. Writes:
#   fixtures/shapes_r.json  for every case: the inputs (open datasets from R's datasets package and
#                           seeded random cases), the knots, and the optimum of the QP on the same
#                           design by quadprog::solve.QP; plus quadratic B-spline basis values from
#                           splines::splineDesign
# The design: hat functions (degree 1) or quadratic B-splines (degree 2) on the knot sequence
# t0, t0, t0, t1, ..., tK, tK, tK, both from splines::splineDesign; x clamped to [t0, tK]. The
# constraints are those documented in docs/shapes.md, built here from the knots independently of
# the TypeScript code.
# Command: Rscript test/reference/gen_shapes.R   (working directory: the repository root)
# Output is deterministic: fixed seeds, shortest round-tripping number format, no time stamps.

suppressPackageStartupMessages({
  library(quadprog)
  library(splines)
})

source(file.path("test", "reference", "json_writer.R")) # out_dir, jarr(), write_json()

versions <- list(
  R = R.version.string,
  quadprog = as.character(packageVersion("quadprog")),
  splines = as.character(packageVersion("splines")),
  datasets = as.character(packageVersion("datasets"))
)
command <- "Rscript test/reference/gen_shapes.R"

# ---------------------------------------------------------------- the design and the constraints
# Basis matrix B (n x m) for knots t (ascending) and degree 1 or 2, x clamped to [t1, tK].
design <- function(x, t, degree) {
  xc <- pmin(pmax(x, t[1]), t[length(t)])
  tau <- c(rep(t[1], degree), t, rep(t[length(t)], degree))
  splineDesign(knots = tau, x = xc, ord = degree + 1, outer.ok = FALSE)
}
# Spans g_k of the coefficient differences: knot spacing (degree 1) or (tau[k+3] - tau[k+1]) / 2
# on the clamped quadratic knot sequence (degree 2): the derivative of a quadratic spline is the
# linear spline with values (c[k+1] - c[k]) / g_k.
spans <- function(t, degree) {
  if (degree == 1) return(diff(t))
  tau <- c(t[1], t[1], t, t[length(t)], t[length(t)])
  m <- length(t) + 1
  vapply(seq_len(m - 1), function(k) (tau[k + 3] - tau[k + 1]) / 2, 0)
}
# Constraint matrix A (rows) and b with A theta >= b, in the rising frame (curvature already
# flipped for a falling fit): 0 -> every difference >= 0; +1 convex -> changes of slope >= 0 and
# the first difference >= 0; -1 concave -> changes of slope <= 0 and the last difference >= 0;
# then theta_1 >= lower and -theta_m >= -upper when finite.
constraints <- function(m, g, curv, lo, hi) {
  rows <- list()
  b <- c()
  add <- function(r, v) {
    rows[[length(rows) + 1]] <<- r
    b <<- c(b, v)
  }
  if (curv == 0) {
    for (k in 1:(m - 1)) { r <- numeric(m); r[k] <- -1; r[k + 1] <- 1; add(r, 0) }
  } else {
    if (m >= 3) for (k in 1:(m - 2)) {
      r <- numeric(m)
      r[k] <- curv / g[k]; r[k + 1] <- -curv * (1 / g[k] + 1 / g[k + 1]); r[k + 2] <- curv / g[k + 1]
      add(r, 0)
    }
    s <- if (curv > 0) 1 else m - 1
    r <- numeric(m); r[s] <- -1; r[s + 1] <- 1; add(r, 0)
  }
  if (is.finite(lo)) { r <- numeric(m); r[1] <- 1; add(r, lo) }
  if (is.finite(hi)) { r <- numeric(m); r[m] <- -1; add(r, -hi) }
  list(A = do.call(rbind, rows), b = b)
}

solve_case <- function(cs) {
  x <- cs$x; y <- cs$y
  w <- if (is.null(cs$w)) rep(1, length(x)) else cs$w
  s <- if (cs$direction == "up") 1 else -1
  lo <- if (is.null(cs$lower)) -Inf else cs$lower
  hi <- if (is.null(cs$upper)) Inf else cs$upper
  los <- if (s > 0) lo else -hi
  his <- if (s > 0) hi else -lo
  B <- design(x, cs$knots, cs$degree)
  m <- ncol(B)
  Dmat <- crossprod(B, w * B)
  dvec <- as.vector(crossprod(B, w * s * y))
  con <- constraints(m, spans(cs$knots, cs$degree), s * cs$curvature, los, his)
  ev <- min(eigen(Dmat, symmetric = TRUE, only.values = TRUE)$values)
  if (!(ev > 1e-10 * max(diag(Dmat)))) stop("case ", cs$name, ": the design does not identify every coefficient")
  sol <- solve.QP(Dmat, dvec, t(con$A), con$b)
  theta <- s * sol$solution
  fitted <- as.vector(B %*% theta)
  c(cs, list(
    x = jarr(x), y = jarr(y), w = if (is.null(cs$w)) NULL else jarr(cs$w), knots = jarr(cs$knots),
    quadprog_coefficients = jarr(theta), quadprog_fitted = jarr(fitted),
    quadprog_sse = sum(w * (y - fitted)^2)
  ))
}

# ---------------------------------------------------------------- cases
even <- function(x, K) seq(min(x), max(x), length.out = K)
dcase <- function(name, frame, xcol, ycol, K, direction, curvature, degree, note, lower = NULL, upper = NULL) {
  x <- get(frame)[[xcol]]; y <- get(frame)[[ycol]]
  # K: a count of evenly spaced knots, or explicit positions
  list(name = name, source = paste0("R datasets::", frame, " (", xcol, " -> ", ycol, ")"), note = note,
       x = x, y = y, knots = if (length(K) == 1) even(x, K) else K, direction = direction, curvature = curvature, degree = degree,
       lower = lower, upper = upper)
}
cases <- list(
  dcase("cars_convex", "cars", "speed", "dist", 6, "up", 1, 1, "stopping distance grows faster than speed: convex rising, ties in x"),
  dcase("cars_smooth", "cars", "speed", "dist", 5, "up", 0, 2, "smooth rising fit"),
  dcase("cars_smooth_convex", "cars", "speed", "dist", 5, "up", 1, 2, "smooth convex rising fit"),
  dcase("pressure_convex", "pressure", "temperature", "pressure", 7, "up", 1, 1, "vapour pressure of mercury, strongly convex"),
  dcase("pressure_smooth", "pressure", "temperature", "pressure", 6, "up", 0, 2, "smooth rising fit"),
  dcase("Puromycin_concave", "Puromycin", "conc", "rate", c(0.02, 0.11, 0.22, 0.56, 1.1), "up", -1, 1, "reaction rate saturates: concave rising, ties and gaps in x"),
  dcase("Puromycin_smooth_concave", "Puromycin", "conc", "rate", c(0.02, 0.15, 0.5, 1.1), "up", -1, 2, "smooth concave rising fit"),
  dcase("mtcars_convex_down", "mtcars", "wt", "mpg", 5, "down", 1, 1, "fuel economy falls with weight, flattening: convex falling"),
  dcase("mtcars_smooth_down", "mtcars", "wt", "mpg", 5, "down", 0, 2, "smooth falling fit"),
  dcase("trees_concave_bounded", "trees", "Girth", "Volume", 4, "up", -1, 1, "concave against the data's convexity, with bounds", lower = 12, upper = 70),
  dcase("women_smooth_concave", "women", "height", "weight", 4, "up", -1, 2, "nearly linear data, smooth concave")
)
rnd <- function(v) round(v, 3)
set.seed(17001)
{
  x <- rnd(runif(40, 0, 10)); y <- rnd(3 * sqrt(x) + rnorm(40, sd = 0.4)); w <- rnd(runif(40, 0.2, 2))
  cases[[length(cases) + 1]] <- list(name = "random_concave_weighted", seed = 17001, note = "40 rows, weights, concave rising",
    x = x, y = y, w = w, knots = c(0, 1.5, 3, 4, 6, 8.5, 10), direction = "up", curvature = -1, degree = 1)
}
set.seed(17002)
{
  x <- rnd(runif(50, -2, 2)); y <- rnd(exp(-x) + rnorm(50, sd = 0.3))
  cases[[length(cases) + 1]] <- list(name = "random_convex_down", seed = 17002, note = "50 rows, convex falling, explicit uneven knots",
    x = x, y = y, knots = c(-2, -1.2, -0.3, 0.5, 1.1, 2), direction = "down", curvature = 1, degree = 1)
}
set.seed(17003)
{
  x <- rnd(runif(60, 0, 5)); y <- rnd(x + sin(2 * x) + rnorm(60, sd = 0.3)); w <- rnd(rexp(60))
  cases[[length(cases) + 1]] <- list(name = "random_smooth_weighted", seed = 17003, note = "60 rows, wavy rising trend, weights: the monotone constraints bind",
    x = x, y = y, w = w, knots = even(x, 8), direction = "up", curvature = 0, degree = 2)
}
set.seed(17004)
{
  x <- rnd(runif(45, 0, 6)); y <- rnd(log1p(x) + rnorm(45, sd = 0.25))
  cases[[length(cases) + 1]] <- list(name = "random_smooth_concave_bounded", seed = 17004, note = "45 rows, smooth concave rising with bounds",
    x = x, y = y, knots = c(0, 1, 2.5, 4, 6), direction = "up", curvature = -1, degree = 2, lower = 0.1, upper = 1.8)
}
set.seed(17005)
{
  x <- rnd(runif(70, 0, 8)); y <- rnd(0.1 * x^2 + rnorm(70, sd = 0.8))
  cases[[length(cases) + 1]] <- list(name = "random_smooth_convex_many_knots", seed = 17005, note = "70 rows, smooth convex rising, 12 knots",
    x = x, y = y, knots = even(x, 12), direction = "up", curvature = 1, degree = 2)
}
{
  # Noise-free data from a concave piecewise-linear function with breaks at 2 and 5: with knots that
  # include the breaks the fit must return it exactly (the function is feasible and has SSE 0).
  x <- seq(0, 8, by = 0.125)
  y <- pmin(3 * x, x + 4, 0.25 * x + 7.75)
  cases[[length(cases) + 1]] <- list(name = "exact_concave_pl", note = "65 noise-free rows from min(3x, x + 4, x/4 + 7.75); 33 knots include the breaks 2 and 5",
    x = x, y = y, knots = seq(0, 8, by = 0.25), direction = "up", curvature = -1, degree = 1)
}

results <- lapply(cases, solve_case)

# ---------------------------------------------------------------- the quadratic basis
basis_knots <- c(0, 0.5, 2, 3.5, 4, 7)
basis_x <- c(0, 0.1, 0.25, 0.5, 1, 1.7, 2, 2.9, 3.5, 3.75, 4, 5.5, 6.99, 7)
basis_B <- design(basis_x, basis_knots, 2)

write_json(list(
  description = paste(
    "Shaped knot fits solved by quadprog::solve.QP on the design of splines::splineDesign (hat",
    "functions for degree 1, clamped quadratic B-splines for degree 2) with the shape constraints;",
    "and quadratic B-spline basis values. Read by gen_shapes.py, which solves the same problems with cvxopt."
  ),
  command = command, versions = versions,
  cases = results,
  basis = list(knots = jarr(basis_knots), x = jarr(basis_x), rows = lapply(seq_len(nrow(basis_B)), function(i) jarr(basis_B[i, ])))
), "shapes_r.json")
