# Reference fixtures for the Ratchet core, computed with R.
#
# Run by test/reference/generate.sh (npm run refs) BEFORE the Python generators, because it writes
# the shared inputs that gen_core.py reads:
#   fixtures/core_inputs.json  open datasets from R's datasets package and seeded random cases
#   fixtures/core_r.json       stats::isoreg, Iso::pava and quadprog::solve.QP results on them,
#                              plus the example of R's ?isoreg help page
# Command: Rscript test/reference/gen_core.R   (working directory: the repository root)
# Output is deterministic: fixed seeds, numbers written with the shortest of %.15g / %.17g that
# reads back to the same double, no time stamps.

suppressPackageStartupMessages({
  library(Iso)
  library(quadprog)
})

source(file.path("test", "reference", "json_writer.R")) # out_dir, jarr(), write_json()

versions <- list(
  R = R.version.string,
  Iso = as.character(packageVersion("Iso")),
  quadprog = as.character(packageVersion("quadprog")),
  stats = as.character(packageVersion("stats")),
  datasets = as.character(packageVersion("datasets"))
)
command <- "Rscript test/reference/gen_core.R"

# ---------------------------------------------------------------- inputs: open datasets
ds <- function(name, frame, xcol, ycol, note) {
  list(
    name = name, source = paste0("R datasets::", frame), x_column = xcol, y_column = ycol,
    note = note, x = jarr(get(frame)[[xcol]]), y = jarr(get(frame)[[ycol]])
  )
}
datasets <- list(
  ds("cars", "cars", "speed", "dist", "stopping distance by speed, 50 rows, many tied speeds"),
  ds("pressure", "pressure", "temperature", "pressure", "vapour pressure of mercury, 19 rows, rising"),
  ds("BOD", "BOD", "Time", "demand", "biochemical oxygen demand, 6 rows, one dip"),
  ds("women", "women", "height", "weight", "average weight by height, 15 rows, already monotone"),
  ds("Puromycin", "Puromycin", "conc", "rate", "reaction rate by substrate concentration, 23 rows, both states, ties, gaps in x"),
  ds("mtcars", "mtcars", "wt", "mpg", "fuel economy by weight, 32 rows, falling, ties")
)

# ---------------------------------------------------------------- inputs: seeded random cases
rnd <- function(v) round(v, 3) # short decimals keep the fixture readable; still exact doubles
random <- list()
set.seed(20240601)
{
  x <- sample(1:15, 40, replace = TRUE)
  y <- rnd(sqrt(x) + rnorm(40, sd = 0.6))
  random[[length(random) + 1]] <- list(name = "ties_unit_weights", seed = 20240601,
    note = "40 rows on 15 integer x values (ties), unit weights", x = jarr(x), y = jarr(y))
}
set.seed(20240602)
{
  x <- rnd(runif(30, 0, 10))
  x[c(4, 9, 17)] <- x[c(3, 8, 16)] # a few ties
  y <- rnd(2 * log1p(x) + rnorm(30, sd = 0.8))
  w <- rnd(runif(30, 0.2, 3))
  w[c(2, 11, 25)] <- 0 # zero weights: fitted but no influence
  random[[length(random) + 1]] <- list(name = "weights_with_zeros", seed = 20240602,
    note = "30 rows, random weights with three zeros, three tied x", x = jarr(x), y = jarr(y), w = jarr(w))
}
set.seed(20240603)
{
  x <- rnd(c(runif(12, 0, 2), runif(10, 6, 7), runif(8, 9.5, 10)))
  y <- rnd(x^1.5 / 4 + rnorm(30, sd = 0.7))
  random[[length(random) + 1]] <- list(name = "clustered_gaps", seed = 20240603,
    note = "30 rows in three clusters on [0, 10]: many knots have no data nearby", x = jarr(x), y = jarr(y))
}
set.seed(20240604)
{
  x <- rnd(runif(60, -5, 5))
  y <- rnd(-x + 0.3 * x^2 * (x > 0) + rnorm(60, sd = 1.2))
  w <- rnd(rexp(60))
  random[[length(random) + 1]] <- list(name = "falling_weighted", seed = 20240604,
    note = "60 rows, falling trend, exponential weights", x = jarr(x), y = jarr(y), w = jarr(w))
}
set.seed(20240605)
{
  x <- rnd(rnorm(200))
  y <- rnd(tanh(2 * x) + rnorm(200, sd = 0.5))
  random[[length(random) + 1]] <- list(name = "noisy_200", seed = 20240605,
    note = "200 rows, heavy noise around a sigmoid", x = jarr(x), y = jarr(y))
}

inputs <- list(
  description = paste(
    "Shared inputs of the core reference fixtures: open datasets from R's datasets package",
    "(x and y columns named) and seeded random cases (R's default Mersenne-Twister generator).",
    "Read by gen_core.py so Python and R see the same numbers."
  ),
  command = command, versions = versions, datasets = datasets, random = random
)
write_json(inputs, "core_inputs.json")

