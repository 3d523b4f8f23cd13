# Times rpact on this machine for bench/rpact.ts; prints one JSON object.
# Rscript bench/reference/rpact-timing.R
suppressPackageStartupMessages(library(rpact))
median_ms <- function(run, repeats = 20) {
  run()
  times <- vapply(seq_len(repeats), function(i) { t <- proc.time()[["elapsed"]]; run(); (proc.time()[["elapsed"]] - t) * 1000 }, numeric(1))
  median(times)
}
k <- 20
design <- function() getDesignGroupSequential(kMax = k, alpha = 0.05, sided = 2, typeOfDesign = "asOF")
peeking <- function() getGroupSequentialProbabilities(
  decisionMatrix = matrix(c(rep(-qnorm(0.975), k), rep(qnorm(0.975), k)), nrow = 2, byrow = TRUE),
  informationRates = (1:k) / k)
# Rows: P(Z_k < lower_k), P(Z_k < upper_k), P(reaching look k), each with no earlier crossing.
probabilities <- suppressWarnings(peeking())
refused <- tryCatch({ getDesignGroupSequential(kMax = 100, alpha = 0.05, sided = 2, typeOfDesign = "asOF"); "accepted" },
  error = function(e) conditionMessage(e))
cat(sprintf('{"rpact":"%s","designMs":%.3f,"probabilitiesMs":%.3f,"criticalValues":[%s],"peekingError20":%.12f,"hundredLooks":%s}\n',
  as.character(packageVersion("rpact")), median_ms(design), median_ms(function() suppressWarnings(peeking())),
  paste(ifelse(is.finite(design()$criticalValues), sprintf("%.10f", design()$criticalValues), "null"), collapse = ","),
  1 - (probabilities[2, k] - probabilities[1, k]),
  paste0('"', gsub('"', "'", gsub("\n", " ", refused)), '"')))
