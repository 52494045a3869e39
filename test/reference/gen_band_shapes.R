# Reference fixtures for the bands and read-back intervals of CONCAVE and CONVEX knot fits
# (curvature -1 / +1), degree 1 (hat functions) and degree 2 (quadratic B-splines, "smooth"),
# conditional on the active set of the shape-constrained least-squares problem, computed with R.
#
# Writes fixtures/band_shapes_r.json with, per case:
#   inputs       x, y, weights (seeded, or none), knots, direction, curvature, degree; the data come
#                from R's datasets package (cars, mtcars, Orange, pressure, DNase, Puromycin) or are
#                invented here from fixed seeds (marked "invented": true, with the recipe in `source`)
#   fit          the constrained weighted least-squares coefficients from quadprog::solve.QP on the
#                design of splines::splineDesign (hat functions for degree 1, the K + 1 clamped
#                quadratic B-splines for degree 2; x clamped to the end knots), with the constraint
#                rows of docs/shapes.md built here from the knots (the same rows and order as
#                gen_shapes.R: the changes of slope, then the one sign row that makes the curve
#                monotone; no bounds)
#   active       the constraint rows held with equality (0-based indices in that order): relative
#                slack |a.theta| / (|a|.|theta|) <= 1e-9; the script stops unless this set equals
#                quadprog's own active set (iact), every inactive row has relative slack >= 1e-6 and
#                every active row a relative multiplier lambda * max|a| / max|B'Wy| >= 1e-8 (strict
#                complementarity: the active set is unambiguous); the smallest of both is recorded
#   bands        Z = the last m - a columns of Q in the QR decomposition of the transposed active rows
#                (an orthonormal basis of their null space; Z = I with nothing active),
#                lm(y ~ 0 + BZ, weights = w) and predict.lm(..., interval = "confidence" |
#                "prediction", level = 0.9, 0.95) at new x, new observations of weight 1, new x
#                beyond the end knots clamped (the band of the end value); sigma and df.residual
#   invert       for a few targets: the read-back x (uniroot of f - y0) and the ends of the stretch
#                around it where |f(x) - y0| <= t * se_pred(x), se_pred(x)^2 = se.fit(x)^2 +
#                sigma^2 / m (m replicates): scanned outwards on a grid of 4000 steps over the data's
#                x range, each crossing refined by uniroot (tol 1e-14); null when the stretch reaches
#                the end of the data's x range (as in gen_band_smooth.R)
# Command: Rscript test/reference/gen_band_shapes.R   (working directory: the repository root; run
# by test/reference/generate.sh, i.e. npm run refs). Deterministic: fixed seeds, shortest
# round-trip number formatting, no time stamps.

suppressPackageStartupMessages({
  library(quadprog)
  library(splines)
})
source(file.path("test", "reference", "json_writer.R"))
source(file.path("test", "reference", "band_helpers.R"))

versions <- list(
  R = R.version.string,
  stats = as.character(packageVersion("stats")),
  splines = as.character(packageVersion("splines")),
  quadprog = as.character(packageVersion("quadprog")),
  datasets = as.character(packageVersion("datasets"))
)
command <- "Rscript test/reference/gen_band_shapes.R"
active_tol <- 1e-9 # relative slack at or below which a row counts as active
inactive_min <- 1e-6 # relative slack every inactive row must exceed
multiplier_min <- 1e-8 # relative multiplier every active row must exceed