cases <- c(datasets, random)
case_by_name <- function(nm) {
  for (cs in cases) if (cs$name == nm) return(cs)
  stop("no case ", nm)
}
case_w <- function(cs) if (is.null(cs$w)) rep(1, length(cs$x$v)) else cs$w$v

# ---------------------------------------------------------------- classic fits: isoreg and Iso::pava
classic <- list()
for (cs in cases) {
  x <- cs$x$v
  y <- cs$y$v
  w <- case_w(cs)
  entry <- list(case = cs$name)
  if (is.null(cs$w)) {
    # stats::isoreg: unweighted, increasing; it orders rows by (x, -y), which pools ties.
    ir <- isoreg(x, y)
    fit <- numeric(length(x))
    if (ir$isOrd) fit <- ir$yf else fit[ir$ord] <- ir$yf
    entry$isoreg_up_fitted <- jarr(fit)
  }
  # Iso::pava on the tie-pooled points with positive weight (pooled mean, summed weight).
  keep <- w > 0
  ux <- sort(unique(x[keep]))
  g <- match(x[keep], ux)
  sw <- as.vector(tapply(w[keep], g, sum))
  sy <- as.vector(tapply(w[keep] * y[keep], g, sum)) / sw
  entry$pooled_x <- jarr(ux)
  entry$pava_up <- jarr(pava(sy, sw, decreasing = FALSE))
  entry$pava_down <- jarr(pava(sy, sw, decreasing = TRUE))
  classic[[length(classic) + 1]] <- entry
}

# ---------------------------------------------------------------- knot model: quadprog::solve.QP
# The design matrix of hat functions, built here independently of the TypeScript code: row i has
# 1 − u at knot j and u at knot j + 1 where t_j ≤ x_i ≤ t_{j+1}, u = (x_i − t_j)/(t_{j+1} − t_j),
# and x clamped to [t_1, t_K] (flat ends).
hat_matrix <- function(x, t) {
  K <- length(t)
  B <- matrix(0, length(x), K)
  for (i in seq_along(x)) {
    xi <- min(max(x[i], t[1]), t[K])
    j <- max(which(t <= xi))
    if (j == K) j <- K - 1
    u <- (xi - t[j]) / (t[j + 1] - t[j])
    B[i, j] <- 1 - u
    B[i, j + 1] <- u
  }
  B
}
even_knots <- function(x, w, K) {
  lo <- min(x[w > 0])
  hi <- max(x[w > 0])
  t <- lo + (0:(K - 1)) * (hi - lo) / (K - 1)
  t[K] <- hi
  t
}
knot_cases <- list(
  list(id = "cars_K4", case = "cars", K = 4, direction = "up"),
  list(id = "cars_K6", case = "cars", K = 6, direction = "up"),
  list(id = "pressure_K5", case = "pressure", K = 5, direction = "up"),
  list(id = "pressure_K5_upper300", case = "pressure", K = 5, direction = "up", upper = 300),
  list(id = "BOD_K3", case = "BOD", K = 3, direction = "up"),
  list(id = "BOD_K6", case = "BOD", K = 6, direction = "up"),
  list(id = "women_K5", case = "women", K = 5, direction = "up"),
  list(id = "Puromycin_K4", case = "Puromycin", K = 4, direction = "up"),
  list(id = "Puromycin_K8_empty", case = "Puromycin", K = 8, direction = "up"),
  list(id = "mtcars_K5_down", case = "mtcars", K = 5, direction = "down"),
  list(id = "mtcars_K5_down_lower14", case = "mtcars", K = 5, direction = "down", lower = 14),
  list(id = "ties_K6", case = "ties_unit_weights", K = 6, direction = "up"),
  list(id = "ties_K6_bounds", case = "ties_unit_weights", K = 6, direction = "up", lower = 1.6, upper = 3.4),
  list(id = "weights_K5", case = "weights_with_zeros", K = 5, direction = "up"),
  list(id = "weights_K5_lower", case = "weights_with_zeros", K = 5, direction = "up", lower = 1.5),
  list(id = "clustered_K11_empty", case = "clustered_gaps", K = 11, direction = "up"),
  list(id = "clustered_explicit", case = "clustered_gaps", knots = c(-1, 1, 2, 4, 6.5, 8, 9.8, 12), direction = "up"),
  list(id = "falling_K7_down", case = "falling_weighted", K = 7, direction = "down"),
  list(id = "falling_K7_down_bounds", case = "falling_weighted", K = 7, direction = "down", lower = -3, upper = 2.5),
  list(id = "noisy_K10", case = "noisy_200", K = 10, direction = "up"),
  list(id = "noisy_K2", case = "noisy_200", K = 2, direction = "up")
)
knots_out <- list()
for (kc in knot_cases) {
  cs <- case_by_name(kc$case)
  x <- cs$x$v
  y <- cs$y$v
  w <- case_w(cs)
  t <- if (!is.null(kc$knots)) kc$knots else even_knots(x, w, kc$K)
  K <- length(t)
  B <- hat_matrix(x, t)
  lower <- if (is.null(kc$lower)) -Inf else kc$lower
  upper <- if (is.null(kc$upper)) Inf else kc$upper
  s <- if (kc$direction == "up") 1 else -1
  # Knots whose hat function meets no row with positive weight do not enter the objective; the
  # chain constraints through them reduce to constraints between their identified neighbours.
  colw <- colSums(B * w)
  id <- which(colw > 0)
  Br <- B[, id, drop = FALSE]
  H <- crossprod(Br * sqrt(w))
  cvec <- as.vector(crossprod(Br, w * y))
  m <- length(id)
  entry <- list(id = kc$id, case = kc$case, direction = kc$direction, knot_x = jarr(t))
  if (!is.null(kc$lower)) entry$lower <- kc$lower
  if (!is.null(kc$upper)) entry$upper <- kc$upper
  pd <- min(eigen(H, symmetric = TRUE, only.values = TRUE)$values) > 1e-10 * max(diag(H))
  if (!pd) {
    entry$quadprog <- "not run: the reduced normal matrix is singular (knot values jointly unidentified)"
  } else {
    # Constraints A^T theta >= b: s (theta_{a+1} - theta_a) >= 0, then the bounds.
    A <- NULL
    b <- NULL
    if (m > 1) for (a in 1:(m - 1)) {
      col <- numeric(m); col[a] <- -s; col[a + 1] <- s
      A <- cbind(A, col); b <- c(b, 0)
    }
    if (is.finite(lower)) for (a in 1:m) { col <- numeric(m); col[a] <- 1; A <- cbind(A, col); b <- c(b, lower) }
    if (is.finite(upper)) for (a in 1:m) { col <- numeric(m); col[a] <- -1; A <- cbind(A, col); b <- c(b, -upper) }
    sol <- solve.QP(Dmat = H, dvec = cvec, Amat = A, bvec = b)
    theta <- sol$solution
    fit <- as.vector(Br %*% theta)
    entry$identified <- jarr(as.numeric(colw > 0))
    entry$quadprog_theta_identified <- jarr(theta)
    entry$quadprog_fitted <- jarr(fit)
    entry$quadprog_sse <- sum(w * (y - fit)^2)
  }
  knots_out[[length(knots_out) + 1]] <- entry
}

