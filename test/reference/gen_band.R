# Reference fixtures for the knot model's bands and read-back intervals, computed with R.
#
# Writes fixtures/band_r.json:
#   pt           stats::pt (both tails) on a grid of t and degrees of freedom
#   qt           stats::qt on a table of degrees of freedom (1 ... 1000 and some non-integer) and
#                probabilities (one-sided 0.55 ... 0.999 and (1 + level)/2 for levels 0.5 ... 0.999)
#   line         knots = 2 on open datasets whose least-squares line rises: stats::lm and
#                stats::predict.lm(..., interval = "confidence" | "prediction", level = ...),
#                with and without weights (prediction for a new observation of weight 1)
#   hat          even or explicit knots where no constraint is active: lm on the degree-1 B-spline
#                basis splines::bs(x, degree = 1, knots = interior, Boundary.knots = end knots),
#                which spans the hat functions, and predict.lm on it
#   active       cases with an active monotonicity constraint: the constrained knot values from
#                quadprog::solve.QP, its groups of equal values, and predict.lm on the reduced design
#                (one column per group: the sum of its knots' hat functions) built here
#   calibration  knots = 2: the classical straight-line calibration (inverse-regression) interval of
#                Eisenhart (1939; Draper & Smith, Applied Regression Analysis, 3rd ed., sec. 3.2):
#                the x where (y0 - a - b x)^2 = t^2 s^2 (1/m + 1/sum(w) + (x - xbar)^2 / Sxx)
#   spearman     stats::cor(x, y, method = "spearman") on the datasets (average ranks for ties)
# Command: Rscript test/reference/gen_band.R   (working directory: the repository root; run by
# test/reference/generate.sh, i.e. npm run refs). Deterministic: fixed seeds, shortest round-trip
# number formatting, no time stamps.

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
command <- "Rscript test/reference/gen_band.R"

# ---------------------------------------------------------------- qt table
dfs <- c(1:100, seq(110, 1000, 10), 1.5, 2.5, 7.3, 150.75)
levels <- c(0.5, 0.8, 0.9, 0.95, 0.98, 0.99, 0.995, 0.998, 0.999)
ps <- sort(unique(c(0.55, 0.6, 0.75, 0.9, 0.95, 0.99, 0.999, (1 + levels) / 2)))
qt_rows <- lapply(dfs, function(df) list(df = df, q = jarr(qt(ps, df))))
# stats::pt, both tails, on a grid of t values (lower.tail = FALSE for the upper tail)
pt_t <- c(-40, -6, -2.5, -1, -0.1, 0, 0.01, 0.5, 1, 1.7, 3, 8, 50, 400)
pt_rows <- lapply(c(1, 2, 3, 4.5, 10, 29, 100, 1000), function(df) list(df = df, lower = jarr(pt(pt_t, df)), upper = jarr(pt(pt_t, df, lower.tail = FALSE))))

# ---------------------------------------------------------------- helpers
hat_matrix <- function(x, t) {
  # Hat functions on knots t at x (x clamped to [t1, tK]): row i holds h_1(x_i) ... h_K(x_i).
  K <- length(t)
  xc <- pmin(pmax(x, t[1]), t[K])
  sapply(seq_len(K), function(j) approx(t, as.numeric(seq_len(K) == j), xout = xc)$y)
}
dataset <- function(frame, xcol, ycol) {
  d <- get(frame)
  list(x = d[[xcol]], y = d[[ycol]], source = paste0("R datasets::", frame, " (", ycol, " ~ ", xcol, ")"))
}

# ---------------------------------------------------------------- knots = 2: straight line
line_cases <- list()
for (spec in list(
  list("women", "height", "weight", FALSE),
  list("cars", "speed", "dist", FALSE),
  list("trees", "Girth", "Volume", FALSE),
  list("faithful", "waiting", "eruptions", FALSE),
  list("women", "height", "weight", TRUE),
  list("cars", "speed", "dist", TRUE),
  list("trees", "Girth", "Volume", TRUE)
)) {
  d <- dataset(spec[[1]], spec[[2]], spec[[3]])
  x <- d$x
  y <- d$y
  w <- if (spec[[4]]) seeded_weights(length(x), 14) else NULL
  fit <- if (is.null(w)) lm(y ~ x) else lm(y ~ x, weights = w)
  stopifnot(coef(fit)[2] > 0) # the least-squares line rises: no constraint is active
  new_x <- sort(unique(c(range(x), quantile(x, c(0.1, 0.37, 0.5, 0.81), names = FALSE), mean(range(x)))))
  line_cases[[length(line_cases) + 1]] <- list(
    name = paste0(spec[[1]], if (spec[[4]]) "_weighted" else ""),
    source = d$source, x = jarr(x), y = jarr(y), w = if (is.null(w)) NULL else jarr(w),
    sigma = summary(fit)$sigma, df_resid = fit$df.residual,
    new_x = jarr(new_x),
    bands = band_rows(fit, data.frame(x = new_x), c(0.5, 0.9, 0.95, 0.99))
  )
}

