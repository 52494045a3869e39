# Reference fixtures for the monotone surface (src/core/surface*.ts), computed with R.
#
# Writes test/reference/fixtures/surface_r.json:
#   lattice  seeded random data; the bilinear lattice QP built here in R (own design matrix B with
#            clamping, H = B'WB, d = B'Wy, order constraints as columns of Amat) and solved by
#            quadprog::solve.QP; lattice values, fitted values and SSE;
#   classic  full grids of distinct (x1, x2) levels with ties and weights: the cell means and summed
#            weights solved by Iso::biviso (its own tolerance, eps = sqrt(.Machine$double.eps)) and
#            by quadprog::solve.QP on the same weighted problem (exact);
#   classic_sparse  classic grids with many empty level combinations: quadprog::solve.QP on the
#            observed cells with one constraint per comparable pair (the order in full);
#   example  the 3 x 3 matrix Y = [[1,3,2],[0,2,5],[4,1,6]] with unit weights through Iso::biviso.
# Layout: lattice values are listed with the x1 knot index varying fastest (R's column-major
# as.vector of a K1 x K2 matrix), which is the layout of SurfaceModel.values.
# Command: Rscript --vanilla test/reference/gen_surface.R   (working directory: the repository root)
# Deterministic: fixed seeds, shortest round-trip number formatting, no time stamps.

suppressPackageStartupMessages({
  library(Iso)
  library(quadprog)
})

out_dir <- file.path("test", "reference", "fixtures")
if (!dir.exists(out_dir)) stop("run from the repository root (", out_dir, " not found)")

num <- function(x) {
  if (!is.finite(x)) stop("non-finite number in fixture")
  if (x == round(x) && abs(x) < 1e15) return(sprintf("%.0f", x))
  s <- sprintf("%.15g", x)
  if (as.numeric(s) != x) s <- sprintf("%.17g", x)
  s
}
q <- function(s) paste0('"', s, '"')
arr <- function(v) paste0("[", paste(vapply(as.numeric(v), num, ""), collapse = ", "), "]")
obj <- function(fields, ind = "  ") {
  paste0("{\n", paste0(ind, " ", q(names(fields)), ": ", unlist(fields), collapse = ",\n"), "\n", ind, "}")
}

# Hat-function weights of x on knots t (x clamped to [t1, tK]): an n x K matrix.
hat <- function(x, t) {
  K <- length(t)
  xc <- pmin(pmax(x, t[1]), t[K])
  j <- pmin(findInterval(xc, t), K - 1)
  u <- (xc - t[j]) / (t[j + 1] - t[j])
  M <- matrix(0, length(x), K)
  M[cbind(seq_along(x), j)] <- 1 - u
  M[cbind(seq_along(x), j + 1)] <- M[cbind(seq_along(x), j + 1)] + u
  M
}
# Bilinear design: column (b - 1) * K1 + a is h_a(x1) * g_b(x2).
design <- function(x1, x2, t1, t2) {
  A <- hat(x1, t1)
  G <- hat(x2, t2)
  B <- matrix(0, length(x1), length(t1) * length(t2))
  for (b in seq_along(t2)) for (a in seq_along(t1)) B[, (b - 1) * length(t1) + a] <- A[, a] * G[, b]
  B
}
# Order constraints as columns: theta[hi] - theta[lo] >= 0.
constraints <- function(K1, K2, d1, d2) {
  cols <- list()
  idx <- function(a, b) (b - 1) * K1 + a
  for (b in 1:K2) for (a in 1:K1) {
    if (d1 != "none" && a < K1) {
      v <- numeric(K1 * K2)
      s <- if (d1 == "up") 1 else -1
      v[idx(a + 1, b)] <- s
      v[idx(a, b)] <- -s
      cols[[length(cols) + 1]] <- v
    }
    if (d2 != "none" && b < K2) {
      v <- numeric(K1 * K2)
      s <- if (d2 == "up") 1 else -1
      v[idx(a, b + 1)] <- s
      v[idx(a, b)] <- -s
      cols[[length(cols) + 1]] <- v
    }
  }
  if (length(cols) == 0) return(NULL)
  do.call(cbind, cols)
}
solve_lattice <- function(B, y, w, K1, K2, d1, d2) {
  H <- crossprod(B, w * B)
  d <- drop(crossprod(B, w * y))
  ev <- min(eigen(H, symmetric = TRUE, only.values = TRUE)$values)
  if (ev < 1e-8 * max(diag(H))) stop("design not identified; change the seed")
  A <- constraints(K1, K2, d1, d2)
  theta <- if (is.null(A)) solve(H, d) else solve.QP(H, d, A, rep(0, ncol(A)))$solution
  theta
}