# The worked knot example of docs/methods.md (computed with quadprog, not published).
{
  x <- c(0, .5, 1, 1.5, 2, 2.5, 3)
  y <- c(0, 2, 1, 1.5, 1, 3, 2.8)
  t <- c(0, 1, 2, 3)
  B <- hat_matrix(x, t)
  A <- matrix(0, 4, 3)
  for (a in 1:3) { A[a, a] <- -1; A[a + 1, a] <- 1 }
  sol <- solve.QP(crossprod(B), as.vector(crossprod(B, y)), A, rep(0, 3))
  methods_example <- list(
    x = jarr(x), y = jarr(y), knot_x = jarr(t), theta = jarr(sol$solution),
    sse = sum((y - B %*% sol$solution)^2),
    command = "quadprog::solve.QP(crossprod(B), crossprod(B, y), A, 0) with B the hat matrix and A the chain constraints"
  )
}

# ---------------------------------------------------------------- the example of R's ?isoreg page
help_example <- list()
for (yy in list(c(1, 0, 4, 3, 3, 5, 4, 2, 0), c(1, 0, 4, 3, 3, 5, 4, 2, 3))) {
  ir <- isoreg(yy)
  help_example[[length(help_example) + 1]] <- list(
    command = paste0("isoreg(c(", paste(yy, collapse = ","), "))"),
    y = jarr(yy), yf = jarr(ir$yf), iKnots = jarr(ir$iKnots)
  )
}
{
  y4 <- c(5, 9, 1:2, 5:8, 3, 8)
  ir4 <- isoreg(1:10, y4)
  help_example[[length(help_example) + 1]] <- list(
    command = "isoreg(1:10, y4 <- c(5, 9, 1:2, 5:8, 3, 8)); R^2 = 1 - sum(residuals(ir4)^2) / ((10-1)*var(y4))",
    x = jarr(1:10), y = jarr(y4), yf = jarr(ir4$yf), iKnots = jarr(ir4$iKnots),
    r_squared = 1 - sum(residuals(ir4)^2) / ((10 - 1) * var(y4))
  )
}

write_json(list(
  description = paste(
    "R reference results for the Ratchet core on core_inputs.json: stats::isoreg (unweighted cases),",
    "Iso::pava on tie-pooled points (weighted mean, summed weight, zero-weight points dropped), and",
    "the knot model solved by quadprog::solve.QP on the identified knots (hat-function design built in R,",
    "chain constraints, bounds as constraints). Knot values are compared only where identified;",
    "fitted values always."
  ),
  command = command, versions = versions,
  classic = classic, knots = knots_out, methods_knot_example = methods_example,
  isoreg_help_example = help_example
), "core_r.json")