# Hat functions (degree 1) or the K + 1 quadratic B-splines (degree 2) on the clamped knot
# sequence, x clamped to [t1, tK] (beyond the end knots the curve and its band are the end value's).
design <- function(x, t, degree) {
  K <- length(t)
  tau <- c(rep(t[1], degree), t, rep(t[K], degree))
  splineDesign(tau, pmin(pmax(x, t[1]), t[K]), ord = degree + 1)
}
# Spans g_k of the coefficient differences (docs/shapes.md): the knot spacing (degree 1), or half
# the span of the two knots around the derivative's knot (degree 2).
spans <- function(t, degree) {
  K <- length(t)
  if (degree == 1) return(diff(t))
  vapply(seq_len(K), function(k) (t[min(k + 1, K)] - t[max(k - 1, 1)]) / 2, 0)
}
# Rows a with a.theta >= 0 in the rising frame (curv already flipped for a falling fit): the
# changes of slope curv * (s_{k+1} - s_k) >= 0, then the sign row: the first difference >= 0
# (convex) or the last (concave).
shape_rows <- function(m, g, curv) {
  A <- matrix(0, m - 1, m)
  for (k in seq_len(m - 2)) {
    A[k, k] <- curv / g[k]
    A[k, k + 1] <- -curv * (1 / g[k] + 1 / g[k + 1])
    A[k, k + 2] <- curv / g[k + 1]
  }
  s <- if (curv > 0) 1 else m - 1
  A[m - 1, s] <- -1
  A[m - 1, s + 1] <- 1
  A
}
# Orthonormal basis of the null space of the rows of A (a x m, full row rank): the last m - a
# columns of the complete Q of qr(t(A)).
null_space <- function(A, m) {
  if (nrow(A) == 0) return(diag(m))
  q <- qr(t(A))
  stopifnot(q$rank == nrow(A)) # the active rows are independent
  qr.Q(q, complete = TRUE)[, (nrow(A) + 1):m, drop = FALSE]
}
invert_rows <- function(fit, Z, t, degree, x, targets, level, m) {
  readback_rows(fit, Z, function(u) design(u, t, degree), c(t[1], t[length(t)]), x, targets, level, m)
}

solve_case <- function(cs) {
  x <- cs$x
  y <- cs$y
  t <- cs$knots
  degree <- cs$degree
  K <- length(t)
  w <- if (is.null(cs$w)) rep(1, length(x)) else cs$w
  s <- if (cs$direction == "up") 1 else -1
  B <- design(x, t, degree)
  m <- ncol(B)
  D <- crossprod(B, w * B)
  dvec <- as.vector(crossprod(B, w * s * y))
  stopifnot(min(eigen(D, symmetric = TRUE, only.values = TRUE)$values) > 1e-10 * max(diag(D))) # every coefficient determined
  A <- shape_rows(m, spans(t, degree), s * cs$curvature)
  sol <- solve.QP(D, dvec, t(A), rep(0, nrow(A)))
  theta <- sol$solution # rising frame
  slack <- as.vector(A %*% theta) / as.vector(abs(A) %*% abs(theta))
  active <- which(abs(slack) <= active_tol)
  iact <- sort(sol$iact[sol$iact > 0])
  if (!identical(as.integer(active), as.integer(iact))) stop(cs$name, ": slack-based active set differs from quadprog's iact")
  inactive_slack <- if (length(active) < nrow(A)) min(slack[setdiff(seq_len(nrow(A)), active)]) else NA
  rel_mult <- sol$Lagrangian * apply(abs(A), 1, max) / max(abs(dvec))
  active_mult <- if (length(active) > 0) min(rel_mult[active]) else NA
  stopifnot(is.na(inactive_slack) || inactive_slack >= inactive_min, is.na(active_mult) || active_mult >= multiplier_min)
  if (!is.null(cs$expect_active)) stopifnot(identical(as.integer(active - 1), as.integer(cs$expect_active)))
  Z <- null_space(A[active, , drop = FALSE], m)
  p <- ncol(Z)
  stopifnot(max(abs(theta - Z %*% crossprod(Z, theta))) < 1e-9 * max(abs(theta))) # theta in span(Z)
  BZ <- B %*% Z
  fit <- lm(y ~ 0 + BZ, weights = w)
  stopifnot(max(abs(fitted(fit) - s * B %*% theta)) < 1e-6 * max(abs(y))) # the QP optimum is the LS fit on BZ
  new_x <- sort(unique(c(t[1] - 1, t, (t[-1] + t[-K]) / 2, t[1] + 0.3 * (t[2] - t[1]), t[K] + 2)))
  nd <- data.frame(BZ = I(design(new_x, t, degree) %*% Z))
  list(
    name = cs$name, source = cs$source, invented = cs$invented, note = cs$note,
    direction = cs$direction, curvature = cs$curvature, degree = degree,
    knot_x = jarr(t), x = jarr(x), y = jarr(y), w = if (is.null(cs$w)) NULL else jarr(cs$w),
    coefficients = jarr(s * theta), constraint_rows = nrow(A), active = jarr(active - 1),
    active_shape = sum(active < nrow(A)), active_sign = (nrow(A) %in% active),
    min_inactive_slack = if (is.na(inactive_slack)) NULL else inactive_slack,
    min_active_multiplier = if (is.na(active_mult)) NULL else active_mult,
    parameters = p, sigma = summary(fit)$sigma, df_resid = fit$df.residual, new_x = jarr(new_x),
    bands = band_rows(fit, nd, c(0.9, 0.95)),
    invert = list(
      list(level = 0.95, replicates = 1, intervals = invert_rows(fit, Z, t, degree, x, cs$targets, 0.95, 1)),
      list(level = 0.9, replicates = 3, intervals = invert_rows(fit, Z, t, degree, x, cs$targets, 0.9, 3))
    )
  )
}

