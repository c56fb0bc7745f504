# Writes test/reference/fixtures/estimators/desmoothing.json: an invented appraisal-smoothed
# monthly return series (seeded) and R's maximum-likelihood MA(2) fit of it,
# stats::arima(order = c(0, 0, 2), method = "ML"), the estimation step of Getmansky, Lo and
# Makarov (2004), J. Financial Economics 74: theta_0 = 1 / (1 + ma1 + ma2), theta_j = ma_j theta_0.
args <- commandArgs(trailingOnly = TRUE)
out <- if (length(args) > 0) args[1] else "test/reference/fixtures/estimators/desmoothing.json"
set.seed(20240616)
n <- 240
true <- rnorm(n + 2, mean = 0.006, sd = 0.04)
theta <- c(0.6, 0.3, 0.1)
observed <- theta[1] * true[3:(n + 2)] + theta[2] * true[2:(n + 1)] + theta[3] * true[1:n]
fit <- arima(observed, order = c(0, 0, 2), method = "ML", optim.control = list(reltol = 1e-12, maxit = 1000))
ma <- unname(coef(fit)[c("ma1", "ma2")])
theta0 <- 1 / (1 + sum(ma))
num <- function(v) paste(sprintf("%.17g", v), collapse = ",")
json <- paste0(
  "{\n",
  "\"source\": \"stats::arima(order = c(0, 0, 2), method = 'ML'), ", R.version.string, "\",\n",
  "\"thetaUsed\": [", num(theta), "],\n",
  "\"observed\": [", num(observed), "],\n",
  "\"true\": [", num(true[3:(n + 2)]), "],\n",
  "\"ma\": [", num(ma), "],\n",
  "\"intercept\": ", sprintf("%.17g", unname(coef(fit)["intercept"])), ",\n",
  "\"loglik\": ", sprintf("%.17g", fit$loglik), ",\n",
  "\"theta\": [", num(c(theta0, ma * theta0)), "]\n",
  "}\n"
)
writeLines(json, out, sep = "")
