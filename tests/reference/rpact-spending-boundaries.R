# Reference values for lib/sequential/spending-boundaries.ts, pocock-constant.ts and
# obrien-fleming-constant.ts, and the naive peeking error for many looks, from R's rpact.
# Run: Rscript tests/reference/rpact-spending-boundaries.R  (writes fixtures/rpact-spending-boundaries.json)
library(rpact)
library(jsonlite)

spending <- list()
add_spending <- function(typeOfDesign, sided, alpha, informationRates, gammaA = NA) {
  args <- list(kMax = length(informationRates), alpha = alpha, sided = sided,
               typeOfDesign = typeOfDesign, informationRates = informationRates)
  call <- sprintf("getDesignGroupSequential(kMax = %d, alpha = %s, sided = %d, typeOfDesign = \"%s\", informationRates = c(%s)%s)",
                  length(informationRates), format(alpha), sided, typeOfDesign,
                  paste(format(informationRates), collapse = ", "),
                  if (is.na(gammaA)) "" else sprintf(", gammaA = %s", format(gammaA)))
  if (!is.na(gammaA)) args$gammaA <- gammaA
  design <- do.call(getDesignGroupSequential, args)
  spending[[length(spending) + 1]] <<- list(
    call = call, typeOfDesign = typeOfDesign, sided = sided, alpha = alpha,
    gamma = gammaA, informationRates = I(informationRates),
    criticalValues = I(design$criticalValues), alphaSpent = I(design$alphaSpent))
}

for (k in c(1, 2, 3, 4, 5, 10, 20)) {
  rates <- (1:k) / k
  for (sided in c(1, 2)) {
    alpha <- if (sided == 1) 0.025 else 0.05
    add_spending("asOF", sided, alpha, rates)
    add_spending("asP", sided, alpha, rates)
    add_spending("asHSD", sided, alpha, rates, gammaA = -4)
    add_spending("asHSD", sided, alpha, rates, gammaA = 1)
  }
}
for (rates in list(c(0.2, 0.45, 0.7, 1), c(0.1, 0.3, 0.6, 0.8, 1), c(0.5, 0.9, 1))) {
  add_spending("asOF", 2, 0.05, rates)
  add_spending("asP", 2, 0.05, rates)
  add_spending("asHSD", 2, 0.05, rates, gammaA = -2)
  add_spending("asOF", 1, 0.05, rates)
  add_spending("asHSD", 1, 0.1, rates, gammaA = 2)
}

constant <- list()
for (typeOfDesign in c("P", "OF")) {
  for (k in 2:5) {
    design <- getDesignGroupSequential(kMax = k, alpha = 0.05, sided = 2, typeOfDesign = typeOfDesign)
    constant[[length(constant) + 1]] <- list(
      call = sprintf("getDesignGroupSequential(kMax = %d, alpha = 0.05, sided = 2, typeOfDesign = \"%s\")", k, typeOfDesign),
      typeOfDesign = typeOfDesign, looks = k, alpha = 0.05, sided = 2,
      criticalValues = I(design$criticalValues))
  }
  for (k in c(1, 10, 20)) {
    design <- getDesignGroupSequential(kMax = k, alpha = 0.025, sided = 1, typeOfDesign = typeOfDesign)
    constant[[length(constant) + 1]] <- list(
      call = sprintf("getDesignGroupSequential(kMax = %d, alpha = 0.025, sided = 1, typeOfDesign = \"%s\")", k, typeOfDesign),
      typeOfDesign = typeOfDesign, looks = k, alpha = 0.025, sided = 1,
      criticalValues = I(design$criticalValues))
  }
}

# Naive repeated test at the fixed-horizon level: cumulative crossing probability under no effect.
# Row 1 of getGroupSequentialProbabilities is the lower crossing at each look, rows 3 − 2 the upper.
peeking <- list()
add_peeking <- function(informationRates, alpha, sided) {
  k <- length(informationRates)
  critical <- qnorm(1 - alpha / sided)
  lower <- if (sided == 2) rep(-critical, k) else rep(-1e10, k)
  probabilities <- getGroupSequentialProbabilities(
    decisionMatrix = matrix(c(lower, rep(critical, k)), nrow = 2, byrow = TRUE),
    informationRates = informationRates)
  byLook <- cumsum(probabilities[1, ] + probabilities[3, ] - probabilities[2, ])
  peeking[[length(peeking) + 1]] <<- list(
    call = sprintf("getGroupSequentialProbabilities(decisionMatrix = matrix(c(%s, rep(qnorm(1 - %s/%d), %d)), nrow = 2, byrow = TRUE), informationRates = <%d rates>); cumsum(row 1 + row 3 - row 2)",
                   if (sided == 2) sprintf("rep(-qnorm(1 - %s/2), %d)", format(alpha), k) else sprintf("rep(-1e10, %d)", k),
                   format(alpha), sided, k, k),
    alpha = alpha, sided = sided, informationRates = I(informationRates), errorByLook = I(byLook))
}
# rpact accepts at most 20 looks here; more looks are checked against mvtnorm (mvtnorm-naive-peeking.R).
for (k in c(2, 3, 4, 5, 10, 15, 20)) add_peeking((1:k) / k, 0.05, 2)
for (k in c(2, 5, 20)) add_peeking((1:k) / k, 0.05, 1)
add_peeking((1:20) / 20, 0.1, 2)
add_peeking((1:12) / 12, 0.01, 1)
add_peeking(cumsum(c(3, 1, 1, 4, 2, 6, 2, 5, 3, 5)) / 32, 0.05, 2)

# 'The usage of kMax > 10 is not validated' warnings from rpact for 20 looks are expected.
fixture <- list(
  generatedBy = "tests/reference/rpact-spending-boundaries.R",
  r = R.version.string,
  rpact = as.character(packageVersion("rpact")),
  spending = spending, constant = constant, peeking = peeking)
out <- file.path(dirname(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))),
                 "fixtures", "rpact-spending-boundaries.json")
writeLines(toJSON(fixture, auto_unbox = TRUE, digits = NA, na = "null", pretty = TRUE), out)
cat("wrote", out, "\n")
