# Fixture values for the pooled two-proportion z-test from base R (stats::prop.test without
# continuity correction: X-squared = z², same p-value for the two-sided test; one-sided with
# alternative = "greater").
# Run: Rscript tests/reference/fixed-prop-test.R  -> tests/reference/fixtures/fixed-prop-test.json
cases <- list(
  c(130, 1000, 100, 1000), c(12, 40, 5, 38), c(5321, 50000, 5012, 50000),
  c(10950, 90000, 1050, 10000), c(900, 10000, 1300, 10000), c(1, 500, 0, 500)
)
num <- function(x) trimws(formatC(x, digits = 17, format = "g"))
rows <- vapply(cases, function(k) {
  two <- prop.test(c(k[1], k[3]), c(k[2], k[4]), correct = FALSE)
  one <- prop.test(c(k[1], k[3]), c(k[2], k[4]), correct = FALSE, alternative = "greater")
  sprintf('{"treatment":[%d,%d],"holdout":[%d,%d],"xSquared":%s,"pTwoSided":%s,"pGreater":%s}',
          k[1], k[2], k[3], k[4], num(unname(two$statistic)), num(two$p.value), num(one$p.value))
}, character(1))
out <- sprintf('{"source":"%s, stats::prop.test(correct = FALSE); tests/reference/fixed-prop-test.R","cases":[%s]}',
               R.version.string, paste(rows, collapse = ","))
writeLines(out, "tests/reference/fixtures/fixed-prop-test.json")
cat("wrote tests/reference/fixtures/fixed-prop-test.json\n")
