# Reference values for the Ledoit and Wolf (2008, J. Empirical Finance 15) HAC test of a
# difference in Sharpe ratios, computed with Debian's r-cran-sandwich (3.0-2) and base R.
#   /usr/bin/Rscript test/reference/walkforward/sharpe_hac.R
# writes test/reference/fixtures/walkforward/sharpe-hac.json; the TypeScript tests read the JSON.
#
# For excess returns a, b the statistic is Delta = mu_a / sd_a - mu_b / sd_b, written through
# v = (mu_a, mu_b, gamma_a, gamma_b), gamma = E[x^2]; its standard error is
# sqrt(grad' Psi grad / T), where Psi is the long-run covariance of
# u_t = (a_t - mu_a, b_t - mu_b, a_t^2 - gamma_a, b_t^2 - gamma_b), estimated with a VAR(1)
# prewhitened quadratic-spectral kernel and Andrews' (1991) AR(1) plug-in bandwidth
# (Andrews and Monahan 1992): sandwich's meatHAC, weightsAndrews and bwAndrews, with its
# small-sample factor T / (T - 4). Sample moments divide by T, as the delta method does.
# Data: the daily closes of datasets::EuStockMarkets (DAX, SMI, CAC, FTSE), log returns; and a
# seeded synthetic pair with serial dependence in volatility.
suppressPackageStartupMessages(library(sandwich))

hac_sharpe <- function(a, b) {
  T <- length(a)
  mu <- c(mean(a), mean(b))
  gam <- c(mean(a^2), mean(b^2))
  u <- cbind(a - mu[1], b - mu[2], a^2 - gam[1], b^2 - gam[2])
  # An object whose estimating functions are u, so that sandwich's own functions run on it.
  obj <- structure(list(u = u), class = "fixedEstfun")
  registerS3method("estfun", "fixedEstfun", function(x, ...) x$u)
  bw <- bwAndrews(obj, kernel = "Quadratic Spectral", prewhite = 1, weights = rep(1, 4))
  w <- function(x, ...) weightsAndrews(x, bw = bw, kernel = "Quadratic Spectral", prewhite = 1)
  Psi <- meatHAC(obj, prewhite = 1, weights = w, adjust = TRUE)
  sd <- sqrt(gam - mu^2)
  grad <- c(gam[1] / sd[1]^3, -gam[2] / sd[2]^3, -mu[1] / (2 * sd[1]^3), mu[2] / (2 * sd[2]^3))
  delta <- mu[1] / sd[1] - mu[2] / sd[2]
  se <- sqrt(drop(t(grad) %*% Psi %*% grad) / T)
  z <- delta / se
  list(bandwidth = bw, psi = unname(Psi), delta = delta, se = se, z = z, pValue = 2 * pnorm(-abs(z)))
}

closes <- as.matrix(datasets::EuStockMarkets)
r <- diff(log(closes))
cases <- list()
cases[[1]] <- c(list(name = "DAX minus FTSE", a = r[, 1], b = r[, 4]), hac_sharpe(r[, 1], r[, 4]))
cases[[2]] <- c(list(name = "SMI minus CAC", a = r[, 2], b = r[, 3]), hac_sharpe(r[, 2], r[, 3]))
set.seed(20)
n <- 600
h <- numeric(n); a <- numeric(n); b <- numeric(n); h[1] <- 1e-4
for (t in 2:n) {
  h[t] <- 1e-6 + 0.1 * a[t - 1]^2 + 0.85 * h[t - 1]
  z <- rnorm(2)
  a[t] <- 4e-4 + sqrt(h[t]) * z[1]
  b[t] <- 2e-4 + sqrt(h[t]) * (0.6 * z[1] + 0.8 * z[2])
}
cases[[3]] <- c(list(name = "synthetic pair (seeded, volatility clustering)", a = a, b = b), hac_sharpe(a, b))

json_num <- function(x) formatC(x, digits = 17, format = "g")
json_vec <- function(x) paste0("[", paste(json_num(x), collapse = ", "), "]")
json_mat <- function(m) paste0("[", paste(apply(m, 1, json_vec), collapse = ", "), "]")
body <- sapply(cases, function(c) {
  paste0(
    "{\"name\": \"", c$name, "\", \"a\": ", json_vec(c$a), ", \"b\": ", json_vec(c$b),
    ", \"bandwidth\": ", json_num(c$bandwidth), ", \"psi\": ", json_mat(c$psi),
    ", \"delta\": ", json_num(c$delta), ", \"se\": ", json_num(c$se), ", \"z\": ", json_num(c$z),
    ", \"pValue\": ", json_num(c$pValue), "}"
  )
})
out <- paste0(
  "{\"generator\": {\"R\": \"", R.version$major, ".", R.version$minor, "\", \"sandwich\": \"",
  as.character(packageVersion("sandwich")), "\"}, \"cases\": [", paste(body, collapse = ", "), "]}\n"
)
writeLines(out, "test/reference/fixtures/walkforward/sharpe-hac.json", sep = "")