# ---------------------------------------------------------------- hat-function design, nothing active
hat_cases <- list()
for (spec in list(
  list("women", "height", "weight", 5, FALSE),
  list("trees", "Girth", "Volume", c(8.3, 11, 14, 20.6), FALSE),
  list("cars", "speed", "dist", 6, TRUE),
  list("women", "height", "weight", 7, TRUE)
)) {
  d <- dataset(spec[[1]], spec[[2]], spec[[3]])
  x <- d$x
  y <- d$y
  w <- if (spec[[5]]) seeded_weights(length(x), 15) else rep(1, length(x))
  t <- if (length(spec[[4]]) == 1) seq(min(x), max(x), length.out = spec[[4]]) else spec[[4]]
  K <- length(t)
  B <- bs(x, degree = 1, knots = t[-c(1, K)], Boundary.knots = c(t[1], t[K]))
  fit <- lm(y ~ B, weights = w)
  theta <- c(coef(fit)[1], coef(fit)[1] + coef(fit)[-1])
  stopifnot(all(diff(theta) > 0)) # unconstrained fit already monotone: no active constraint
  new_x <- sort(unique(c(t, (t[-1] + t[-K]) / 2, t[1] + 0.3 * (t[2] - t[1]))))
  nd <- data.frame(B = I(predict(B, new_x)))
  hat_cases[[length(hat_cases) + 1]] <- list(
    name = paste0(spec[[1]], "_", K, "knots", if (spec[[5]]) "_weighted" else ""),
    source = d$source, knots = if (length(spec[[4]]) == 1) spec[[4]] else jarr(spec[[4]]),
    knot_x = jarr(t), theta = jarr(unname(theta)),
    x = jarr(x), y = jarr(y), w = if (spec[[5]]) jarr(w) else NULL,
    sigma = summary(fit)$sigma, df_resid = fit$df.residual, new_x = jarr(new_x),
    bands = band_rows(fit, nd, c(0.9, 0.95))
  )
}

# ---------------------------------------------------------------- active constraints: reduced design
monotone_qp <- function(H, x, y, w, t) {
  K <- length(t)
  D <- crossprod(H * sqrt(w))
  d <- crossprod(H, w * y)
  A <- matrix(0, K, K - 1)
  for (j in 1:(K - 1)) { A[j, j] <- -1; A[j + 1, j] <- 1 }
  solve.QP(D, d, A, rep(0, K - 1))$solution
}
active_cases <- list()
set.seed(1914)
rx <- sort(round(runif(40, 0, 10), 2))
ry <- round(ifelse(rx < 4, rx, ifelse(rx < 7, 4 - 0.3 * (rx - 4), 3.1 + 1.5 * (rx - 7))) + rnorm(40, 0, 0.6), 3)
for (spec in list(
  list("BOD", "R datasets::BOD (demand ~ Time)", BOD$Time, BOD$demand, c(1, 2, 3, 4, 5, 7), FALSE),
  list("dip_seed1914", "seeded: set.seed(1914); x = sort(round(runif(40, 0, 10), 2)); y = a rise, a dip, a rise + rnorm(40, 0, 0.6), rounded to 3 places",
       rx, ry, seq(min(rx), max(rx), length.out = 9), FALSE),
  list("dip_seed1914_weighted", "as dip_seed1914 with seeded weights", rx, ry, seq(min(rx), max(rx), length.out = 9), TRUE)
)) {
  x <- spec[[3]]
  y <- spec[[4]]
  t <- spec[[5]]
  K <- length(t)
  w <- if (spec[[6]]) seeded_weights(length(x), 16) else rep(1, length(x))
  H <- hat_matrix(x, t)
  theta <- monotone_qp(H, x, y, w, t)
  gap <- diff(theta)
  tol <- 1e-8 * max(abs(theta))
  group <- cumsum(c(1, gap > tol))
  p <- max(group)
  stopifnot(p < K) # some constraint is active
  Z <- sapply(seq_len(p), function(g) as.numeric(group == g))
  BZ <- H %*% Z
  fit <- lm(y ~ 0 + BZ, weights = w)
  stopifnot(max(abs(fitted(fit) - H %*% theta)) < 1e-6 * max(abs(y)))
  new_x <- sort(unique(c(t, (t[-1] + t[-K]) / 2)))
  nd <- data.frame(BZ = I(hat_matrix(new_x, t) %*% Z))
  active_cases[[length(active_cases) + 1]] <- list(
    name = spec[[1]], source = spec[[2]], knot_x = jarr(t), x = jarr(x), y = jarr(y),
    w = if (spec[[6]]) jarr(w) else NULL,
    theta_quadprog = jarr(theta), groups = jarr(group), parameters = p,
    sigma = summary(fit)$sigma, df_resid = fit$df.residual, new_x = jarr(new_x),
    bands = band_rows(fit, nd, c(0.9, 0.95))
  )
}