lattice_cases <- list()
specs <- list(
  list(name = "up-up 3x3 even", n = 40, K1 = 3, K2 = 3, d1 = "up", d2 = "up", w = FALSE, seed = 11),
  list(name = "up-up 4x5 even weighted", n = 90, K1 = 4, K2 = 5, d1 = "up", d2 = "up", w = TRUE, seed = 12),
  list(name = "up-down 5x4 even", n = 100, K1 = 5, K2 = 4, d1 = "up", d2 = "down", w = FALSE, seed = 13),
  list(name = "none-up 4x4 even", n = 80, K1 = 4, K2 = 4, d1 = "none", d2 = "up", w = TRUE, seed = 14),
  list(name = "down-down 6x5 even", n = 200, K1 = 6, K2 = 5, d1 = "down", d2 = "down", w = FALSE, seed = 15),
  list(name = "up-up 6x6 explicit knots inside the range", n = 250, K1 = 6, K2 = 6, d1 = "up", d2 = "up", w = TRUE, seed = 16,
       t1 = c(1, 2, 3.5, 5, 7, 8.5), t2 = c(0.5, 2, 3, 4.5, 6, 9)),
  list(name = "up-up 8x8 even (iterative-size check at 64 nodes)", n = 500, K1 = 8, K2 = 8, d1 = "up", d2 = "up", w = FALSE, seed = 17),
  list(name = "none-none 3x4 unconstrained", n = 50, K1 = 3, K2 = 4, d1 = "none", d2 = "none", w = FALSE, seed = 18),
  list(name = "up-up 22x21 even (ADMM warm start, then the exact method)", n = 3000, K1 = 22, K2 = 21, d1 = "up", d2 = "up", w = TRUE, seed = 19),
  list(name = "up-down 24x20 even (ADMM warm start, then the exact method)", n = 3000, K1 = 24, K2 = 20, d1 = "up", d2 = "down", w = FALSE, seed = 20)
)
for (s in specs) {
  set.seed(s$seed)
  x1 <- round(runif(s$n, 0, 10), 3)
  x2 <- round(runif(s$n, 0, 10), 3)
  f1 <- if (s$d1 == "down") -1 else 1
  f2 <- if (s$d2 == "down") -1 else 1
  y <- round(f1 * sqrt(x1) + f2 * 0.05 * x2^2 + rnorm(s$n, 0, 1), 3)
  w <- if (s$w) round(runif(s$n, 0.2, 3), 2) else rep(1, s$n)
  t1 <- if (is.null(s$t1)) seq(min(x1), max(x1), length.out = s$K1) else s$t1
  t2 <- if (is.null(s$t2)) seq(min(x2), max(x2), length.out = s$K2) else s$t2
  B <- design(x1, x2, t1, t2)
  theta <- solve_lattice(B, y, w, s$K1, s$K2, s$d1, s$d2)
  fitted <- drop(B %*% theta)
  lattice_cases[[length(lattice_cases) + 1]] <- obj(list(
    name = q(s$name), x1 = arr(x1), x2 = arr(x2), y = arr(y), weights = if (s$w) arr(w) else "null",
    knots1 = if (is.null(s$t1)) num(s$K1) else arr(s$t1), knots2 = if (is.null(s$t2)) num(s$K2) else arr(s$t2),
    direction1 = q(s$d1), direction2 = q(s$d2), t1 = arr(t1), t2 = arr(t2),
    values = arr(theta), fitted = arr(fitted), sse = num(sum(w * (y - fitted)^2))
  ))
}

classic_cases <- list()
cspecs <- list(
  list(name = "4x3 grid, one row per cell", L1 = 4, L2 = 3, reps = 1, w = FALSE, seed = 21),
  list(name = "5x6 grid, ties and weights", L1 = 5, L2 = 6, reps = 3, w = TRUE, seed = 22),
  list(name = "7x7 grid, ties", L1 = 7, L2 = 7, reps = 2, w = FALSE, seed = 23)
)
for (s in cspecs) {
  set.seed(s$seed)
  lev1 <- sort(round(runif(s$L1, 0, 20), 2))
  lev2 <- sort(round(runif(s$L2, 0, 5), 2))
  g <- expand.grid(a = 1:s$L1, b = 1:s$L2)
  g <- g[rep(seq_len(nrow(g)), each = s$reps), ]
  g <- g[sample(nrow(g)), ] # rows in random order
  x1 <- lev1[g$a]
  x2 <- lev2[g$b]
  y <- round(0.1 * x1 + 0.5 * x2 + rnorm(nrow(g), 0, 1.5), 2)
  w <- if (s$w) round(runif(nrow(g), 0.5, 2), 2) else rep(1, nrow(g))
  W <- matrix(0, s$L1, s$L2)
  S <- matrix(0, s$L1, s$L2)
  for (i in seq_len(nrow(g))) {
    W[g$a[i], g$b[i]] <- W[g$a[i], g$b[i]] + w[i]
    S[g$a[i], g$b[i]] <- S[g$a[i], g$b[i]] + w[i] * y[i]
  }
  M <- S / W # cell means; rows = x1 levels, columns = x2 levels
  bv <- biviso(M, W)
  A <- constraints(s$L1, s$L2, "up", "up")
  qp <- solve.QP(diag(as.vector(W)), as.vector(W) * as.vector(M), A, rep(0, ncol(A)))$solution
  classic_cases[[length(classic_cases) + 1]] <- obj(list(
    name = q(s$name), x1 = arr(x1), x2 = arr(x2), y = arr(y), weights = if (s$w) arr(w) else "null",
    levels1 = arr(lev1), levels2 = arr(lev2),
    biviso = arr(as.vector(bv)), quadprog = arr(qp),
    sse_quadprog = num(sum(w * (y - qp[(g$b - 1) * s$L1 + g$a])^2))
  ))
}

