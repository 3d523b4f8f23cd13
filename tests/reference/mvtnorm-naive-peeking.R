# Reference values for lib/sequential/naive-peeking-error.ts from R's mvtnorm: the error of a
# naive fixed-level test repeated at K looks is 1 − P(every |Z_k| < c) (two-sided) or
# 1 − P(every Z_k < c) (one-sided), with Z ~ N(0, R), R[i, j] = sqrt(t_min / t_max) (Brownian motion).
# Run: Rscript tests/reference/mvtnorm-naive-peeking.R  (writes fixtures/mvtnorm-naive-peeking.json)
library(mvtnorm)
library(jsonlite)

set.seed(20240601)
cases <- list()
add_case <- function(informationRates, alpha, sided) {
  k <- length(informationRates)
  correlation <- outer(informationRates, informationRates, function(a, b) sqrt(pmin(a, b) / pmax(a, b)))
  critical <- qnorm(1 - alpha / sided)
  lower <- if (sided == 2) rep(-critical, k) else rep(-Inf, k)
  # Miwa is deterministic and accurate for small K; Genz–Bretz (quasi-Monte Carlo, seeded) beyond.
  if (k <= 8) {
    algorithm <- Miwa(steps = 512)
    label <- "Miwa(steps = 512)"
  } else {
    algorithm <- GenzBretz(maxpts = 2e7, abseps = 1e-6, releps = 0)
    label <- "GenzBretz(maxpts = 2e7, abseps = 1e-6, releps = 0)"
  }
  inside <- pmvnorm(lower = lower, upper = rep(critical, k), sigma = correlation, algorithm = algorithm)
  cases[[length(cases) + 1]] <<- list(
    call = sprintf("1 - pmvnorm(lower = %s, upper = rep(qnorm(1 - %s/%d), %d), sigma = sqrt(t_i/t_j), algorithm = %s)",
                   if (sided == 2) sprintf("rep(-qnorm(1 - %s/2), %d)", format(alpha), k) else sprintf("rep(-Inf, %d)", k),
                   format(alpha), sided, k, label),
    alpha = alpha, sided = sided, informationRates = I(informationRates),
    error = 1 - as.numeric(inside),
    # mvtnorm's own error estimate (NA for Miwa, reported as null)
    integrationError = as.numeric(attr(inside, "error")))
}
for (k in c(1, 2, 3, 4, 5, 8)) add_case((1:k) / k, 0.05, 2)
for (k in c(2, 5, 8)) add_case((1:k) / k, 0.05, 1)
add_case(c(0.1, 0.15, 0.4, 0.42, 0.8, 1), 0.05, 2)
add_case(c(0.3, 0.5, 0.55, 1), 0.1, 1)
for (k in c(10, 20, 50, 100)) add_case((1:k) / k, 0.05, 2)
add_case((1:50) / 50, 0.05, 1)

fixture <- list(
  generatedBy = "tests/reference/mvtnorm-naive-peeking.R",
  r = R.version.string,
  mvtnorm = as.character(packageVersion("mvtnorm")),
  seed = 20240601,
  cases = cases)
out <- file.path(dirname(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))),
                 "fixtures", "mvtnorm-naive-peeking.json")
writeLines(toJSON(fixture, auto_unbox = TRUE, digits = NA, na = "null", pretty = TRUE), out)
cat("wrote", out, "\n")