# ---------------------------------------------------------------- calibration intervals, knots = 2
calibration <- function(x, y, w, targets, level, m) {
  sw <- sum(w)
  xbar <- sum(w * x) / sw
  ybar <- sum(w * y) / sw
  sxx <- sum(w * (x - xbar)^2)
  b <- sum(w * (x - xbar) * (y - ybar)) / sxx
  a <- ybar - b * xbar
  s2 <- sum(w * (y - a - b * x)^2) / (length(x) - 2)
  tq <- qt((1 + level) / 2, length(x) - 2)
  rows <- lapply(targets, function(y0) {
    # (b^2 - t^2 s^2/Sxx) d^2 - 2 b (y0 - ybar) d + (y0 - ybar)^2 - t^2 s^2 (1/m + 1/sw) = 0, d = x - xbar
    A <- b^2 - tq^2 * s2 / sxx
    B <- -2 * b * (y0 - ybar)
    C <- (y0 - ybar)^2 - tq^2 * s2 * (1 / m + 1 / sw)
    stopifnot(A > 0, B^2 - 4 * A * C > 0)
    r <- sort((-B + c(-1, 1) * sqrt(B^2 - 4 * A * C)) / (2 * A)) + xbar
    list(target = y0, lower = r[1], x = (y0 - a) / b, upper = r[2])
  })
  list(level = level, replicates = m, intervals = rows)
}
cal_cases <- list()
for (spec in list(
  list("women", "height", "weight", c(120, 136.7, 150, 155), FALSE),
  list("cars", "speed", "dist", c(33, 39, 45), FALSE),
  list("trees", "Girth", "Volume", c(20, 30, 50), TRUE)
)) {
  d <- dataset(spec[[1]], spec[[2]], spec[[3]])
  w <- if (spec[[5]]) seeded_weights(length(d$x), 17) else rep(1, length(d$x))
  sets <- list(calibration(d$x, d$y, w, spec[[4]], 0.95, 1), calibration(d$x, d$y, w, spec[[4]], 0.9, 3))
  for (s in sets) for (r in s$intervals) if (!(r$lower > min(d$x) && r$upper < max(d$x))) stop(spec[[1]], " ", r$target, " ", r$lower, " ", r$upper)
  cal_cases[[length(cal_cases) + 1]] <- list(
    name = paste0(spec[[1]], if (spec[[5]]) "_weighted" else ""), source = d$source,
    x = jarr(d$x), y = jarr(d$y), w = if (spec[[5]]) jarr(w) else NULL, sets = sets
  )
}

# ---------------------------------------------------------------- Spearman's rank correlation
spearman_cases <- lapply(list(
  list("cars", "speed", "dist"), list("mtcars", "wt", "mpg"), list("women", "height", "weight"),
  list("Puromycin", "conc", "rate"), list("faithful", "waiting", "eruptions")
), function(spec) {
  d <- dataset(spec[[1]], spec[[2]], spec[[3]])
  list(name = spec[[1]], source = d$source, x = jarr(d$x), y = jarr(d$y), spearman = cor(d$x, d$y, method = "spearman"))
})

write_json(list(
  command = command, versions = versions,
  qt = list(p = jarr(ps), rows = qt_rows),
  pt = list(t = jarr(pt_t), rows = pt_rows),
  line = line_cases, hat = hat_cases, active = active_cases, calibration = cal_cases,
  spearman = spearman_cases
), "band_r.json")
