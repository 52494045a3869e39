# Helpers shared by the band reference generators (gen_band.R, gen_band_smooth.R,
# gen_band_shapes.R); sourced by them, writes nothing itself. Needs json_writer.R sourced first
# (for jarr).

# Seeded weights in [0.5, 3], rounded to 3 decimals.
seeded_weights <- function(n, seed) {
  set.seed(seed)
  round(runif(n, 0.5, 3), 3)
}

# predict.lm confidence and prediction bands of `fit` at the rows of `newdata`, one entry per
# level; the prediction band is for one new observation of weight 1.
band_rows <- function(fit, newdata, levels) {
  weights_new <- rep(1, nrow(newdata))
  out <- list()
  for (lev in levels) {
    conf <- predict(fit, newdata, interval = "confidence", level = lev)
    pred <- predict(fit, newdata, interval = "prediction", level = lev, weights = weights_new)
    out[[length(out) + 1]] <- list(
      level = lev,
      fit = jarr(unname(conf[, "fit"])),
      conf_lower = jarr(unname(conf[, "lwr"])), conf_upper = jarr(unname(conf[, "upr"])),
      pred_lower = jarr(unname(pred[, "lwr"])), pred_upper = jarr(unname(pred[, "upr"]))
    )
  }
  out
}

# Read-back intervals of a fit on the reduced design B Z (`fit` is lm on B Z, `design_at(u)` the
# rows of B at the points u, `ends` the end knots): for each target y0 the read-back x0 (uniroot of
# f - y0 between the end knots) and the ends of the stretch around it where
# |f(x) - y0| <= t * se_pred(x), se_pred(x)^2 = se.fit(x)^2 + sigma^2 / m — scanned outwards from
# x0 on a grid of 4000 steps over the data's x range, each crossing refined by uniroot
# (tol 1e-14); NULL when the stretch reaches the end of that range.
readback_rows <- function(fit, Z, design_at, ends, x, targets, level, m) {
  V <- vcov(fit)
  beta <- coef(fit)
  s2 <- summary(fit)$sigma^2
  tq <- qt((1 + level) / 2, fit$df.residual)
  f <- function(u) as.numeric(design_at(u) %*% Z %*% beta)
  se <- function(u) { X0 <- design_at(u) %*% Z; sqrt(rowSums((X0 %*% V) * X0) + s2 / m) }
  g <- function(u, y0) abs(f(u) - y0) - tq * se(u)
  lo <- min(x)
  hi <- max(x)
  step <- (hi - lo) / 4000
  lapply(targets, function(y0) {
    x0 <- uniroot(function(u) f(u) - y0, ends, tol = 1e-14)$root
    limit <- function(dir) {
      a <- x0
      repeat {
        b <- if (dir > 0) min(a + step, hi) else max(a - step, lo)
        if (g(b, y0) > 0) return(uniroot(function(u) g(u, y0), sort(c(a, b)), tol = 1e-14)$root)
        if (b == (if (dir > 0) hi else lo)) return(NULL)
        a <- b
      }
    }
    list(target = y0, lower = limit(-1), x = x0, upper = limit(1))
  })
}
