# Fixture values for the exact tests (exact-binomial-test.ts, fisher-exact-test.ts) from base R:
#   stats::binom.test(x, n, p, alternative)   stats::fisher.test(matrix(c(a, c, b, d), 2), alternative)
# Run: Rscript tests/reference/exact-tests.R  -> tests/reference/fixtures/exact-tests.json
num <- function(x) trimws(formatC(x, digits = 17, format = "g"))
binomial <- list(
  list(7, 20, 0.5), list(0, 10, 0.3), list(10, 10, 0.3), list(3, 100, 0.1), list(25, 100, 0.1),
  list(1, 1000, 0.01), list(40, 1000, 0.02), list(500, 1000, 0.45), list(5, 30000, 0.001), list(90, 30000, 0.002)
)
alts <- c("two.sided", "greater", "less")
b <- unlist(lapply(binomial, function(k) vapply(alts, function(a) {
  sprintf('{"x":%d,"n":%d,"p":%s,"alternative":"%s","pValue":%s}', k[[1]], k[[2]], num(k[[3]]), a,
          num(binom.test(k[[1]], k[[2]], k[[3]], alternative = a)$p.value))
}, character(1))))
tables <- list(c(3, 1, 1, 3), c(12, 28, 5, 33), c(0, 10, 5, 5), c(1, 499, 0, 500), c(20, 180, 5, 195),
               c(130, 870, 100, 900), c(2, 3, 8, 1), c(50, 950, 20, 980))
f <- unlist(lapply(tables, function(t) vapply(alts, function(a) {
  ft <- fisher.test(matrix(c(t[1], t[3], t[2], t[4]), 2), alternative = a)
  sprintf('{"table":[[%d,%d],[%d,%d]],"alternative":"%s","pValue":%s,"conditionalOddsRatio":%s}',
          t[1], t[2], t[3], t[4], a, num(ft$p.value), num(unname(ft$estimate)))
}, character(1))))
out <- sprintf('{"source":"%s, stats::binom.test and stats::fisher.test; tests/reference/exact-tests.R","binomial":[%s],"fisher":[%s]}',
               R.version.string, paste(b, collapse = ","), paste(f, collapse = ","))
writeLines(gsub("Inf", "null", out), "tests/reference/fixtures/exact-tests.json")
cat("wrote tests/reference/fixtures/exact-tests.json\n")