# ---------------------------------------------------------------- cases
dcase <- function(name, frame, xcol, ycol, knots, direction, curvature, degree, note, targets, expect_active, weight_seed = NULL) {
  d <- get(frame)
  x <- d[[xcol]]
  list(name = name, source = paste0("R datasets::", frame, " (", ycol, " ~ ", xcol, ")", if (is.null(weight_seed)) "" else paste0(", weights: set.seed(", weight_seed, "); round(runif(n, 0.5, 3), 3)")),
       invented = FALSE, note = note, x = x, y = d[[ycol]], w = if (is.null(weight_seed)) NULL else seeded_weights(length(x), weight_seed),
       knots = knots, direction = direction, curvature = curvature, degree = degree, targets = targets, expect_active = expect_active)
}
cases <- list(
  # degree 1 (hat functions)
  dcase("cars_convex", "cars", "speed", "dist", c(4, 10, 15, 20, 25), "up", 1, 1,
        "convex rising, ties in x; one change of slope active", c(20, 40, 60), 1),
  dcase("cars_convex_weighted", "cars", "speed", "dist", c(4, 10, 15, 20, 25), "up", 1, 1,
        "as cars_convex with seeded weights", c(20, 40, 60), 1, weight_seed = 41),
  dcase("mtcars_convex_down", "mtcars", "wt", "mpg", c(1.513, 2.5, 3.2, 3.8, 4.5, 5.424), "down", 1, 1,
        "convex falling; two changes of slope active", c(28, 20, 15), c(1, 3)),
  dcase("Orange_concave", "Orange", "age", "circumference", c(118, 484, 664, 1004, 1231, 1372, 1582), "up", -1, 1,
        "concave rising, knots at the seven ages; three changes of slope active", c(60, 110, 160), c(0, 1, 3)),
  dcase("pressure_convex", "pressure", "temperature", "pressure", seq(0, 360, 60), "up", 1, 1,
        "convex rising; the sign row (first slope >= 0) active: a flat first stretch", c(50, 200, 500), 5),
  dcase("DNase_concave_inactive", "DNase", "conc", "density", c(0.04882812, 0.390625, 1.5625, 3.125, 6.25, 12.5), "up", -1, 1,
        "concave rising with no constraint active (Z = I): the unconstrained hat-function fit", c(0.5, 1, 1.5), integer(0)),
  # degree 2 (quadratic B-splines)
  dcase("pressure_smooth_convex", "pressure", "temperature", "pressure", seq(0, 360, 90), "up", 1, 2,
        "smooth convex rising; a change of slope and the sign row (first derivative >= 0) active", c(50, 200, 500), c(0, 4)),
  dcase("cars_smooth_convex_weighted", "cars", "speed", "dist", c(4, 10, 15, 20, 25), "up", 1, 2,
        "smooth convex rising with seeded weights; two changes of slope active", c(20, 40, 60), c(1, 2), weight_seed = 42),
  dcase("mtcars_smooth_convex_down", "mtcars", "wt", "mpg", c(1.513, 2.5, 3.5, 4.5, 5.424), "down", 1, 2,
        "smooth convex falling; two changes of slope active", c(28, 20, 15), c(0, 3)),
  dcase("Orange_smooth_concave", "Orange", "age", "circumference", c(118, 484, 1004, 1372, 1582), "up", -1, 2,
        "smooth concave rising; two changes of slope and the sign row (last derivative >= 0) active", c(60, 110, 160), c(0, 1, 4)),
  dcase("Puromycin_smooth_concave", "Puromycin", "conc", "rate", c(0.02, 0.22, 0.56, 1.1), "up", -1, 2,
        "smooth concave rising, ties in x; the sign row active only (flat at the end)", c(80, 120, 160), 3)
)
# Invented: remaining capacity that holds (with a slight rise in the data) and then falls ever
# faster, with Gaussian noise: a concave falling fit whose first stretch is flat (the sign row).
set.seed(31001)
cx <- sort(round(runif(40, 0, 10), 2))
cy <- round(ifelse(cx < 2.5, 100 + 0.8 * cx, 102 - 0.5 * (cx - 2.5)^2) + rnorm(40, 0, 1), 2)
cw <- seeded_weights(40, 43)
capacity_source <- paste(
  "invented: set.seed(31001); x = sort(round(runif(40, 0, 10), 2)); y = 100 + 0.8 x below 2.5,",
  "102 - 0.5 (x - 2.5)^2 above, + rnorm(40, 0, 1), rounded to 2 places; weights: set.seed(43); round(runif(40, 0.5, 3), 3)"
)
cases[[length(cases) + 1]] <- list(
  name = "capacity_concave_down_weighted", source = capacity_source, invented = TRUE,
  note = "concave falling with seeded weights; a change of slope and the sign row (first slope <= 0) active",
  x = cx, y = cy, w = cw, knots = c(0, 1.5, 3, 5, 7.5, 10), direction = "down", curvature = -1, degree = 1,
  targets = c(98, 90, 80), expect_active = c(0, 4)
)
cases[[length(cases) + 1]] <- list(
  name = "capacity_smooth_concave_down_weighted", source = capacity_source, invented = TRUE,
  note = "smooth concave falling with seeded weights; a change of slope and the sign row active",
  x = cx, y = cy, w = cw, knots = c(0, 2.5, 5, 7.5, 10), direction = "down", curvature = -1, degree = 2,
  targets = c(98, 90, 80), expect_active = c(0, 4)
)

results <- lapply(cases, solve_case)
for (r in results) {
  cat(sprintf("%-40s degree %d, %d of %d rows active (%s), p = %d, min inactive slack %s, min active multiplier %s\n",
              r$name, r$degree, length(r$active$v), r$constraint_rows, paste(r$active$v, collapse = ","), r$parameters,
              format(if (is.null(r$min_inactive_slack)) NA else r$min_inactive_slack, digits = 3),
              format(if (is.null(r$min_active_multiplier)) NA else r$min_active_multiplier, digits = 3)))
}

write_json(list(
  description = paste(
    "Bands of concave and convex knot fits (degree 1 and 2) conditional on the active set: quadprog::solve.QP",
    "on the splineDesign basis with the shape rows of docs/shapes.md, the active rows by relative slack,",
    "Z from qr of their transpose, predict.lm on lm(y ~ 0 + BZ, weights = w); read-back intervals by a",
    "uniroot scan of |f - y0| <= t * se_pred."
  ),
  command = command, versions = versions,
  tolerances = list(active_slack = active_tol, inactive_slack_min = inactive_min, active_multiplier_min = multiplier_min),
  cases = results
), "band_shapes_r.json")
