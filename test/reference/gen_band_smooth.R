# Reference fixtures for the bands and read-back intervals of the smooth fit (degree 2: quadratic
# B-splines on the knots with monotone coefficients), computed with R.
#
# Writes fixtures/band_smooth_r.json:
#   free         knot positions where the unconstrained weighted least-squares fit on the quadratic
#                B-spline design already has rising coefficients (no constraint active):
#                lm(y ~ splineDesign(knots_ext, x, ord = 3) - 1, weights = w) and
#                predict.lm(..., interval = "confidence" | "prediction"), knots_ext the end knots
#                repeated three times; new x beyond the end knots clamped (the band of the end value)
#   active       cases with active monotonicity constraints: the coefficients from quadprog::solve.QP,
#                its groups of equal adjacent coefficients, and predict.lm on the reduced design
#                (one column per group: the sum of its B-splines) built here
#   invert       for the cases above and a few targets: the read-back x (uniroot of f - y0) and the
#                ends of the stretch around it where |f(x) - y0| <= t * se_pred(x), with
#                se_pred(x)^2 = se.fit(x)^2 + sigma^2 / m: scanned outwards on a grid of 4000 steps
#                over the data's x range, each crossing refined by uniroot (tol 1e-14); null when the
#                stretch reaches the end of the data's x range
# Command: Rscript test/reference/gen_band_smooth.R   (working directory: the repository root; run
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
command <- "Rscript test/reference/gen_band_smooth.R"

design <- function(x, t) {
  # The K + 1 quadratic B-splines on the clamped knot sequence, x clamped to [t1, tK].
  K <- length(t)
  ext <- c(t[1], t[1], t[1], t[-c(1, K)], t[K], t[K], t[K])
  splineDesign(ext, pmin(pmax(x, t[1]), t[K]), ord = 3)
}
invert_rows <- function(fit, Z, t, x, targets, level, m) {
  readback_rows(fit, Z, function(u) design(u, t), c(t[1], t[length(t)]), x, targets, level, m)
}

# ---------------------------------------------------------------- no active constraint
free_cases <- list()
for (spec in list(
  list("women", "height", "weight", c(58, 62, 66, 72), FALSE, c(120, 137, 150, 160)),
  list("trees", "Girth", "Volume", c(8.3, 12, 16, 20.6), TRUE, c(15, 25, 40)),
  list("cars", "speed", "dist", c(4, 14, 25), TRUE, c(20, 40, 60))
)) {
  d <- get(spec[[1]])
  x <- d[[spec[[2]]]]
  y <- d[[spec[[3]]]]
  t <- spec[[4]]
  K <- length(t)
  w <- if (spec[[5]]) seeded_weights(length(x), 21) else rep(1, length(x))
  B <- design(x, t)
  fit <- lm(y ~ B - 1, weights = w)
  stopifnot(all(diff(coef(fit)) > 0)) # rising coefficients: no constraint is active
  Z <- diag(K + 1)
  new_x <- sort(unique(c(t[1] - 1, t, (t[-1] + t[-K]) / 2, t[1] + 0.3 * (t[2] - t[1]), t[K] + 2)))
  nd <- data.frame(B = I(design(new_x, t)))
  free_cases[[length(free_cases) + 1]] <- list(
    name = paste0(spec[[1]], if (spec[[5]]) "_weighted" else ""),
    source = paste0("R datasets::", spec[[1]], " (", spec[[3]], " ~ ", spec[[2]], ")"),
    knot_x = jarr(t), x = jarr(x), y = jarr(y), w = if (spec[[5]]) jarr(w) else NULL,
    coefficients = jarr(unname(coef(fit))), parameters = K + 1,
    sigma = summary(fit)$sigma, df_resid = fit$df.residual, new_x = jarr(new_x),
    bands = band_rows(fit, nd, c(0.9, 0.95)),
    invert = list(
      list(level = 0.95, replicates = 1, intervals = invert_rows(fit, Z, t, x, spec[[6]], 0.95, 1)),
      list(level = 0.9, replicates = 3, intervals = invert_rows(fit, Z, t, x, spec[[6]], 0.9, 3))
    )
  )
}

# ---------------------------------------------------------------- active constraints: reduced design
active_cases <- list()
set.seed(2017)
rx <- sort(round(runif(50, 0, 10), 2))
ry <- round(ifelse(rx < 4, rx, ifelse(rx < 7, 4 - 0.3 * (rx - 4), 3.1 + 1.5 * (rx - 7))) + rnorm(50, 0, 0.5), 3)
for (spec in list(
  list("dip_seed2017", "seeded: set.seed(2017); x = sort(round(runif(50, 0, 10), 2)); y = a rise, a dip, a rise + rnorm(50, 0, 0.5), rounded to 3 places",
       rx, ry, c(0, 2, 4, 5.5, 7, 8.5, 10), FALSE, c(2, 3.5, 6)),
  list("dip_seed2017_weighted", "as dip_seed2017 with seeded weights", rx, ry, c(0, 2, 4, 5.5, 7, 8.5, 10), TRUE, c(2, 3.5, 6))
)) {
  x <- spec[[3]]
  y <- spec[[4]]
  t <- spec[[5]]
  K <- length(t)
  w <- if (spec[[6]]) seeded_weights(length(x), 22) else rep(1, length(x))
  B <- design(x, t)
  D <- crossprod(B * sqrt(w))
  A <- matrix(0, K + 1, K)
  for (j in 1:K) { A[j, j] <- -1; A[j + 1, j] <- 1 }
  theta <- solve.QP(D, crossprod(B, w * y), A, rep(0, K))$solution
  group <- cumsum(c(1, diff(theta) > 1e-8 * max(abs(theta))))
  p <- max(group)
  stopifnot(p < K + 1) # some constraint is active
  Z <- sapply(seq_len(p), function(g) as.numeric(group == g))
  BZ <- B %*% Z
  fit <- lm(y ~ 0 + BZ, weights = w)
  stopifnot(max(abs(fitted(fit) - B %*% theta)) < 1e-6 * max(abs(y)))
  new_x <- sort(unique(c(t, (t[-1] + t[-K]) / 2)))
  nd <- data.frame(BZ = I(design(new_x, t) %*% Z))
  active_cases[[length(active_cases) + 1]] <- list(
    name = spec[[1]], source = spec[[2]], knot_x = jarr(t), x = jarr(x), y = jarr(y),
    w = if (spec[[6]]) jarr(w) else NULL,
    coefficients = jarr(theta), groups = jarr(group), parameters = p,
    sigma = summary(fit)$sigma, df_resid = fit$df.residual, new_x = jarr(new_x),
    bands = band_rows(fit, nd, c(0.9, 0.95)),
    invert = list(
      list(level = 0.95, replicates = 1, intervals = invert_rows(fit, Z, t, x, spec[[7]], 0.95, 1)),
      list(level = 0.8, replicates = 2, intervals = invert_rows(fit, Z, t, x, spec[[7]], 0.8, 2))
    )
  )
}

write_json(list(command = command, versions = versions, free = free_cases, active = active_cases), "band_smooth_r.json")
