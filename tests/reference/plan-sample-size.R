# Fixture values for sample-size-two-proportions.ts from base R:
#   stats::power.prop.test(p1 = baseline, p2 = baseline * (1 + lift), sig.level, power, alternative)$n
# (equal arms; pooled variance under H0, unpooled under H1; strict = FALSE ignores the far tail).
# power.prop.test solves with uniroot (tol = .Machine$double.eps^0.25), so its n is only good to
# about 1e-4: the tests compare it with a tolerance and compare ceilings only away from integers.
# Run: Rscript tests/reference/plan-sample-size.R -> tests/reference/fixtures/plan-sample-size.json
num <- function(x) trimws(formatC(x, digits = 17, format = "g"))
grid <- expand.grid(baseline = c(0.02, 0.1, 0.3), lift = c(0.05, 0.1, 0.25), alpha = c(0.05, 0.01), power = c(0.8, 0.9), sides = c(2, 1))
rows <- vapply(seq_len(nrow(grid)), function(i) {
  g <- grid[i, ]
  n <- power.prop.test(p1 = g$baseline, p2 = g$baseline * (1 + g$lift), sig.level = g$alpha, power = g$power,
                       alternative = if (g$sides == 2) "two.sided" else "one.sided", tol = 1e-12)$n
  sprintf('{"baseline":%s,"lift":%s,"alpha":%s,"power":%s,"sides":%d,"n":%s}',
          num(g$baseline), num(g$lift), num(g$alpha), num(g$power), g$sides, num(n))
}, character(1))
out <- sprintf('{"source":"%s, stats::power.prop.test(tol = 1e-12); tests/reference/plan-sample-size.R","cases":[%s]}',
               R.version.string, paste(rows, collapse = ","))
writeLines(out, "tests/reference/fixtures/plan-sample-size.json")
cat("wrote tests/reference/fixtures/plan-sample-size.json\n")