# Sparse classic grids: many level combinations without data. quadprog on the observed cells only,
# with a constraint for EVERY comparable pair (a_p <= a_q and b_p <= b_q) — the order written out in
# full, independent of how the lattice order is reduced.
sparse_cases <- list()
sspecs <- list(
  list(name = "scattered 25 rows, distinct levels", n = 25, L = 0, w = FALSE, seed = 31),
  list(name = "60 rows on 9 x 8 levels, weighted", n = 60, L1 = 9, L2 = 8, w = TRUE, seed = 32)
)
for (s in sspecs) {
  set.seed(s$seed)
  if (s$L == 0 && is.null(s$L1)) {
    x1 <- round(runif(s$n, 0, 10), 3)
    x2 <- round(runif(s$n, 0, 10), 3)
  } else {
    x1 <- sample(seq_len(s$L1), s$n, replace = TRUE) * 1.5
    x2 <- sample(seq_len(s$L2), s$n, replace = TRUE) * 0.25
  }
  y <- round(0.4 * x1 + 0.8 * x2 + rnorm(s$n, 0, 1), 2)
  w <- if (s$w) round(runif(s$n, 0.5, 2), 2) else rep(1, s$n)
  lev1 <- sort(unique(x1))
  lev2 <- sort(unique(x2))
  a <- match(x1, lev1)
  b <- match(x2, lev2)
  node <- (b - 1) * length(lev1) + a
  cells <- sort(unique(node))
  W <- tapply(w, node, sum)[as.character(cells)]
  M <- tapply(w * y, node, sum)[as.character(cells)] / W
  ca <- (cells - 1) %% length(lev1) + 1
  cb <- (cells - 1) %/% length(lev1) + 1
  cols <- list()
  for (i in seq_along(cells)) for (j in seq_along(cells)) {
    if (i != j && ca[i] <= ca[j] && cb[i] <= cb[j]) {
      v <- numeric(length(cells))
      v[j] <- 1
      v[i] <- -1
      cols[[length(cols) + 1]] <- v
    }
  }
  A <- do.call(cbind, cols)
  qp <- solve.QP(diag(as.vector(W)), as.vector(W * M), A, rep(0, ncol(A)))$solution
  fitted <- qp[match(node, cells)]
  sparse_cases[[length(sparse_cases) + 1]] <- obj(list(
    name = q(s$name), x1 = arr(x1), x2 = arr(x2), y = arr(y), weights = if (s$w) arr(w) else "null",
    cells = arr(cells - 1), values = arr(qp), fitted = arr(fitted), sse = num(sum(w * (y - fitted)^2)),
    constraints = num(ncol(A))
  ))
}

Y <- matrix(c(1, 3, 2, 0, 2, 5, 4, 1, 6), 3, byrow = TRUE)
ex <- biviso(Y)
example <- obj(list(
  y_rows = paste0("[", arr(Y[1, ]), ", ", arr(Y[2, ]), ", ", arr(Y[3, ]), "]"),
  biviso_rows = paste0("[", arr(ex[1, ]), ", ", arr(ex[2, ]), ", ", arr(ex[3, ]), "]"),
  note = q("matrix row r = x2 level r, column c = x1 level c; biviso is monotone along rows and columns, so the transpose gives the transposed fit")
), "")

versions <- obj(list(
  R = q(R.version.string), Iso = q(as.character(packageVersion("Iso"))),
  quadprog = q(as.character(packageVersion("quadprog")))
))
txt <- paste0(
  "{\n",
  ' "description": "R reference results for the monotone surface: bilinear lattice QPs solved by quadprog::solve.QP (design built in R), classic grids by Iso::biviso and quadprog::solve.QP, and the 3 x 3 example by Iso::biviso.",\n',
  ' "command": "Rscript --vanilla test/reference/gen_surface.R",\n',
  ' "versions": ', versions, ",\n",
  ' "lattice": [\n  ', paste(lattice_cases, collapse = ",\n  "), "\n ],\n",
  ' "classic": [\n  ', paste(classic_cases, collapse = ",\n  "), "\n ],\n",
  ' "classic_sparse": [\n  ', paste(sparse_cases, collapse = ",\n  "), "\n ],\n",
  ' "example": ', example, "\n}"
)
path <- file.path(out_dir, "surface_r.json")
writeLines(txt, path, useBytes = TRUE)
cat("wrote", path, "\n")
